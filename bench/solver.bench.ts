// Solves per second of the strip solver, reusing one TransectSolver, and the heap it grows by
// during the single-zone loop (it should allocate nothing). Run with `npm run bench:solver`.
import { PerformanceObserver } from 'node:perf_hooks';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { SOLVE_OK, TransectSolver } from '../src/hydraulics/transect-solver.js';

// tsx gives no way to pass --expose-gc, so turn it on here and fetch gc from a fresh context
setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;

const solver = new TransectSolver(5);

function load(zoneCount: number): void {
  for (let j = 0; j < zoneCount; j++) {
    solver.lengthM[j] = 300 + 150 * j;
    solver.kMPerDay[j] = [10, 2.5, 40, 0.8, 15][j];
    solver.rechargeMPerDay[j] = [2e-4, 5e-4, -5e-5, 1e-3, 0][j];
    solver.groundM[j] = 110;
  }
}

// stage a varies so that no solve can be skipped; the checksum keeps the results alive
function run(zoneCount: number, solves: number): number {
  let checksum = 0;
  for (let i = 0; i < solves; i++) {
    if (solver.solve(105 + (i & 1023) * 1e-4, 103, 90, zoneCount) !== SOLVE_OK) throw new Error(`Unexpected failure at solve ${i}.`);
    checksum += solver.ownSeepageM2PerDay + solver.peakWaterTableM;
  }
  return checksum;
}

function solvesPerSecond(zoneCount: number): number {
  load(zoneCount);
  run(zoneCount, 200_000);
  const batch = 500_000;
  let solves = 0, seconds = 0;
  const start = performance.now();
  while (seconds < 1.5) {
    run(zoneCount, batch);
    solves += batch;
    seconds = (performance.now() - start) / 1000;
  }
  return solves / seconds;
}

const format = (n: number) => Math.round(n).toLocaleString('en-US');

console.log(`1 zone:  ${format(solvesPerSecond(1))} solves/s`);
console.log(`5 zones: ${format(solvesPerSecond(5))} solves/s`);

// Heap growth over a million single-zone solves, with garbage collections counted. V8 boxes a
// fractional number passed to a function it has not inlined, so a caller passing fractional
// stages allocates a 16-byte heap number per call whatever the solver does; stages in whole
// metres (small integers) pass unboxed and show what the solver itself allocates.
const nextTurn = () => new Promise((resolve) => setImmediate(resolve));

async function heapGrowth(stageOf: (i: number) => number): Promise<string> {
  const solves = 1_000_000;
  const loop = () => {
    for (let i = 0; i < solves; i++) {
      if (solver.solve(stageOf(i), 103, 90, 1) !== SOLVE_OK) throw new Error(`Unexpected failure at solve ${i}.`);
    }
  };
  load(1);
  loop();
  let collections = 0, loopStart = Infinity;
  const observer = new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) if (entry.startTime >= loopStart) collections++;
  });
  observer.observe({ entryTypes: ['gc'] });
  gc();
  loopStart = performance.now();
  const before = process.memoryUsage().heapUsed;
  loop();
  const after = process.memoryUsage().heapUsed;
  await nextTurn();
  await nextTurn();
  observer.disconnect();
  return `${format(after - before)} bytes, ${collections} garbage collections`;
}

console.log(`heap growth over 1,000,000 single-zone solves, stages in whole metres: ${await heapGrowth((i) => 104 + (i & 3))}`);
console.log(`  the same with fractional stages (boxed by the caller): ${await heapGrowth((i) => 104.5 + (i & 3) * 0.01)}`);
