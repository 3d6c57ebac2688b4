// Detailed zone outlines: npx tsx bench/zones.bench.ts [lines]
// The same district solved with its zones as 4-vertex rectangles and as the same rectangles
// densified to 10,000 vertices per ring (geometry unchanged), and the ring check of one
// 8,000-vertex zone. Prints both times and their ratio; the target is a ratio of at most 1.2.
import { performance } from 'node:perf_hooks';
import { buildLineTable, buildZoneIndex, castTransects, lineLengthM, placeStations, zonePolygons } from '../src/geometry/index.js';
import { checkZones, type LineRecord, type ZoneRecord } from '../src/screening/district-inputs.js';
import { solveFacings } from '../src/screening/solve-facings.js';
import { DEFAULT_RULES } from '../src/shared/input-rules.js';
import { defaultSettings } from '../src/shared/settings.js';
import { syntheticNetwork } from './network.js';
import { densifiedRect, zoneGridOver } from './zone-grid.js';

const count = Number(process.argv[2] ?? 3000);
if (!Number.isInteger(count) || count < 2) throw new Error(`Unexpected lines value: ${process.argv[2]}.`);
const VERTICES = 10_000;
// one thread, so the figures measure the work on the zones and not how it is shared out
const settings = { ...defaultSettings(), stripsOnly: true, workers: 1 };

const geometries = syntheticNetwork(count, 1);
const table = buildLineTable(geometries);
const stations = placeStations(table, settings.stepM);
const facings = castTransects(table, stations, { maxGapM: settings.maxGapM, maxAngleDeg: settings.maxAngleDeg });
const lineLengthsM = Float64Array.from(geometries, (g) => lineLengthM(g));
const lines = geometries.map((g, i) => {
  const stageM = 176 + (i % 7) * 0.35 - (i % 3 === 2 ? 3 : 0);
  return { id: g.id, stageStartM: stageM, stageEndM: stageM - 0.6, bedResistanceD: 0, wettedPerimeterM: Number.NaN, waterDepthM: Number.NaN } as unknown as LineRecord;
});
const cells = zoneGridOver(geometries, 3);
const zones = cells.map((_, i) => ({ index: i, kMPerDay: 4 + i, baseM: 150, groundM: 180, rechargeMPerDay: 0.0005, edgeHeadM: null }) as unknown as ZoneRecord);
console.log(`district        ${count} lines, ${stations.count} stations, ${cells.length} zones`);

const indexOf = (verticesPerRing: number) => buildZoneIndex(zonePolygons(cells.map((c, zone) => ({ zone, rings: [densifiedRect(c, verticesPerRing)] }))));
const coarse = indexOf(4), detailed = indexOf(VERTICES);
const solveS = (index: typeof coarse): number => {
  const t0 = performance.now();
  solveFacings(lines, lineLengthsM, zones, index, stations, facings, settings);
  return (performance.now() - t0) / 1000;
};
// the two cases alternate and each keeps its best of four, so warming up and a stray slow run decide nothing
let coarseS = Infinity, detailedS = Infinity;
for (let run = 0; run < 4; run++) {
  coarseS = Math.min(coarseS, solveS(coarse));
  detailedS = Math.min(detailedS, solveS(detailed));
}
console.log(`solve, 4-vertex zones        ${coarseS.toFixed(3).padStart(7)} s`);
console.log(`solve, ${VERTICES}-vertex zones   ${detailedS.toFixed(3).padStart(7)} s`);
console.log(`ratio                        ${(detailedS / coarseS).toFixed(2).padStart(7)}   (target <= 1.2)`);

// one zone of 8,000 vertices in lon/lat, through the validation stage as a user's would go
const RING_VERTICES = 8000;
const ring: number[][] = [];
for (let i = 0; i < RING_VERTICES; i++) {
  const a = (2 * Math.PI * i) / RING_VERTICES;
  // a wobbly circle: many short edges, no two crossing
  const r = 0.05 * (1 + 0.1 * Math.sin(17 * a));
  ring.push([75 + r * Math.cos(a), 29.5 + r * Math.sin(a)]);
}
ring.push(ring[0]);
const feature = { type: 'Feature', properties: { id: 'Z-1', k_m_d: 8, base_m: 150, ground_m: 180 }, geometry: { type: 'Polygon', coordinates: [ring] } };
const t0 = performance.now();
const checked = checkZones('aquifer.geojson', [feature], DEFAULT_RULES);
const checkS = (performance.now() - t0) / 1000;
if (checked.problems.some((p) => p.severity === 'error')) throw new Error(`The bench ring was refused: ${checked.problems[0].message}`);
console.log(`ring check, ${RING_VERTICES} vertices     ${checkS.toFixed(3).padStart(7)} s`);
