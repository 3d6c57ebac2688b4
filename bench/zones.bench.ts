// Detailed zone outlines: npx tsx bench/zones.bench.ts [lines]
// The same district solved with its zones as 4-vertex rectangles and as the same rectangles
// densified to 10,000 vertices per ring (geometry unchanged), and the ring check of one
// 8,000-vertex zone; then the cross-checks of lines against zones and of zones against each other
// (overlaps, holes) on the same zones in lon/lat, once sharing their edges and once overlapping
// their neighbours by 100 m, and the whole run (checks + solve). Prints both times and their ratio;
// the target is a ratio of at most 1.2. Each time is the best of several runs, on the clock and in
// CPU time (this process's, so time the machine gives to others is left out); the load average is
// printed too, as on a shared machine the clock's figures mean little when the load is above the cores.
import { availableParallelism, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { buildLineTable, buildZoneIndex, castTransects, lineLengthM, placeStations, zonePolygons } from '../src/geometry/index.js';
import { chooseWorkCrs } from '../src/geometry/work-crs.js';
import { crossCheck } from '../src/screening/cross-checks.js';
import { checkLines, checkZones, type LineRecord, type ZoneRecord } from '../src/screening/district-inputs.js';
import { solveFacings } from '../src/screening/solve-facings.js';
import { DEFAULT_RULES } from '../src/shared/input-rules.js';
import { defaultSettings } from '../src/shared/settings.js';
import { syntheticDistrict, syntheticNetwork } from './network.js';
import { densifiedRect, densifiedRing, zoneGridOver, type Box } from './zone-grid.js';

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
const load = (): string => `load average ${loadavg()[0].toFixed(1)} on ${availableParallelism()} cores`;
console.log(load());

const indexOf = (verticesPerRing: number) => buildZoneIndex(zonePolygons(cells.map((c, zone) => ({ zone, rings: [densifiedRect(c, verticesPerRing)] }))));
const coarse = indexOf(4), detailed = indexOf(VERTICES);
/** Seconds on the clock and in CPU time that `work` takes. */
interface Timing { s: number; cpuS: number }
function timed(work: () => void): Timing {
  const t0 = performance.now(), cpu0 = process.cpuUsage();
  work();
  const cpu = process.cpuUsage(cpu0);
  return { s: (performance.now() - t0) / 1000, cpuS: (cpu.user + cpu.system) / 1e6 };
}
const best = (a: Timing, b: Timing): Timing => ({ s: Math.min(a.s, b.s), cpuS: Math.min(a.cpuS, b.cpuS) });
const NONE: Timing = { s: Infinity, cpuS: Infinity };
const seconds = (t: Timing): string => `${t.s.toFixed(3).padStart(7)} s   (cpu ${t.cpuS.toFixed(3)} s)`;
const ratio = (detailed: Timing, plain: Timing): string =>
  `ratio                        ${(detailed.s / plain.s).toFixed(2).padStart(7)}   (cpu ${(detailed.cpuS / plain.cpuS).toFixed(2)}; target <= 1.2)`;
const solveS = (index: typeof coarse): Timing => timed(() => solveFacings(lines, lineLengthsM, zones, index, stations, facings, settings));
// the two cases alternate and each keeps its best of four, so warming up and a stray slow run decide nothing
let coarseSolve = NONE, detailedSolve = NONE;
for (let run = 0; run < 4; run++) {
  coarseSolve = best(coarseSolve, solveS(coarse));
  detailedSolve = best(detailedSolve, solveS(detailed));
}
console.log(`solve, 4-vertex zones        ${seconds(coarseSolve)}`);
console.log(`solve, ${VERTICES}-vertex zones   ${seconds(detailedSolve)}`);
console.log(ratio(detailedSolve, coarseSolve));

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

// the same district in lon/lat (syntheticDistrict's plain in UTM 43N), through the validation stage
const district = syntheticDistrict(count);
const lineRecords = checkLines('canals.geojson', district.lineFeatures, DEFAULT_RULES).records;
const { crs } = chooseWorkCrs([74, 29, 76, 30], district.crs);
const toLonLat = (x: number, y: number): number[] => crs.inverse([300_000 + x, 3_300_000 + y]);

/**
 * The cell as a lon/lat ring of `vertices` vertices: its corners projected, each side split evenly
 * in lon/lat (the same shape). A side is split from its lower-left end whichever way the ring runs,
 * so neighbours that share a side share its vertices to the last bit, as zones digitised from one map do.
 */
function lonLatRing([x0, y0, x1, y1]: Box, vertices: number): number[][] {
  return densifiedRing([toLonLat(x0, y0), toLonLat(x1, y0), toLonLat(x1, y1), toLonLat(x0, y1)], vertices);
}
const zoneRecords = (grow: number, vertices: number): ZoneRecord[] =>
  checkZones('aquifer.geojson', cells.map(([x0, y0, x1, y1], i) => ({
    type: 'Feature',
    properties: { id: `Z-${i}`, k_m_d: 8, base_m: 150, ground_m: 180 },
    geometry: { type: 'Polygon', coordinates: [lonLatRing([x0 - grow, y0 - grow, x1 + grow, y1 + grow], vertices)] },
  })), DEFAULT_RULES).records;
const crossCheckS = (zoneList: ZoneRecord[]): Timing & { problems: number } => {
  let problems = 0;
  const timing = timed(() => { problems = crossCheck(lineRecords, zoneList, { lines: 'canals.geojson', zones: 'aquifer.geojson' }, district.crs).problems.length; });
  return { ...timing, problems };
};
for (const [name, grow] of [['sharing edges', 0], ['overlapping 100 m', 50]] as const) {
  const plain = zoneRecords(grow, 4), detailed = zoneRecords(grow, VERTICES);
  let plainChecks = NONE, detailedChecks = NONE, found = '';
  // best of eight: a check takes a few tenths of a second, so one stray slow run is common
  for (let run = 0; run < 8; run++) {
    const p = crossCheckS(plain), d = crossCheckS(detailed);
    plainChecks = best(plainChecks, p);
    detailedChecks = best(detailedChecks, d);
    found = `${p.problems} and ${d.problems} problems`;
  }
  console.log(`checks, ${name}, 4-vertex zones        ${seconds(plainChecks)}`);
  console.log(`checks, ${name}, ${VERTICES}-vertex zones   ${seconds(detailedChecks)}   ${found}`);
  console.log(ratio(detailedChecks, plainChecks));
  // a run checks its zones and then solves; the solve above is on the cells themselves (sharing edges) for both layouts
  const sum = (a: Timing, b: Timing): Timing => ({ s: a.s + b.s, cpuS: a.cpuS + b.cpuS });
  const plainRun = sum(plainChecks, coarseSolve), detailedRun = sum(detailedChecks, detailedSolve);
  console.log(`whole run (checks + solve), ${name}, 4-vertex zones        ${seconds(plainRun)}`);
  console.log(`whole run (checks + solve), ${name}, ${VERTICES}-vertex zones   ${seconds(detailedRun)}`);
  console.log(ratio(detailedRun, plainRun));
}
console.log(load());
