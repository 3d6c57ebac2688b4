// The floor a screening run is measured against: what any tool must do with the same files, and no
// more. Reads and parses both inputs, indexes every segment of the lines with flatbush and runs two
// small queries per station, then reads the layers the run wrote and writes them again. Prints one
// JSON line: { seconds, maxRssMB }.
// Run by bench/screen.bench.ts: npx tsx bench/floor.ts <canals> <aquifer> <out folder> <stations>
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import Flatbush from 'flatbush';

const [canals, aquifer, outDir, stationsText] = process.argv.slice(2);
const stations = Number(stationsText);
if (!Number.isInteger(stations) || stations < 1) throw new Error(`Unexpected stations value: ${stationsText}.`);

const t0 = performance.now();
const lines = JSON.parse(readFileSync(canals, 'utf8')) as { features: { geometry: { coordinates: number[][] } }[] };
JSON.parse(readFileSync(aquifer, 'utf8'));

let segments = 0;
for (const f of lines.features) segments += f.geometry.coordinates.length - 1;
const index = new Flatbush(segments);
const midX = new Float64Array(segments), midY = new Float64Array(segments);
let s = 0;
for (const f of lines.features) {
  const c = f.geometry.coordinates;
  for (let i = 1; i < c.length; i++, s++) {
    const [x0, y0] = c[i - 1], [x1, y1] = c[i];
    index.add(Math.min(x0, x1), Math.min(y0, y1), Math.max(x0, x1), Math.max(y0, y1));
    midX[s] = (x0 + x1) / 2;
    midY[s] = (y0 + y1) / 2;
  }
}
index.finish();
// two small queries per station: the segments near it, and the nearest few
let found = 0;
const d = 1e-4; // about 10 m in degrees
for (let i = 0; i < stations; i++) {
  const k = Math.floor((i * segments) / stations);
  found += index.search(midX[k] - d, midY[k] - d, midX[k] + d, midY[k] + d).length;
  found += index.neighbors(midX[k], midY[k], 3, 10 * d).length;
}

// the layers as the run wrote them, parsed and written again
const scratch = mkdtempSync(join(tmpdir(), 'doab-floor-'));
for (const name of readdirSync(outDir)) {
  const text = readFileSync(join(outDir, name), 'utf8');
  const again = /\.(geojson|json)$/.test(name) ? JSON.stringify(JSON.parse(text)) : text;
  writeFileSync(join(scratch, name), again);
}
const seconds = (performance.now() - t0) / 1000;
rmSync(scratch, { recursive: true, force: true });
if (found === 0) throw new Error('The floor found no segment near any station.');
console.log(JSON.stringify({ seconds, maxRssMB: process.resourceUsage().maxRSS / 1024 }));
