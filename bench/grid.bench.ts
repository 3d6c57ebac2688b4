// Rasterising a synthetic district: npx tsx bench/grid.bench.ts [million cells] [lines]
import { performance } from 'node:perf_hooks';
import { burnLines } from '../src/geometry/grid-burn.js';
import { fillZones, polygonCells } from '../src/geometry/grid-fill.js';
import { gridOver, gridSize } from '../src/geometry/grid.js';
import type { LineGeometry } from '../src/geometry/lines.js';
import { zonePolygons } from '../src/geometry/zones.js';
import { seededRandom } from './network.js';

const millions = Number(process.argv[2] ?? 10);
const lineCount = Number(process.argv[3] ?? 4000);
if (!(millions > 0)) throw new Error(`Unexpected million cells value: ${process.argv[2]}.`);
if (!Number.isInteger(lineCount) || lineCount < 1) throw new Error(`Unexpected lines value: ${process.argv[3]}.`);

const rnd = seededRandom(1);

// a square district of 25 m cells far from the CRS origin, as a UTM district would be
const cellM = 25;
const sideM = Math.sqrt(millions * 1e6) * cellM;
const x0 = 300_000, y0 = 3_300_000;

// zones: a 20 x 20 patchwork of wobbly 64-gons that overlap their neighbours a little, every
// fifth with a hole, so the fill meets concave edges, holes and overlaps
const zoneList: { zone: number; rings: Float64Array[] }[] = [];
const blockM = sideM / 20;
for (let i = 0; i < 20; i++) {
  for (let j = 0; j < 20; j++) {
    const cx = x0 + (i + 0.5) * blockM, cy = y0 + (j + 0.5) * blockM;
    const ring = new Float64Array(128);
    for (let k = 0; k < 64; k++) {
      const a = (2 * Math.PI * k) / 64, r = blockM * (0.52 + 0.08 * rnd());
      ring[2 * k] = cx + r * Math.cos(a);
      ring[2 * k + 1] = cy + r * Math.sin(a);
    }
    const rings = [ring];
    if ((i * 20 + j) % 5 === 0) rings.push(Float64Array.from([cx - 200, cy - 200, cx + 200, cy - 200, cx + 200, cy + 200, cx - 200, cy + 200]));
    zoneList.push({ zone: i * 20 + j, rings });
  }
}
const zones = zonePolygons(zoneList);

// lines: wavy canals 2-5 km long, east-west and north-south, a vertex every 25 m
const lines: LineGeometry[] = [];
let lineM = 0;
for (let l = 0; l < lineCount; l++) {
  const eastWest = l % 3 !== 0;
  const lengthM = 2000 + 3000 * rnd();
  const sx = x0 + (sideM - lengthM) * rnd(), sy = y0 + (sideM - lengthM) * rnd();
  const wave = 20 + 40 * rnd(), period = 500 + 1500 * rnd();
  const pts: number[] = [];
  for (let s = 0; s <= lengthM; s += 25) {
    const w = wave * Math.sin((2 * Math.PI * s) / period);
    pts.push(eastWest ? sx + s : sx + w, eastWest ? sy + w : sy + s);
  }
  for (let i = 2; i < pts.length; i += 2) lineM += Math.hypot(pts[i] - pts[i - 2], pts[i + 1] - pts[i - 1]);
  lines.push({ id: `c${l}`, parts: [Float64Array.from(pts)] });
}

// strips: 2000 rotated rectangles of 1-3 km by 200-600 m
const strips: Float64Array[][] = [];
for (let s = 0; s < 2000; s++) {
  const cx = x0 + sideM * (0.05 + 0.9 * rnd()), cy = y0 + sideM * (0.05 + 0.9 * rnd());
  const hl = 500 + 1000 * rnd(), hw = 100 + 200 * rnd(), a = Math.PI * rnd();
  const ring = new Float64Array(8);
  [[-hl, -hw], [hl, -hw], [hl, hw], [-hl, hw]].forEach(([dx, dy], k) => {
    ring[2 * k] = cx + dx * Math.cos(a) - dy * Math.sin(a);
    ring[2 * k + 1] = cy + dx * Math.sin(a) + dy * Math.cos(a);
  });
  strips.push([ring]);
}

const rate = (n: number, seconds: number): string => Math.round(n / seconds).toLocaleString('en-US').padStart(14);
function timed<T>(fn: () => T): [T, number] {
  const t0 = performance.now();
  const out = fn();
  return [out, (performance.now() - t0) / 1000];
}

const [size, sizeS] = timed(() => gridSize([x0, y0, x0 + sideM, y0 + sideM], cellM));
const grid = gridOver([x0, y0, x0 + sideM, y0 + sideM], cellM);
console.log(`grid            ${grid.columns} x ${grid.rows} = ${grid.cells.toLocaleString('en-US')} cells of ${cellM} m (gridSize ${(sizeS * 1e6).toFixed(1)} us, ${size.cells} cells)`);

const [filled, fillS] = timed(() => fillZones(grid, zones));
let inZones = 0;
for (let k = 0; k < grid.cells; k++) if (filled.zone[k] >= 0) inZones++;
console.log(`fillZones       ${fillS.toFixed(3).padStart(7)} s ${rate(grid.cells, fillS)} cells/s  (${zones.count} polygons, ${inZones.toLocaleString('en-US')} cells in zones, ${filled.overlapCells.toLocaleString('en-US')} overlapping)`);

const [burned, burnS] = timed(() => burnLines(grid, lines));
console.log(`burnLines       ${burnS.toFixed(3).padStart(7)} s ${rate(grid.cells, burnS)} cells/s  (${lines.length} lines, ${(lineM / 1000).toFixed(0)} km; ${burned.cells.length.toLocaleString('en-US')} burned = ${rate(burned.cells.length, burnS).trim()} burned cells/s; ${burned.sharedCells} shared)`);

const [inside, stripS] = timed(() => polygonCells(grid, strips));
console.log(`polygonCells    ${stripS.toFixed(3).padStart(7)} s ${rate(inside.cell.length, stripS)} cells/s  (${strips.length} strips, ${inside.cell.length.toLocaleString('en-US')} cells listed)`);

const mb = (bytes: number): string => (bytes / 2 ** 20).toFixed(0);
console.log(`peak memory     rss ${mb(process.resourceUsage().maxRSS * 1024)} MB`);
