// doab screen on synthetic networks of 10 k, 100 k and 1 M stations, each run as a user runs it
// (node bin/doab.js in its own process, strips only), against a floor measured in the same run
// (bench/floor.ts: read and parse the inputs, index the segments, two queries per station, write
// the layers again). Prints wall time, stations per second, peak RSS, the ratio to the floor and
// the scaling exponent between sizes. The district solve is left out: at this scale it is a
// separate matter (its own bench: bench/district-solver.bench.ts).
// With --big it reads a 2 GB GeoJSON of lines instead (written into a temporary folder, then
// removed): doab's reader in its own process, every feature handed out and dropped, to show that
// reading holds no more for a larger file.
// Run: npm run bench [-- stations...] [-- --big] (builds dist first); DOAB_BENCH_ARGS adds flags to doab screen.
import { execFileSync, spawnSync } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync, readFileSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { stationsPerLine as stationsPerLineAt, syntheticDistrict } from './network.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const big = process.argv.includes('--big');
const sizeArgs = process.argv.slice(2).filter((arg) => arg !== '--big');
const sizes = sizeArgs.length > 0 ? sizeArgs.map(Number) : big ? [] : [10_000, 100_000, 1_000_000];
for (const n of sizes) if (!Number.isInteger(n) || n < 100) throw new Error(`Unexpected stations value: ${n}.`);
const extraArgs = (process.env.DOAB_BENCH_ARGS ?? '').split(' ').filter(Boolean);
const STEP_M = 100;
const timeV = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;

// lines per station of the generator, so each size lands near its count
const stationsPerLine = stationsPerLineAt(STEP_M);

try {
  execFileSync(process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', 'tsconfig.build.json'], { cwd: root, stdio: 'pipe' });
} catch (error) {
  // tsc still writes dist/ on type errors (work in progress elsewhere in the checkout); say so and go on
  console.warn(`warning: tsc reported errors building dist/; benching what it wrote:\n${String((error as { stdout?: Buffer }).stdout ?? '').trim()}`);
}
console.log(`doab screen --strips-only, ${availableParallelism()} cores, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}${extraArgs.length ? `, extra flags: ${extraArgs.join(' ')}` : ''}`);
console.log('(the district solve is left out: at these sizes it is a separate matter; see bench/district-solver.bench.ts)');

interface Row { stations: number; wallS: number; rssMB: number; floorS: number; floorRssMB: number }
const rows: Row[] = [];
const header = `${'stations'.padStart(10)} ${'input MiB'.padStart(9)} ${'wall s'.padStart(8)} ${'stations/s'.padStart(11)} ${'peak RSS MiB'.padStart(12)} ${'floor s'.padStart(8)} ${'floor RSS'.padStart(9)} ${'x floor'.padStart(7)}`;
if (sizes.length > 0) console.log(header);
for (const target of sizes) {
  const dir = mkdtempSync(join(tmpdir(), 'doab-bench-'));
  try {
    const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(Math.max(2, Math.round(target / stationsPerLine)));
    const canals = join(dir, 'canals.geojson'), aquifer = join(dir, 'aquifer.geojson'), out = join(dir, 'out');
    writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: lineFeatures }));
    writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zoneFeatures }));
    const doab = [join(root, 'bin/doab.js'), 'screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--crs', crs, '--max-gap', '800', '--strips-only', '--quiet', ...extraArgs];
    const t0 = performance.now();
    const run = timeV ? spawnSync(timeV, ['-v', process.execPath, ...doab], { encoding: 'utf8' }) : spawnSync(process.execPath, doab, { encoding: 'utf8' });
    const wallS = (performance.now() - t0) / 1000;
    if (run.status !== 0) throw new Error(`doab screen exited ${run.status}: ${run.stderr}`);
    const rssKb = Number(/Maximum resident set size \(kbytes\): (\d+)/.exec(run.stderr)?.[1] ?? NaN);
    const record = JSON.parse(readFileSync(join(out, 'run.json'), 'utf8')) as { counts: { stations: number } };
    const stations = record.counts.stations;
    const floorRun = spawnSync(process.execPath, ['--import', 'tsx', join(root, 'bench/floor.ts'), canals, aquifer, out, String(stations)], { cwd: root, encoding: 'utf8' });
    if (floorRun.status !== 0) throw new Error(`The floor exited ${floorRun.status}: ${floorRun.stderr}`);
    const floor = JSON.parse(floorRun.stdout.trim().split('\n').pop() as string) as { seconds: number; maxRssMB: number };
    const row: Row = { stations, wallS, rssMB: rssKb / 1024, floorS: floor.seconds, floorRssMB: floor.maxRssMB };
    rows.push(row);
    console.log(
      `${stations.toLocaleString('en-US').padStart(10)} ${(statSync(canals).size / 2 ** 20).toFixed(1).padStart(9)} ${wallS.toFixed(2).padStart(8)} ${Math.round(stations / wallS).toLocaleString('en-US').padStart(11)} ${row.rssMB.toFixed(0).padStart(12)} ${floor.seconds.toFixed(2).padStart(8)} ${floor.maxRssMB.toFixed(0).padStart(9)} ${(wallS / floor.seconds).toFixed(2).padStart(7)}`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
// time grows as stations^exponent; 1 is linear (10x the stations in 10x the time)
for (let i = 1; i < rows.length; i++) {
  const a = rows[i - 1], b = rows[i];
  const exponent = (t1: number, t2: number) => (Math.log(t2 / t1) / Math.log(b.stations / a.stations)).toFixed(2);
  console.log(`scaling ${a.stations.toLocaleString('en-US')} -> ${b.stations.toLocaleString('en-US')} stations: exponent ${exponent(a.wallS, b.wallS)} (floor ${exponent(a.floorS, b.floorS)})`);
}
if (sizes.length > 0) console.log(`peak RSS from ${timeV ? '/usr/bin/time -v' : '(unavailable: no /usr/bin/time)'}; floor seconds exclude its own start-up, doab's wall time includes node's`);

// 2 GB of lines read as doab reads them: the 1 M-station district written again and again, with
// new ids, until the file passes the size
const BIG_BYTES = 2 * 1024 ** 3;
if (big) {
  const dir = mkdtempSync(join(tmpdir(), 'doab-bench-big-'));
  try {
    const path = join(dir, 'canals.geojson');
    const { lineFeatures } = syntheticDistrict(Math.round(1_000_000 / stationsPerLine));
    const fd = openSync(path, 'w');
    let bytes = 0, copies = 0, features = 0;
    try {
      bytes += writeSync(fd, '{"type":"FeatureCollection","features":[\n');
      while (bytes < BIG_BYTES) {
        for (const feature of lineFeatures as { properties: { id: string } }[]) {
          const text = JSON.stringify({ ...feature, properties: { ...feature.properties, id: `${feature.properties.id}-${copies}` } });
          bytes += writeSync(fd, `${features++ === 0 ? '' : ',\n'}${text}`);
        }
        copies++;
      }
      bytes += writeSync(fd, '\n]}\n');
    } finally {
      closeSync(fd);
    }
    // doab's reader in a process of its own: each feature handed out, counted and dropped
    const script = `import { streamGeoJsonFile } from ${JSON.stringify(join(root, 'dist/input/read-features.js'))};
const t0 = performance.now();
const read = streamGeoJsonFile(${JSON.stringify(path)}, () => {}, { maxInputMB: 100000 });
console.log(JSON.stringify({ seconds: (performance.now() - t0) / 1000, features: read.featureCount }));`;
    const args = ['--input-type=module', '-e', script];
    const run = timeV ? spawnSync(timeV, ['-v', process.execPath, ...args], { encoding: 'utf8' }) : spawnSync(process.execPath, args, { encoding: 'utf8' });
    if (run.status !== 0) throw new Error(`The reader exited ${run.status}: ${run.stderr}`);
    const read = JSON.parse(run.stdout.trim()) as { seconds: number; features: number };
    if (read.features !== features) throw new Error(`Unexpected feature count: read ${read.features} of ${features}.`);
    const rssKb = Number(/Maximum resident set size \(kbytes\): (\d+)/.exec(run.stderr)?.[1] ?? NaN);
    console.log(
      `read ${(bytes / 2 ** 30).toFixed(2)} GiB of GeoJSON (${features.toLocaleString('en-US')} lines, the 1 M-station district ${copies} times) in ${read.seconds.toFixed(1)} s ` +
        `(${(bytes / 2 ** 20 / read.seconds).toFixed(0)} MiB/s), peak RSS ${(rssKb / 1024).toFixed(0)} MiB`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
