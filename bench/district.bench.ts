// A whole synthetic district through doab screen as a user runs it: GeoJSON files in, every
// output written. Prints the time of each stage, stations per second and the peak resident memory.
// Run: npx tsx bench/district.bench.ts [lines] (default 10,000)
import { mkdtempSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { main } from '../src/cli/main.js';
import { syntheticDistrict } from './network.js';

const count = Number(process.argv[2] ?? 10_000);
if (!Number.isInteger(count) || count < 2) throw new Error(`Unexpected lines value: ${process.argv[2]}.`);

const dir = mkdtempSync(join(tmpdir(), 'doab-district-bench-'));
const t0 = performance.now();
const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(count);
const canals = join(dir, 'canals.geojson'), aquifer = join(dir, 'aquifer.geojson');
writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: lineFeatures }));
writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zoneFeatures }));
const generatedS = (performance.now() - t0) / 1000;
console.log(`district        ${count} lines, ${(statSync(canals).size / 2 ** 20).toFixed(1)} MiB of GeoJSON, written in ${generatedS.toFixed(2)} s`);

const out = join(dir, 'out');
let stdout = '';
const t1 = performance.now();
const code = await main(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--crs', crs, '--max-gap', '800', '--transects'], {
  out: (text) => (stdout += text),
  err: (text) => {
    // the CLI's own log lines, stamped with the time since the run began
    for (const line of text.trimEnd().split('\n')) console.log(`  ${((performance.now() - t1) / 1000).toFixed(2).padStart(6)} s  ${line}`);
  },
});
const totalS = (performance.now() - t1) / 1000;
if (code !== 0) throw new Error(`doab screen exited ${code}.`);
const stations = Number(/(\d+) stations/.exec(stdout)?.[1]);
console.log(`doab screen     ${totalS.toFixed(2)} s in all, ${Math.round(stations / totalS).toLocaleString('en-US')} stations per second (${stations} stations)`);
for (const name of readdirSync(out).sort()) console.log(`  ${name.padEnd(18)} ${(statSync(join(out, name)).size / 2 ** 20).toFixed(2)} MiB`);
console.log(`peak memory     ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB resident (maxRSS)`);
