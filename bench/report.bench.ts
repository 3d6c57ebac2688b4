// report.html for a large synthetic district: npx tsx bench/report.bench.ts [lines] [out.html]
// Builds line features and one aquifer zone around the synthetic network of bench/network.ts,
// checks them and runs the real screening pipeline, and prints the report's size and render time.
import { writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { renderDistrictMap } from '../src/report/map-svg.js';
import { renderReport } from '../src/report/report.js';
import { checkLines, checkZones } from '../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../src/shared/input-rules.js';
import { screenDistrict } from '../src/screening/screen.js';
import { DEFAULT_SETTINGS, type ScreenSettings } from '../src/shared/settings.js';
import { syntheticDistrict } from './network.js';

const count = Number(process.argv[2] ?? 5400);
if (!Number.isInteger(count) || count < 2) throw new Error(`Unexpected lines value: ${process.argv[2]}.`);

const t0 = performance.now();
const { lineFeatures, zoneFeatures, crs: CRS } = syntheticDistrict(count);
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
