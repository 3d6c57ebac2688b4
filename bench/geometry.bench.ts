// Geometry stage on a synthetic network: npx tsx bench/geometry.bench.ts [canals]
import { performance } from 'node:perf_hooks';
import { buildStrips, castTransects, placeStations } from '../src/geometry/index.js';
import { syntheticNetwork } from './network.js';

const count = Number(process.argv[2] ?? 10_000);
if (!Number.isInteger(count) || count < 2) throw new Error(`Unexpected canals value: ${process.argv[2]}.`);
const options = { stepM: 50, maxGapM: 800, maxAngleDeg: 20 };

let heapPeak = 0;
let buffersPeak = 0;
const sample = (): void => {
  const m = process.memoryUsage();
  heapPeak = Math.max(heapPeak, m.heapUsed);
  // typed arrays live outside the JS heap
  buffersPeak = Math.max(buffersPeak, m.arrayBuffers);
};
const mb = (bytes: number): string => (bytes / 2 ** 20).toFixed(0);

function timed<T>(label: string, fn: () => T, stationsOf: (out: T) => number): T {
  const t0 = performance.now();
  const out = fn();
  const seconds = (performance.now() - t0) / 1000;
  sample();
  console.log(`${label.padEnd(15)} ${seconds.toFixed(3).padStart(8)} s ${Math.round(stationsOf(out) / seconds).toLocaleString('en-US').padStart(12)} stations/s`);
  return out;
}

const t0 = performance.now();
const lines = syntheticNetwork(count, 1);
let vertices = 0;
for (const l of lines) for (const p of l.parts) vertices += p.length / 2;
sample();
console.log(`network         ${lines.length} lines, ${vertices} vertices, ${((performance.now() - t0) / 1000).toFixed(3)} s to generate`);

const stations = timed('placeStations', () => placeStations(lines, options.stepM), (s) => s.count);
console.log(`stations        ${stations.count} (step ${options.stepM} m)`);
const facings = timed('castTransects', () => castTransects(lines, stations, options), () => stations.count);
const strips = timed('buildStrips', () => buildStrips(lines, stations, facings), () => stations.count);
let paired = 0;
for (let k = 0; k < facings.count; k++) if (facings.reason[k] === 0) paired++;
console.log(`paired facings  ${paired} of ${facings.count}; strips ${strips.length}`);
// maxRSS is the kernel's true peak; heapUsed and arrayBuffers are sampled after each stage
console.log(`peak memory     rss ${mb(process.resourceUsage().maxRSS * 1024)} MB, heapUsed ${mb(heapPeak)} MB, arrayBuffers ${mb(buffersPeak)} MB (sampled)`);
