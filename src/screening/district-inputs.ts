// Validation stage: turns GeoJSON features (lon/lat) into typed records of lines and zones, and
// lists every problem found with its file, feature and field. A feature with an error is left
// out of the records; warnings keep it. Pure: no file access.
import { area } from '@turf/area';
import { booleanPointInPolygon } from '@turf/boolean-point-in-polygon';
import { polygon as turfPolygon } from '@turf/helpers';
import { firstKink, holeMeetsShell, ringHasSpike } from '../geometry/ring-checks.js';
import { kToMPerDay, lengthToM, rechargeFromMPerDay, rechargeToMPerDay } from '../shared/units.js';
import { describePlace, type DataProblemPlace, type Problem } from '../shared/errors.js';
import { DEFAULT_RULES, type InputRules } from '../shared/input-rules.js';

export type LineKind = 'canal' | 'drain';

export interface LineRecord {
  /** Index of the feature in its file. */
  index: number;
  id: string;
  name: string | null;
  kind: LineKind;
  /** Stage at the first vertex and at the end of the line (m); equal when constant. */
  stageStartM: number;
  stageEndM: number;
  /** The attribute(s) the stage came from, for messages: "stage_m" or "stage_start_m/stage_end_m". */
  stageField: string;
  /** The bed's resistance to seepage (days); 0 for a clean bed (the line holds the aquifer at its stage). */
  bedResistanceD: number;
  /** Where the resistance came from: the line's attribute, or the config's default. */
  bedResistanceFrom: 'attribute' | 'default';
  /** Wetted perimeter (m); NaN when the bed is clean and none was given. */
  wettedPerimeterM: number;
  /** Where the wetted perimeter came from. */
  wettedPerimeterFrom: 'attribute' | 'width-and-depth' | 'default' | 'none';
  /** Water depth (m), for the bed's underside; NaN when not given. */
  waterDepthM: number;
  /**
   * Optional: chainage ranges where a lining takes the place of the bed (a lining plan), sorted by
   * fromM and not overlapping; chainage in metres along the line in the work CRS, as everywhere.
   */
  lined?: readonly LinedRange[];
  /** Parts in lon/lat, one per LineString part: its positions interleaved, lon0, lat0, lon1, lat1, ... */
  partsLonLat: Float64Array[];
  /** The feature's own attributes, copied into a prototype-free object. */
  properties: Record<string, unknown>;
}

export interface ZoneRecord {
  /** Position in the zone list, which the geometry stage indexes by. */
  index: number;
  /** Index of the feature in its file. */
  featureIndex: number;
  id: string;
  kMPerDay: number;
  baseM: number;
  groundM: number;
  rechargeMPerDay: number;
  /** The head held where the zone meets the aquifer's outer edge (m), or null: no flow across the edge there. */
  edgeHeadM: number | null;
  /** Polygons in lon/lat: each is its outer ring then holes. */
  polygonsLonLat: number[][][][];
}

export interface Checked<T> {
  records: T[];
  problems: Problem[];
}

// Thrown inside one feature's check; caught per feature so that every feature gets checked.
class FeatureProblem extends Error {
  constructor(readonly field: string | undefined, message: string) {
    super(message);
  }
}

interface FeatureView {
  index: number;
  id: string | undefined;
  geometry: Record<string, unknown> | null;
  properties: Record<string, unknown>;
}

function viewFeature(feature: unknown, index: number, idField: string): FeatureView {
  if (feature === null || typeof feature !== 'object' || (feature as { type?: unknown }).type !== 'Feature') {
    throw new FeatureProblem(undefined, 'is not a GeoJSON Feature');
  }
  const raw = feature as Record<string, unknown>;
  // a prototype-free copy: attribute names such as __proto__ stay plain data
  const properties: Record<string, unknown> = Object.create(null);
  if (raw.properties !== null && typeof raw.properties === 'object') {
    for (const key of Object.keys(raw.properties as object)) properties[key] = (raw.properties as Record<string, unknown>)[key];
  }
  const rawId = properties[idField];
  const id = typeof rawId === 'string' || (typeof rawId === 'number' && Number.isFinite(rawId)) ? String(rawId).trim() : undefined;
  const geometry = raw.geometry !== null && typeof raw.geometry === 'object' ? (raw.geometry as Record<string, unknown>) : null;
  return { index, id: id === '' ? undefined : id, geometry, properties };
}

/** A position as the user would write it: JSON, but Infinity and NaN shown as themselves. */
function showPosition(position: unknown): string {
  if (!Array.isArray(position)) return showValue(position);
  return `[${position.map(showValue).join(',')}]`;
}

/** A value of the user's as a message shows it: never more than SHOWN_CHARS of it, whatever its size. */
const SHOWN_CHARS = 120;

function cut(text: string): string {
  return text.length > SHOWN_CHARS ? `${text.slice(0, SHOWN_CHARS)}... (${text.length} characters in all)` : text;
}

function showValue(value: unknown): string {
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value);
  if (nestingDepth(value, MAX_NESTING) > MAX_NESTING) return `(nested more than ${MAX_NESTING} levels deep)`;
  try {
    return cut(JSON.stringify(value) ?? String(value));
  } catch {
    return Object.prototype.toString.call(value);
  }
}

/** How deep lists and objects nest in a value, counted no further than `limit` + 1 (no recursion: a hostile value may nest 100,000 deep). */
function nestingDepth(value: unknown, limit: number): number {
  let deepest = 0;
  const stack: [unknown, number][] = [[value, 0]];
  while (stack.length > 0) {
    const [item, depth] = stack.pop()!;
    if (item === null || typeof item !== 'object') continue;
    if (depth + 1 > deepest) deepest = depth + 1;
    if (deepest > limit) return deepest;
    for (const child of Array.isArray(item) ? item : Object.values(item)) if (child !== null && typeof child === 'object') stack.push([child, depth + 1]);
  }
  return deepest;
}

// An attribute nested deeper than this is no attribute a GIS writes; writing it back would overflow the stack
const MAX_NESTING = 32;
// Names that would reach an object's prototype, refused wherever a user names a key
const FORBIDDEN_KEYS = new Set(['__proto__', 'constructor', 'prototype']);

function describeValue(value: unknown): string {
  if (typeof value === 'string') {
    if (/^\s*[-+]?\d+,\d+\s*$/.test(value)) return `text "${value}" (a decimal comma? write ${value.trim().replace(',', '.')} as a number)`;
    if (value.trim() !== '' && Number.isFinite(Number(value))) return `text "${value}" (a number stored as text; store it as a number)`;
    return `text "${cut(value)}"`;
  }
  return `${Array.isArray(value) ? 'a list' : typeof value} ${showValue(value)}`;
}

function numberField(view: FeatureView, field: string, fallback?: number): number {
  const value = view.properties[field];
  if (value === undefined || value === null || value === '') {
    if (fallback !== undefined) return fallback;
    throw new FeatureProblem(field, 'missing required number');
  }
  if (typeof value !== 'number') throw new FeatureProblem(field, `expected a number, found ${describeValue(value)}`);
  if (!Number.isFinite(value)) throw new FeatureProblem(field, `expected a finite number, found ${value}`);
  return value;
}

/** Checks a position: a list whose first two entries are a finite longitude and latitude. */
function checkPosition(position: unknown): asserts position is readonly number[] {
  if (!Array.isArray(position) || position.length < 2) throw new FeatureProblem('geometry', `a position is not a list of at least two numbers: ${showPosition(position)}`);
  const [lon, lat] = position as unknown[];
  if (typeof lon !== 'number' || typeof lat !== 'number' || !Number.isFinite(lon) || !Number.isFinite(lat)) {
    throw new FeatureProblem('geometry', `a coordinate is not a finite number: ${showPosition(position)}`);
  }
  if (Math.abs(lon) > 180 || Math.abs(lat) > 90) {
    throw new FeatureProblem(
      'geometry',
      `coordinate ${showPosition(position)} cannot be longitude/latitude (outside +-180/+-90): the data look projected but no CRS is declared; ` +
        'add the .prj, a "crs" member, or give --input-crs EPSG:<code>',
    );
  }
}

/** The parts of a single or multi geometry of the expected kind: [coordinates] or the list. */
function geometryParts(view: FeatureView, single: string, multi: string, empty: string): unknown[] {
  const geometry = view.geometry;
  if (geometry === null) throw new FeatureProblem('geometry', 'has no geometry');
  const raw = geometry.type === single ? [geometry.coordinates] : geometry.type === multi ? geometry.coordinates : null;
  if (raw === null) throw new FeatureProblem('geometry', `expected ${single} or ${multi}, found ${JSON.stringify(geometry.type)}`);
  if (!Array.isArray(raw) || raw.length === 0 || (raw.length === 1 && Array.isArray(raw[0]) && raw[0].length === 0)) {
    throw new FeatureProblem('geometry', `empty geometry: ${empty}`);
  }
  return raw;
}

/** The line's parts, each its positions' lon/lat interleaved in one array (lon0, lat0, lon1, lat1, ...). */
function lineParts(view: FeatureView): Float64Array[] {
  const raw = geometryParts(view, 'LineString', 'MultiLineString', 'no positions');
  return raw.map((part) => {
    if (!Array.isArray(part) || part.length < 2) throw new FeatureProblem('geometry', 'a line part has fewer than two positions');
    const lonLat = new Float64Array(2 * part.length);
    part.forEach((position: unknown, i) => {
      checkPosition(position);
      lonLat[2 * i] = position[0];
      lonLat[2 * i + 1] = position[1];
    });
    return lonLat;
  });
}

function polygonList(view: FeatureView): number[][][][] {
  const raw = geometryParts(view, 'Polygon', 'MultiPolygon', 'no rings');
  return raw.map((polygon, p) => {
    if (!Array.isArray(polygon) || polygon.length === 0) throw new FeatureProblem('geometry', `polygon ${p} has no rings`);
    const rings = polygon.map((ring) => {
      if (!Array.isArray(ring) || ring.length < 4) throw new FeatureProblem('geometry', 'a polygon ring has fewer than four positions');
      const positions = ring.map((position: unknown) => {
        checkPosition(position);
        return [position[0], position[1]];
      });
      const first = positions[0], last = positions[positions.length - 1];
      if (first[0] !== last[0] || first[1] !== last[1]) {
        throw new FeatureProblem('geometry', `a polygon ring is not closed: it starts at ${JSON.stringify(first)} and ends at ${JSON.stringify(last)}`);
      }
      return positions;
    });
    const shape = turfPolygon(rings);
    if (!(area(shape) > 0)) throw new FeatureProblem('geometry', `polygon ${p} has no area (its positions lie on one line or point)`);
    // turf's kinks and booleanValid compare every pair of segments; the ring checks index them
    const crossing = firstKink(rings);
    if (crossing !== null) {
      const at = crossing.map((v) => Number(v.toFixed(6)));
      throw new FeatureProblem('geometry', `polygon ${p} intersects itself (first crossing near ${JSON.stringify(at)}); fix the ring`);
    }
    // turf's booleanValid lets a hole lying wholly outside its shell pass: check each hole too
    const shell = turfPolygon([rings[0]]);
    const holeOutside = rings.slice(1).some((hole) => !hole.slice(0, -1).some((position) => booleanPointInPolygon(position, shell, { ignoreBoundary: true })));
    const valid = rings.every((ring, i) => !ringHasSpike(ring) && (i === 0 || holeMeetsShell(rings[0], ring) <= 1));
    if (holeOutside || !valid) throw new FeatureProblem('geometry', `polygon ${p} is not a valid polygon (a hole outside its shell, or rings touching)`);
    return rings;
  });
}

/** Runs one part of a feature's check; a problem there is recorded and gives undefined. */
type Attempt = <V>(check: () => V) => V | undefined;

function checkAll<T>(
  file: string,
  features: unknown[],
  idField: string,
  what: string,
  build: (view: FeatureView, warn: (field: string, message: string) => void, attempt: Attempt) => T,
): Checked<T> {
  const problems: Problem[] = [];
  const records: T[] = [];
  if (features.length === 0) {
    problems.push({ severity: 'error', place: { file }, message: `has no features: expected ${what}` });
    return { records, problems };
  }
  const seen = new Map<string, number>();
  features.forEach((feature, index) => {
    let view: FeatureView | undefined;
    const place = (field?: string): DataProblemPlace => ({ file, featureIndex: index, featureId: view?.id, field });
    const warnings: Problem[] = [];
    const errors: Problem[] = [];
    // each independent part of a feature is checked on its own, so one run lists all its problems
    const attempt: Attempt = (check) => {
      try {
        return check();
      } catch (error) {
        if (!(error instanceof FeatureProblem)) throw error;
        errors.push({ severity: 'error', place: place(error.field), message: error.message });
        return undefined;
      }
    };
    try {
      view = viewFeature(feature, index, idField);
      const { id } = view;
      // a feature without a good id is still checked field by field, so one run lists all it lacks
      attempt(() => {
        if (id === undefined) throw new FeatureProblem(idField, `missing id: every feature needs a unique text id in "${idField}"`);
        // strip ids join two line ids with "|": one inside an id would make them ambiguous
        if (id.includes('|')) throw new FeatureProblem(idField, `id "${id}" contains "|", which doab uses to join ids in strip ids; use another character`);
        const earlier = seen.get(id);
        if (earlier !== undefined) throw new FeatureProblem(idField, `duplicate id "${id}" (also feature ${earlier})`);
        seen.set(id, index);
      });
      // what the writers would choke on is refused here, so doab check reports it before a screen fails on it
      for (const [key, value] of Object.entries(view.properties)) {
        attempt(() => {
          if (FORBIDDEN_KEYS.has(key)) throw new FeatureProblem(key, `an attribute named "${key}" is refused (it would reach an object's prototype); rename it`);
          if (nestingDepth(value, MAX_NESTING) > MAX_NESTING) throw new FeatureProblem(key, `the value nests lists or objects more than ${MAX_NESTING} levels deep; an attribute should be a number or text`);
        });
      }
      const record = build(view, (field, message) => warnings.push({ severity: 'warning', place: place(field), message }), attempt);
      if (errors.length === 0) records.push(record);
      for (const problem of errors) problems.push(problem);
      for (const problem of warnings) problems.push(problem);
    } catch (error) {
      if (!(error instanceof FeatureProblem)) throw error;
      problems.push({ severity: 'error', place: place(error.field), message: error.message });
    }
  });
  return { records, problems };
}

// The dBASE table of a shapefile keeps 10 characters of a field name, so "recharge_mm_yr" comes
// back as "recharge_m". Where a field is missing from every feature but its cut name is there,
// read the cut name and say so.
const DBF_NAME_LENGTH = 10;

/** Every attribute name that some feature has. */
function presentAttributes(features: unknown[]): Set<string> {
  const present = new Set<string>();
  for (const feature of features) {
    const properties = (feature as { properties?: unknown } | null)?.properties;
    if (properties !== null && typeof properties === 'object') for (const key of Object.keys(properties)) present.add(key);
  }
  return present;
}

interface FieldUse {
  /** The config's key, as `fields.lines.stage`. */
  key: string;
  /** The attribute it names. */
  name: string;
  what: string;
  /** Named by the user's config, not doab's default name. */
  mapped: boolean;
  /** What every feature gets when no feature has it; null when the field is required. */
  fallback: string | null;
}

function attributeList(present: Set<string>): string {
  const names = [...present];
  if (names.length === 0) return 'the features have no attributes at all';
  return `attributes found: ${names.slice(0, 20).map((name) => `"${cut(name)}"`).join(', ')}${names.length > 20 ? `, ... (${names.length} in all)` : ''}`;
}

/**
 * A field that no feature has is said once for the file, never left to a silent default: an error
 * when it is required or when the config maps it to a name the file does not hold, a warning
 * naming the default when doab's own default name is simply absent.
 */
function coverageProblems(file: string, features: unknown[], uses: FieldUse[]): Problem[] {
  if (features.length === 0) return [];
  const present = presentAttributes(features);
  const problems: Problem[] = [];
  for (const use of uses) {
    if (present.has(use.name)) continue;
    if (use.fallback === null || use.mapped) {
      problems.push({
        severity: 'error',
        place: { file, field: use.name },
        message:
          `no feature has the attribute "${use.name}" (${use.what}${use.mapped ? `, as the config's "${use.key}" names it` : ''}); ${attributeList(present)}. ` +
          `Name the attribute that holds it in the config's "${use.key}" (doab init-config writes a config from your files)`,
      });
    } else {
      problems.push({ severity: 'warning', place: { file, field: use.name }, message: `no feature has "${use.name}" (${use.what}): ${use.fallback} applies to every feature; map the attribute that holds it in the config's "${use.key}" if there is one` });
    }
  }
  return problems;
}

function resolveCutNames<T extends object>(file: string, features: unknown[], fields: T, problems: Problem[]): T {
  const present = presentAttributes(features);
  const resolved = { ...fields };
  for (const [key, name] of Object.entries(fields) as [keyof T & string, string][]) {
    const cut = name.slice(0, DBF_NAME_LENGTH);
    if (name.length > DBF_NAME_LENGTH && !present.has(name) && present.has(cut)) {
      (resolved as Record<string, string>)[key] = cut;
      problems.push({ severity: 'warning', place: { file, field: cut }, message: `reading "${cut}" as "${name}" (a shapefile keeps 10 characters of a field name); map it in the config's fields to silence this` });
    }
  }
  return resolved;
}

const BED_FIELD_WHAT = {
  bedResistance: 'the bed resistance, days',
  wettedPerimeter: 'the wetted perimeter',
  bottomWidth: 'the bottom width',
  waterDepth: 'the water depth',
} as const;

/** Bed resistances above this (days, about 270 years) are taken for a unit error: such a bed seals the line. */
export const BED_RESISTANCE_PLAUSIBLE_D = 100_000;

/**
 * A line's bed: its resistance (attribute, else the default), and when it has one the wetted
 * perimeter, from its attribute, else from bottom width and water depth on the default side slope
 * (P = b + 2 d sqrt(1 + z^2), a trapezoid), else the default; no perimeter then is an error.
 */
function lineBed(
  view: FeatureView,
  f: InputRules['fields']['lines'],
  rules: InputRules,
  toM: (value: number) => number,
  attempt: <T>(check: () => T) => T | undefined,
) {
  const given = (field: string) => view.properties[field] !== undefined && view.properties[field] !== null && view.properties[field] !== '';
  const resistanceD = attempt(() => {
    const c = numberField(view, f.bedResistance, rules.defaults.bedResistanceD);
    if (!(c >= 0)) throw new FeatureProblem(f.bedResistance, `a bed resistance must be 0 (a clean bed) or more days, found ${c}`);
    if (c > BED_RESISTANCE_PLAUSIBLE_D) throw new FeatureProblem(f.bedResistance, `a bed resistance of ${c} days seals the line (limit ${BED_RESISTANCE_PLAUSIBLE_D}); check the value, which is in days`);
    return c;
  });
  const positiveLength = (field: string, what: string, zeroAllowed = false) =>
    attempt(() => {
      if (!given(field)) return Number.NaN;
      const value = toM(numberField(view, field));
      if (!(value > 0 || (zeroAllowed && value === 0))) throw new FeatureProblem(field, `${what} must be ${zeroAllowed ? '0 or more' : 'positive'}, found ${value} m`);
      return value;
    });
  const perimeterGiven = positiveLength(f.wettedPerimeter, 'a wetted perimeter');
  const widthM = positiveLength(f.bottomWidth, 'a bottom width', true);
  const depthM = positiveLength(f.waterDepth, 'a water depth');
  if (resistanceD === undefined || perimeterGiven === undefined || widthM === undefined || depthM === undefined) return undefined;
  let perimeterM = perimeterGiven;
  let perimeterFrom: LineRecord['wettedPerimeterFrom'] = 'attribute';
  if (Number.isNaN(perimeterM) && !Number.isNaN(widthM) && !Number.isNaN(depthM)) {
    perimeterM = widthM + 2 * depthM * Math.sqrt(1 + rules.defaults.bankSlope ** 2);
    perimeterFrom = 'width-and-depth';
  } else if (Number.isNaN(perimeterM) && rules.defaults.wettedPerimeterM !== null) {
    perimeterM = rules.defaults.wettedPerimeterM;
    perimeterFrom = 'default';
  } else if (Number.isNaN(perimeterM)) perimeterFrom = 'none';
  if (resistanceD > 0 && perimeterFrom === 'none') {
    throw new FeatureProblem(
      f.wettedPerimeter,
      `the line has a bed resistance of ${resistanceD} days but no wetted perimeter: give "${f.wettedPerimeter}", or "${f.bottomWidth}" and "${f.waterDepth}", or the config's "defaults.wettedPerimeterM"`,
    );
  }
  return { resistanceD, resistanceFrom: given(f.bedResistance) ? ('attribute' as const) : ('default' as const), perimeterM, perimeterFrom, depthM };
}

export function checkLines(file: string, features: unknown[], rules: InputRules): Checked<LineRecord> {
  const cutWarnings: Problem[] = [];
  const f = resolveCutNames(file, features, rules.fields.lines, cutWarnings);
  const present = presentAttributes(features);
  const mapped = (key: keyof typeof f) => rules.fields.lines[key] !== DEFAULT_RULES.fields.lines[key];
  const stageUses: FieldUse[] =
    present.has(f.stage) || !(present.has(f.stageStart) || present.has(f.stageEnd))
      ? [{ key: 'fields.lines.stage', name: f.stage, what: 'the water level', mapped: mapped('stage'), fallback: present.has(f.stageStart) && present.has(f.stageEnd) ? 'none' : null }]
      : [
          { key: 'fields.lines.stageStart', name: f.stageStart, what: 'the water level at the first vertex', mapped: mapped('stageStart'), fallback: null },
          { key: 'fields.lines.stageEnd', name: f.stageEnd, what: 'the water level at the last vertex', mapped: mapped('stageEnd'), fallback: null },
        ];
  cutWarnings.push(
    ...coverageProblems(file, features, [
      { key: 'fields.lines.id', name: f.id, what: 'a unique id', mapped: mapped('id'), fallback: null },
      { key: 'fields.lines.kind', name: f.kind, what: 'canal or drain', mapped: mapped('kind'), fallback: `the default kind "${rules.defaults.kind}"` },
      ...stageUses.filter((use) => use.fallback !== 'none'),
      ...(mapped('name') ? [{ key: 'fields.lines.name', name: f.name, what: 'a name', mapped: true, fallback: 'no name' }] : []),
      // the bed's attributes are optional; one the config names must be there
      ...(['bedResistance', 'wettedPerimeter', 'bottomWidth', 'waterDepth'] as const)
        .filter((key) => mapped(key))
        .map((key) => ({ key: `fields.lines.${key}`, name: f[key], what: BED_FIELD_WHAT[key], mapped: true, fallback: 'none' })),
    ]),
  );
  const toM = (value: number) => lengthToM(value, rules.units.elevation);
  const checked = checkAll(file, features, f.id, 'canal and drain lines (LineString or MultiLineString)', (view, warn, attempt) => {
    const kind = attempt((): LineKind => {
      const kindValue = view.properties[f.kind];
      if (kindValue === undefined || kindValue === null || kindValue === '') return rules.defaults.kind;
      const word = typeof kindValue === 'string' || typeof kindValue === 'number' ? String(kindValue).trim().toLowerCase() : null;
      if (word !== null && rules.kindWords.canal.some((w) => w.toLowerCase() === word)) return 'canal';
      if (word !== null && rules.kindWords.drain.some((w) => w.toLowerCase() === word)) return 'drain';
      throw new FeatureProblem(
        f.kind,
        `expected ${[...rules.kindWords.canal, ...rules.kindWords.drain].map((w) => `"${w}"`).join(' or ')}, found ${describeValue(kindValue)}; ` +
          'map your words to the two kinds in the config\'s "kindWords" ({"canal": [...], "drain": [...]})',
      );
    });
    const given = (field: string) => view.properties[field] !== undefined && view.properties[field] !== null && view.properties[field] !== '';
    const stage = attempt(() => {
      if (given(f.stage)) {
        if (given(f.stageStart) || given(f.stageEnd)) warn(f.stage, `both "${f.stage}" and "${f.stageStart}"/"${f.stageEnd}" are given: the constant "${f.stage}" is used`);
        const constant = toM(numberField(view, f.stage));
        return { start: constant, end: constant, field: f.stage };
      }
      if (given(f.stageStart) || given(f.stageEnd)) {
        // both ends are checked, so that one run names both when both are wrong
        const start = attempt(() => toM(numberField(view, f.stageStart)));
        const end = toM(numberField(view, f.stageEnd));
        return start === undefined ? undefined : { start, end, field: `${f.stageStart}/${f.stageEnd}` };
      }
      throw new FeatureProblem(f.stage, `missing water level: give "${f.stage}", or "${f.stageStart}" and "${f.stageEnd}"`);
    });
    const bed = attempt(() => lineBed(view, f, rules, toM, attempt));
    const partsLonLat = attempt(() => lineParts(view));
    // every longitude equal to the first one, every latitude to the first latitude
    if (partsLonLat && partsLonLat.every((part) => part.every((value, i) => value === part[i & 1]))) {
      warn('geometry', 'the line has no length (all its positions are the same point): it gets no stations');
    }
    const name = view.properties[f.name];
    // with any part undefined the feature has an error and checkAll leaves the record out
    return {
      index: view.index,
      id: view.id as string,
      name: typeof name === 'string' ? name : null,
      kind: kind as LineKind,
      stageStartM: stage?.start as number,
      stageEndM: stage?.end as number,
      stageField: stage?.field as string,
      bedResistanceD: bed?.resistanceD as number,
      bedResistanceFrom: bed?.resistanceFrom as 'attribute' | 'default',
      wettedPerimeterM: bed?.perimeterM as number,
      wettedPerimeterFrom: bed?.perimeterFrom as LineRecord['wettedPerimeterFrom'],
      waterDepthM: bed?.depthM as number,
      partsLonLat: partsLonLat as Float64Array[],
      properties: view.properties,
    };
  });
  checked.problems.unshift(...cutWarnings);
  return checked;
}

// Hydraulic conductivity of aquifer materials, H. Bouwer (1978), Groundwater Hydrology, as
// reproduced by Canter et al. (1988) [published second-hand]: from about 0.01 m/d (clay soils,
// till) to 1000 m/d (gravel). Outside that a zone is unlikely to be an aquifer, or a unit is wrong.
export const K_HANDBOOK_MIN_M_PER_DAY = 0.01;
export const K_HANDBOOK_MAX_M_PER_DAY = 1000;
// Net areal recharge beyond a few thousand mm a year exceeds what irrigation applies or a hot
// desert evaporates in a year [from memory]: most often a monthly value or a wrong unit.
export const RECHARGE_PLAUSIBLE_MM_PER_YEAR = 3000;

/**
 * Checks the zones. With `groundFromDem` (a DEM gives the ground) a zone may leave out its ground
 * level: it is NaN then, and the DEM alone gives that zone's ground.
 */
export function checkZones(file: string, features: unknown[], rules: InputRules, options: { groundFromDem?: boolean } = {}): Checked<ZoneRecord> {
  const cutWarnings: Problem[] = [];
  const f = resolveCutNames(file, features, rules.fields.zones, cutWarnings);
  const mapped = (key: keyof typeof f) => rules.fields.zones[key] !== DEFAULT_RULES.fields.zones[key];
  cutWarnings.push(
    ...coverageProblems(file, features, [
      { key: 'fields.zones.id', name: f.id, what: 'a unique id', mapped: mapped('id'), fallback: null },
      { key: 'fields.zones.k', name: f.k, what: `hydraulic conductivity, ${rules.units.k}`, mapped: mapped('k'), fallback: null },
      { key: 'fields.zones.base', name: f.base, what: `the aquifer base elevation, ${rules.units.elevation}`, mapped: mapped('base'), fallback: null },
      {
        key: 'fields.zones.ground',
        name: f.ground,
        what: `the ground elevation, ${rules.units.elevation}`,
        mapped: mapped('ground'),
        fallback: options.groundFromDem ? "the DEM's ground alone (where it has no data, the sides there are left unsolved)" : null,
      },
      { key: 'fields.zones.recharge', name: f.recharge, what: `areal recharge, ${rules.units.recharge}`, mapped: mapped('recharge'), fallback: `the default recharge of ${rules.defaults.recharge} ${rules.units.recharge}` },
      ...(mapped('edgeHead') ? [{ key: 'fields.zones.edgeHead', name: f.edgeHead, what: 'the head on the outer edge', mapped: true, fallback: 'no flow across the outer edge' }] : []),
    ]),
  );
  const toM = (value: number) => lengthToM(value, rules.units.elevation);
  const checked = checkAll(file, features, f.id, 'aquifer zones (Polygon or MultiPolygon)', (view, warn, attempt) => {
    const kMPerDay = attempt(() => {
      const kGiven = numberField(view, f.k);
      const k = kToMPerDay(kGiven, rules.units.k);
      if (!(k > 0)) throw new FeatureProblem(f.k, `hydraulic conductivity must be positive, found ${kGiven} ${rules.units.k}`);
      if (k < K_HANDBOOK_MIN_M_PER_DAY || k > K_HANDBOOK_MAX_M_PER_DAY) {
        warn(f.k, `hydraulic conductivity ${k} m/d is outside the handbook range for aquifer materials, ${K_HANDBOOK_MIN_M_PER_DAY} to ${K_HANDBOOK_MAX_M_PER_DAY} m/d (H. Bouwer, Groundwater Hydrology, 1978); check the value and its unit (${rules.units.k})`);
      }
      return k;
    });
    const baseM = attempt(() => toM(numberField(view, f.base)));
    const groundM = attempt(() => toM(numberField(view, f.ground, options.groundFromDem ? Number.NaN : undefined)));
    if (baseM !== undefined && groundM !== undefined) {
      attempt(() => {
        if (!(groundM > baseM) && !Number.isNaN(groundM)) throw new FeatureProblem(f.ground, `ground ${groundM} m must lie above the aquifer base ${baseM} m`);
      });
    }
    const rechargeMPerDay = attempt(() => {
      const rechargeGiven = numberField(view, f.recharge, rules.defaults.recharge);
      const recharge = rechargeToMPerDay(rechargeGiven, rules.units.recharge);
      const mmPerYear = rechargeFromMPerDay(recharge, 'mm/yr');
      if (Math.abs(mmPerYear) > RECHARGE_PLAUSIBLE_MM_PER_YEAR) {
        throw new FeatureProblem(f.recharge, `recharge ${rechargeGiven} ${rules.units.recharge} is ${Math.round(mmPerYear)} mm/yr, not plausible for a year (limit +-${RECHARGE_PLAUSIBLE_MM_PER_YEAR} mm/yr); check the unit`);
      }
      return recharge;
    });
    const edgeHeadM = attempt(() => {
      const given = numberField(view, f.edgeHead, Number.NaN);
      if (Number.isNaN(given)) return null;
      const head = toM(given);
      if (baseM !== undefined && !(head > baseM)) throw new FeatureProblem(f.edgeHead, `edge head ${head} m must lie above the aquifer base ${baseM} m`);
      return head;
    });
    const polygonsLonLat = attempt(() => polygonList(view));
    // with any part undefined the feature has an error and checkAll leaves the record out
    return {
      index: 0,
      edgeHeadM: edgeHeadM ?? null,
      featureIndex: view.index,
      id: view.id as string,
      kMPerDay: kMPerDay as number,
      baseM: baseM as number,
      groundM: groundM as number,
      rechargeMPerDay: rechargeMPerDay as number,
      polygonsLonLat: polygonsLonLat as number[][][][],
    };
  });
  checked.records.forEach((zone, i) => (zone.index = i));
  checked.problems.unshift(...cutWarnings);
  return checked;
}

/** The line's stage (m) at a chainage (m), varying linearly from its first vertex to its end. */
export interface LinedRange {
  fromM: number;
  toM: number;
  /** The lining's resistance (days) and the wetted perimeter it covers (m). */
  bedResistanceD: number;
  wettedPerimeterM: number;
}

/** The bed at a chainage: the lining's where a lined range covers it, else the line's own. */
export function bedAt(line: LineRecord, chainageM: number): { resistanceD: number; perimeterM: number } {
  if (line.lined) {
    for (const range of line.lined) {
      if (chainageM >= range.fromM && chainageM <= range.toM) return { resistanceD: range.bedResistanceD, perimeterM: range.wettedPerimeterM };
    }
  }
  return { resistanceD: line.bedResistanceD, perimeterM: line.wettedPerimeterM };
}

export function stageAtChainage(line: LineRecord, chainageM: number, lineLengthM: number): number {
  if (line.stageStartM === line.stageEndM || !(lineLengthM > 0)) return line.stageStartM;
  const fraction = Math.min(Math.max(chainageM / lineLengthM, 0), 1);
  return line.stageStartM + (line.stageEndM - line.stageStartM) * fraction;
}
