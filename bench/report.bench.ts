// report.html for a large synthetic district: npx tsx bench/report.bench.ts [lines] [out.html]
// Builds line features and one aquifer zone around the synthetic network of bench/network.ts,
// checks them and runs the real screening pipeline, and prints the report's size and render time.
import { writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { chooseWorkCrs } from '../src/io/crs.js';
import { renderDistrictMap } from '../src/report/map-svg.js';
import { renderReport } from '../src/report/report.js';
import { checkLines, checkZones } from '../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../src/screening/input-rules.js';
import { screenDistrict } from '../src/screening/screen.js';
import { DEFAULT_SETTINGS, type ScreenSettings } from '../src/screening/settings.js';
import { syntheticNetwork } from './network.js';

const count = Number(process.argv[2] ?? 5400);
if (!Number.isInteger(count) || count < 2) throw new Error(`Unexpected lines value: ${process.argv[2]}.`);

// an invented plain in UTM zone 43N; the network's metres are offsets from this corner
const CRS = 'EPSG:32643';
const ORIGIN_X = 300_000, ORIGIN_Y = 3_300_000;
const { crs } = chooseWorkCrs([74, 29, 76, 30], CRS);
const toLonLat = (x: number, y: number) => crs.inverse([ORIGIN_X + x, ORIGIN_Y + y]);

const t0 = performance.now();
const network = syntheticNetwork(count, 1);
let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
// the lines and the zone go through the validation stage as GeoJSON features, as a user's would
const lineFeatures = network.map((geometry, index) => {
  const part = geometry.parts[0];
  const positions: number[][] = [];
  for (let i = 0; i < part.length; i += 2) {
    positions.push(toLonLat(part[i], part[i + 1]));
    minX = Math.min(minX, part[i]); maxX = Math.max(maxX, part[i]);
    minY = Math.min(minY, part[i + 1]); maxY = Math.max(maxY, part[i + 1]);
  }
  // every third line a drain a few metres lower, so strips lose and gain and classes vary
  const drain = index % 3 === 2;
  const stageStartM = drain ? 173.5 + (index % 5) * 0.4 : 176.5 + (index % 7) * 0.35;
  return {
    type: 'Feature',
    properties: { id: geometry.id, kind: drain ? 'drain' : 'canal', stage_start_m: stageStartM, stage_end_m: stageStartM - 0.6 },
    geometry: { type: 'LineString', coordinates: positions },
  };
});
const margin = 4000;
const ring = [
  [minX - margin, minY - margin], [maxX + margin, minY - margin], [maxX + margin, maxY + margin], [minX - margin, maxY + margin], [minX - margin, minY - margin],
].map(([x, y]) => toLonLat(x, y));
const zoneFeatures = [
  { type: 'Feature', properties: { id: 'Z-1', k_m_d: 8, base_m: 150, ground_m: 180, recharge_mm_yr: 200 }, geometry: { type: 'Polygon', coordinates: [ring] } },
];
const lineCheck = checkLines('bench lines', lineFeatures, DEFAULT_RULES);
const zoneCheck = checkZones('bench zones', zoneFeatures, DEFAULT_RULES);
const errors = [...lineCheck.problems, ...zoneCheck.problems].filter((p) => p.severity === 'error');
if (errors.length > 0) throw new Error(`Unexpected problems in the synthetic district: ${errors.slice(0, 3).map((p) => p.message).join('; ')}.`);
const lines = lineCheck.records, zones = zoneCheck.records;
console.log(`district        ${lines.length} lines, built in ${((performance.now() - t0) / 1000).toFixed(2)} s`);

const settings: ScreenSettings = { ...DEFAULT_SETTINGS, crs: CRS, maxGapM: 800, risk: { ...DEFAULT_SETTINGS.risk } };
const t1 = performance.now();
const result = screenDistrict(lines, zones, settings);
console.log(`screenDistrict  ${((performance.now() - t1) / 1000).toFixed(2)} s: ${result.counts.stations} stations, ${result.strips.length} strips`);
console.log(`strips by risk  ${JSON.stringify(result.totals.stripsByRisk)}`);

const meta = { version: 'bench', commandLine: ['doab', 'screen'], inputs: [] };
renderReport(result, meta); // warm up the JIT so the timed runs measure the steady state
const runs = 3;
const t2 = performance.now();
let html = '';
for (let i = 0; i < runs; i++) html = renderReport(result, meta);
const renderS = (performance.now() - t2) / 1000 / runs;
const bytes = Buffer.byteLength(html, 'utf8');
const mapBytes = Buffer.byteLength(renderDistrictMap(result).svg, 'utf8');
const tableStart = html.indexOf('<section id="ranking">'), tableEnd = html.indexOf('<section id="run">');
const profilesStart = html.indexOf('<section id="profiles">');
console.log(`renderReport    ${renderS.toFixed(3)} s (mean of ${runs})`);
console.log(`report.html     ${bytes.toLocaleString('en-US')} bytes (${(bytes / 2 ** 20).toFixed(1)} MiB), ${Math.round(bytes / result.strips.length)} bytes per strip`);
console.log(`  map svg       ${mapBytes.toLocaleString('en-US')} bytes`);
console.log(`  profiles      ${Buffer.byteLength(html.slice(profilesStart, tableStart)).toLocaleString('en-US')} bytes`);
console.log(`  table         ${Buffer.byteLength(html.slice(tableStart, tableEnd)).toLocaleString('en-US')} bytes`);
if (process.argv[3]) {
  writeFileSync(process.argv[3], html);
  console.log(`wrote           ${process.argv[3]}`);
}
