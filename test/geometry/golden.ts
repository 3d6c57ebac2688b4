// Runs a fixture's lines through the geometry stage and compares the result, written back in
// lon/lat, with its out.geojson. DOAB_UPDATE_GOLDEN=1 rewrites out.geojson on purpose.
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import {
  buildStrips,
  castTransects,
  FACING_REASON_NAMES,
  placeStations,
  type FacingTable,
  type LineGeometry,
  type StationTable,
  type Strip,
} from '../../src/geometry/index.js';
import { chooseWorkCrs, type WorkCrs } from '../../src/geometry/work-crs.js';

const FIXTURES = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'geometry');

export const GOLDEN_OPTIONS = { stepM: 100, maxGapM: 800, maxAngleDeg: 20 };

export interface GeometryRun {
  crs: WorkCrs;
  lines: LineGeometry[];
  stations: StationTable;
  facings: FacingTable;
  strips: Strip[];
  /** line index by id */
  line: Record<string, number>;
}

type Position = number[];
interface LineFeature {
  properties: { id: string };
  geometry: { type: 'LineString'; coordinates: Position[] } | { type: 'MultiLineString'; coordinates: Position[][] };
}

function bboxOf(features: LineFeature[]): [number, number, number, number] {
  const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const f of features) {
    const parts = f.geometry.type === 'LineString' ? [f.geometry.coordinates] : f.geometry.coordinates;
    for (const [lon, lat] of parts.flat()) {
      box[0] = Math.min(box[0], lon);
      box[1] = Math.min(box[1], lat);
      box[2] = Math.max(box[2], lon);
      box[3] = Math.max(box[3], lat);
    }
  }
  return box;
}

/** Lines given in lon/lat, projected to the chosen working CRS, through the geometry stage. */
export function runLonLat(features: LineFeature[], options = GOLDEN_OPTIONS): GeometryRun {
  const { crs } = chooseWorkCrs(bboxOf(features));
  const lines: LineGeometry[] = features.map((f) => {
    const parts = f.geometry.type === 'LineString' ? [f.geometry.coordinates] : f.geometry.coordinates;
    return { id: f.properties.id, parts: parts.map((p) => Float64Array.from(p.flatMap(([lon, lat]) => crs.forward([lon, lat])))) };
  });
  const stations = placeStations(lines, options.stepM);
  const facings = castTransects(lines, stations, options);
  const strips = buildStrips(lines, stations, facings);
  const line = Object.fromEntries(lines.map((l, i) => [l.id, i]));
  return { crs, lines, stations, facings, strips, line };
}

const r3 = (v: number): number | null => (Number.isFinite(v) ? Math.round(v * 1e3) / 1e3 : null);

function toGeoJson(run: GeometryRun): string {
  const { crs, lines, stations: s, facings: f, strips } = run;
  const lonLat = (x: number, y: number): number[] => crs.inverse([x, y]).map((v) => Math.round(v * 1e7) / 1e7);
  const features: object[] = [];
  for (let k = 0; k < f.count; k++) {
    const st = k >> 1;
    features.push({
      type: 'Feature',
      properties: {
        station: st,
        line: lines[s.line[st]].id,
        chainage_m: r3(s.chainageM[st]),
        side: k & 1 ? 'right' : 'left',
        partner: f.partner[k] >= 0 ? lines[f.partner[k]].id : null,
        reason: FACING_REASON_NAMES[f.reason[k]],
        transect_length_m: r3(f.transectLengthM[k]),
        angle_deg: r3(f.angleDeg[k]),
      },
      geometry: { type: 'LineString', coordinates: [lonLat(s.x[st], s.y[st]), lonLat(f.endX[k], f.endY[k])] },
    });
  }
  for (const strip of strips) {
    const ring: number[][] = [];
    for (let i = 0; i < strip.ringM.length; i += 2) ring.push(lonLat(strip.ringM[i], strip.ringM[i + 1]));
    features.push({
      type: 'Feature',
      properties: {
        strip: strip.id,
        line_a: lines[strip.lineA].id,
        line_b: lines[strip.lineB].id,
        side_a: strip.sideA ? 'right' : 'left',
        stations_a: strip.stationsA.length,
        stations_b: strip.stationsB.length,
        chainage_a_m: strip.chainageA.map(r3),
        chainage_b_m: strip.chainageB.map(r3),
        spacing_mean_m: r3(strip.spacingMeanM),
        spacing_min_m: r3(strip.spacingMinM),
        spacing_max_m: r3(strip.spacingMaxM),
      },
      geometry: { type: 'Polygon', coordinates: [ring] },
    });
  }
  return `{"type":"FeatureCollection","features":[\n${features.map((x) => JSON.stringify(x)).join(',\n')}\n]}\n`;
}

/** Runs fixture `name` and checks it against its golden output; returns the run for further asserts. */
export function golden(name: string): GeometryRun {
  const input = JSON.parse(readFileSync(join(FIXTURES, name, 'in.geojson'), 'utf8')) as { features: LineFeature[] };
  const run = runLonLat(input.features);
  const actual = toGeoJson(run);
  const outFile = join(FIXTURES, name, 'out.geojson');
  if (process.env.DOAB_UPDATE_GOLDEN === '1') writeFileSync(outFile, actual);
  else if (!existsSync(outFile)) throw new Error(`Missing golden file ${outFile}; run with DOAB_UPDATE_GOLDEN=1 to create it.`);
  expect(JSON.parse(actual)).toEqual(JSON.parse(readFileSync(outFile, 'utf8')));
  return run;
}
