// doab screen in N tiles (N processes at once, as an array job starts them) and doab gather,
// against one run of doab screen, on a synthetic network: wall time and peak RSS of the single run,
// of the slowest tile and of the gathering, and whether the gathered layers equal the single
// run's byte for byte. On one machine the tiles share its cores, so the figures show the cost
// of splitting (every tile reads the whole inputs) rather than the speed of a cluster.
// Run: npx tsx bench/tiles.bench.ts [stations] [tile counts...]   (default 200000 stations, 1 2 4)
// DOAB_BENCH_ARGS adds flags to doab screen (e.g. "--strips-only"; by default the district solve runs).
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { stationsPerLine, syntheticDistrict } from './network.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const target = Number(process.argv[2] ?? 200_000);
const counts = process.argv.length > 3 ? process.argv.slice(3).map(Number) : [1, 2, 4];
if (!(Number.isInteger(target) && target >= 100)) throw new Error(`Unexpected stations value: ${process.argv[2]}.`);
for (const n of counts) if (!(Number.isInteger(n) && n >= 1)) throw new Error(`Unexpected tile count: ${n}.`);
const extraArgs = (process.env.DOAB_BENCH_ARGS ?? '').split(' ').filter(Boolean);
const timeV = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;

// lines per station of the generator at the default step (100 m)
const perLine = stationsPerLine(100);

try {
  execFileSync(process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', 'tsconfig.build.json'], { cwd: root, stdio: 'pipe' });
} catch (error) {
  console.warn(`warning: tsc reported errors building dist/; benching what it wrote:\n${String((error as { stdout?: Buffer }).stdout ?? '').trim()}`);
}

interface Measured { wallS: number; rssMB: number }

function measure(args: string[]): Promise<Measured> {
  const command = timeV ? [timeV, '-v', process.execPath, join(root, 'bin/doab.js'), ...args] : [process.execPath, join(root, 'bin/doab.js'), ...args];
  const t0 = performance.now();
  return new Promise((resolvePromise, reject) => {
    const child = spawn(command[0], command.slice(1), { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (data) => (stderr += data));
    child.on('close', (status) => {
      if (status !== 0) return reject(new Error(`doab ${args[0]} exited ${status}: ${stderr.slice(-2000)}`));
      resolvePromise({ wallS: (performance.now() - t0) / 1000, rssMB: Number(/Maximum resident set size \(kbytes\): (\d+)/.exec(stderr)?.[1] ?? NaN) / 1024 });
    });
  });
}

const sameFile = (a: string, b: string) => spawnSync('cmp', ['-s', a, b]).status === 0;

const dir = mkdtempSync(join(tmpdir(), 'doab-tiles-bench-'));
try {
  const { lineFeatures, zoneFeatures, crs } = syntheticDistrict(Math.max(2, Math.round(target / perLine)));
  const canals = join(dir, 'canals.geojson'), aquifer = join(dir, 'aquifer.geojson');
  writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: lineFeatures }));
  writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zoneFeatures }));
  const inputs = ['--canals', canals, '--aquifer', aquifer, '--crs', crs, '--max-gap', '800', '--quiet', ...extraArgs];
  console.log(`doab screen in tiles, then doab gather; ${availableParallelism()} cores, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}${extraArgs.length ? `, extra flags: ${extraArgs.join(' ')}` : ''}`);
  const single = await measure(['screen', ...inputs, '--out', join(dir, 'single')]);
  const stations = (JSON.parse(readFileSync(join(dir, 'single/run.json'), 'utf8')) as { counts: { stations: number } }).counts.stations;
  console.log(`${stations.toLocaleString('en-US')} stations; one run: ${single.wallS.toFixed(1)} s, peak RSS ${single.rssMB.toFixed(0)} MiB`);
  console.log(`${'tiles'.padStart(5)} ${'tiles wall s'.padStart(12)} ${'slowest tile s'.padStart(14)} ${'tile RSS MiB'.padStart(12)} ${'gather s'.padStart(8)} ${'gather RSS MiB'.padStart(14)} ${'total s'.padStart(7)}  same files`);
  for (const count of counts) {
    const tiles = join(dir, `tiles-${count}`);
    const t0 = performance.now();
    const perTile = await Promise.all(Array.from({ length: count }, (_, k) => measure(['screen', ...inputs, '--workers', '1', '--tile', `${k + 1}/${count}`, '--out', tiles])));
    const tilesS = (performance.now() - t0) / 1000;
    const out = join(dir, `gathered-${count}`);
    const gathered = await measure(['gather', '--tiles', tiles, '--out', out, '--quiet']);
    const compared = ['strips.geojson', 'canals.geojson', 'ranking.csv', 'lines.csv'].filter((name) => existsSync(join(dir, 'single', name)));
    const same = compared.every((name) => sameFile(join(dir, 'single', name), join(out, name)));
    console.log(
      `${String(count).padStart(5)} ${tilesS.toFixed(1).padStart(12)} ${Math.max(...perTile.map((t) => t.wallS)).toFixed(1).padStart(14)} ${Math.max(...perTile.map((t) => t.rssMB)).toFixed(0).padStart(12)} ${gathered.wallS.toFixed(1).padStart(8)} ${gathered.rssMB.toFixed(0).padStart(14)} ${(tilesS + gathered.wallS).toFixed(1).padStart(7)}  ${same ? 'yes' : 'NO'} (${compared.join(', ')})`,
    );
    rmSync(tiles, { recursive: true, force: true });
    rmSync(out, { recursive: true, force: true });
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
