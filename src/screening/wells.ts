// Checks against piezometers: each well's observed water-table elevation beside the computed one at
// its place (the district solve's water table where it ran, else the strip transect it falls on),
// the residual, and summary figures for the district and per zone. Pure: records in, figures out.
import { SOLVE_OK, TransectSolver } from '../hydraulics/transect-solver.js';
import type { Problem } from '../shared/errors.js';
import type { InputRules } from '../shared/input-rules.js';
import { lengthToM } from '../shared/units.js';
import type { FigureMethod, ScreenResult } from './screen.js';
import { loadCut, setBeds } from './solve-facings.js';
import { cutTransect } from '../geometry/index.js';
import { boxIndex } from '../geometry/box-index.js';
import { pointInRings } from '../geometry/rings.js';
import type Flatbush from 'flatbush';

export interface WellRecord {
  /** Index of the feature in its file. */
  index: number;
  id: string;
  lon: number;
  lat: number;
  /** Observed water-table elevation (m, in the inputs' vertical datum). */
  observedM: number;
  /** The reading's date as given, or null. */
  date: string | null;
}

export interface WellFigure {
  well: WellRecord;
  /** Zone the well stands in, or null outside every zone. */
  zoneId: string | null;
  /** The computed water table at the well (m), and where it came from; NaN and null when nothing covers the well. */
  computedM: number;
  method: FigureMethod | null;
  /** Computed less observed (m); NaN without a computed figure. */
  residualM: number;
  /** Why there is no computed figure (outside the aquifer, outside every strip), or ''. */
  note: string;
}

export interface ResidualSummary {
  count: number;
  meanErrorM: number;
  rmseM: number;
}

export interface WellComparison {
  file: string;
  figures: WellFigure[];
  all: ResidualSummary;
  byZone: { zoneId: string; summary: ResidualSummary }[];
  /** Wells with no computed figure. */
  uncovered: number;
}

/** Checks well features: Point geometry, a unique id, a finite observed elevation; every problem named. */
export function checkWells(file: string, features: unknown[], rules: InputRules): { records: WellRecord[]; problems: Problem[] } {
  const f = rules.fields.wells;
  const problems: Problem[] = [];
  const records: WellRecord[] = [];
  if (features.length === 0) problems.push({ severity: 'error', place: { file }, message: 'has no features: expected wells (Point features)' });
  const seen = new Set<string>();
  const present = new Set<string>();
  features.forEach((feature) => {
    const properties = (feature as { properties?: unknown } | null)?.properties;
    if (properties && typeof properties === 'object') for (const key of Object.keys(properties)) present.add(key);
  });
  for (const field of [f.id, f.observed]) {
    if (features.length > 0 && !present.has(field)) {
      problems.push({
        severity: 'error',
        place: { file, field },
        message: `no well has the attribute "${field}"; attributes found: ${[...present].slice(0, 20).map((name) => `"${name}"`).join(', ') || 'none'}. Name the attribute in the config's "fields.wells"`,
      });
    }
  }
  if (problems.length > 0) return { records, problems };
  features.forEach((feature, index) => {
    const raw = (feature ?? {}) as { type?: unknown; geometry?: { type?: unknown; coordinates?: unknown } | null; properties?: Record<string, unknown> | null };
    const properties = raw.properties ?? {};
    const idValue = properties[f.id];
    const id = typeof idValue === 'string' || typeof idValue === 'number' ? String(idValue) : undefined;
    const fail = (field: string, message: string) => problems.push({ severity: 'error', place: { file, featureIndex: index, featureId: id, field }, message });
    if (raw.type !== 'Feature') return fail('type', 'is not a GeoJSON Feature');
    if (id === undefined || id.trim() === '') return fail(f.id, 'missing id');
    if (seen.has(id)) fail(f.id, `duplicate id "${id}"`);
    seen.add(id);
    const coordinates = raw.geometry?.coordinates;
    const pointOk = raw.geometry?.type === 'Point' && Array.isArray(coordinates) && coordinates.length >= 2 && coordinates.slice(0, 2).every((v) => typeof v === 'number' && Number.isFinite(v));
    if (!pointOk) fail('geometry', `expected a Point with finite coordinates, found ${raw.geometry === null || raw.geometry === undefined ? 'no geometry' : String(raw.geometry.type)}`);
    const observed = properties[f.observed];
    const observedOk = typeof observed === 'number' && Number.isFinite(observed);
    if (!observedOk) fail(f.observed, `expected a finite number (the observed water-table elevation), found ${observed === undefined ? 'nothing' : JSON.stringify(observed)?.slice(0, 60)}`);
    const dateValue = properties[f.date];
    if (!pointOk || !observedOk) return;
    const [lon, lat] = coordinates as number[];
    records.push({ index, id, lon, lat, observedM: lengthToM(observed as number, rules.units.elevation), date: typeof dateValue === 'string' ? dateValue : null });
  });
  return { records, problems };
}

function summary(residuals: readonly number[]): ResidualSummary {
  const count = residuals.length;
  if (count === 0) return { count, meanErrorM: NaN, rmseM: NaN };
  let sum = 0, squares = 0;
  for (const r of residuals) { sum += r; squares += r * r; }
  return { count, meanErrorM: sum / count, rmseM: Math.sqrt(squares / count) };
}

/** The district solve's water table at (x, y): bilinear between the centres of the cells around it, where all four are in the aquifer; else the cell's own. */
function districtHeadAt(result: ScreenResult, x: number, y: number): number {
  const district = result.district;
  if (!district) return NaN;
  const { columns, rows, cellM, originX, originY } = district.grid;
  const table = district.waterTableM;
  const fc = (x - originX) / cellM - 0.5, fr = (y - originY) / cellM - 0.5;
  const c0 = Math.floor(fc), r0 = Math.floor(fr);
  const inside = (c: number, r: number) => c >= 0 && r >= 0 && c < columns && r < rows;
  if (inside(c0, r0) && inside(c0 + 1, r0 + 1)) {
    const a = table[r0 * columns + c0], b = table[r0 * columns + c0 + 1], c = table[(r0 + 1) * columns + c0], d = table[(r0 + 1) * columns + c0 + 1];
    if ([a, b, c, d].every(Number.isFinite)) {
      const tx = fc - c0, ty = fr - r0;
      return (a * (1 - tx) + b * tx) * (1 - ty) + (c * (1 - tx) + d * tx) * ty;
    }
  }
  const col = Math.floor((x - originX) / cellM), row = Math.floor((y - originY) / cellM);
  return inside(col, row) ? table[row * columns + col] : NaN;
}

/**
 * The strips' water table at (x, y): the strip whose polygon holds the point, its solved transect
 * cast from line a nearest the point, the head at the point's distance along it. NaN outside every strip.
 */
function stripHeadAt(result: ScreenResult, stripTree: Flatbush, x: number, y: number, solver: TransectSolver): number {
  const { stations, facings, results } = result;
  // the strips whose box holds the point, in the strips' own order
  for (const s of stripTree.search(x, y, x, y).sort((a, b) => a - b)) {
    const strip = result.strips[s];
    const ring = strip.strip.ringM;
    if (!pointInRings(x, y, [ring])) continue;
    let best = -1, bestD = Infinity, bestT = 0;
    for (const facing of strip.facingsA) {
      if (results.status[facing] !== SOLVE_OK) continue;
      const station = facing >> 1;
      const sx = stations.x[station], sy = stations.y[station], ex = facings.endX[facing], ey = facings.endY[facing];
      const dx = ex - sx, dy = ey - sy, length2 = dx * dx + dy * dy;
      const t = Math.min(1, Math.max(0, ((x - sx) * dx + (y - sy) * dy) / length2));
      const d = Math.hypot(sx + t * dx - x, sy + t * dy - y);
      if (d < bestD) { bestD = d; best = facing; bestT = t; }
    }
    if (best < 0) continue;
    const station = best >> 1;
    const cut = cutTransect(result.zoneIndex, stations.x[station], stations.y[station], facings.endX[best], facings.endY[best]);
    const pieces = loadCut(solver, cut, result.zones, new Float64Array(3));
    const own = result.lines[stations.line[station]], partner = result.lines[facings.partner[best]];
    setBeds(solver, own, stations.chainageM[station], results.ownStageM[best], partner, facings.partnerChainageM[best], results.partnerStageM[best]);
    if (solver.solve(results.ownStageM[best], results.partnerStageM[best], results.baseM[best], pieces) !== SOLVE_OK) continue;
    return solver.headAt(bestT * solver.transectLengthM);
  }
  return NaN;
}

/** Each well's computed water table and residual, with summaries for the district and per zone. */
export function compareWells(result: ScreenResult, wells: readonly WellRecord[], file: string): WellComparison {
  const solver = new TransectSolver(64);
  // boxes of the strips, so that a well looks only at the strips around it
  const stripTree = boxIndex(result.strips.length, (s, add) => {
    const ring = result.strips[s].strip.ringM;
    let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    for (let i = 0; i < ring.length; i += 2) {
      minX = Math.min(minX, ring[i]); maxX = Math.max(maxX, ring[i]);
      minY = Math.min(minY, ring[i + 1]); maxY = Math.max(maxY, ring[i + 1]);
    }
    add(minX, minY, maxX, maxY);
  });
  const figures: WellFigure[] = wells.map((well) => {
    const [x, y] = result.crs.forward([well.lon, well.lat]);
    const { polygons, polygonTree } = result.zoneIndex;
    // the first zone (in the zones' order, as the solve takes overlaps) whose polygon holds the well
    let polygon = -1;
    for (const p of polygonTree.search(x, y, x, y).sort((a, b) => a - b)) {
      if (pointInRings(x, y, polygons.rings[p])) { polygon = p; break; }
    }
    const zone = polygon >= 0 ? polygons.zone[polygon] : -1;
    const zoneId = zone >= 0 ? result.zones[zone].id : null;
    let computedM = NaN, method: FigureMethod | null = null, note = '';
    if (zone < 0) note = 'outside every aquifer zone';
    else {
      computedM = districtHeadAt(result, x, y);
      if (Number.isFinite(computedM)) method = 'district';
      else {
        computedM = stripHeadAt(result, stripTree, x, y, solver);
        if (Number.isFinite(computedM)) method = 'strips';
        else note = result.district ? 'outside the district solve' : 'outside every strip (no transect of the strips reaches it)';
      }
    }
    return { well, zoneId, computedM, method, residualM: computedM - well.observedM, note };
  });
  const covered = figures.filter((figure) => Number.isFinite(figure.residualM));
  const zoneIds = [...new Set(covered.map((figure) => figure.zoneId as string))].sort();
  return {
    file,
    figures,
    all: summary(covered.map((figure) => figure.residualM)),
    byZone: zoneIds.map((zoneId) => ({ zoneId, summary: summary(covered.filter((figure) => figure.zoneId === zoneId).map((figure) => figure.residualM)) })),
    uncovered: figures.length - covered.length,
  };
}
