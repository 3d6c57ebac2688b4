// A synthetic canal network in metres for the geometry bench and its partition test: rows of
// roughly parallel wavy canals a few km long, digitised with jitter, and some cross canals.
import type { LineGeometry } from '../src/geometry/index.js';

/** Small seeded generator (mulberry32) so a network is the same on every run. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** `count` lines: about 9 in 10 run east-west in rows, the rest cross them at an angle. */
export function syntheticNetwork(count: number, seed = 1): LineGeometry[] {
  const rnd = seededRandom(seed);
  const crossCount = Math.floor(count / 10);
  const parallelCount = count - crossCount;
  const cols = Math.max(1, Math.round(Math.sqrt(parallelCount / 4)));
  const rows = Math.ceil(parallelCount / cols);
  const blockM = 3500;
  const rowY = new Float64Array(rows + 1);
  for (let r = 1; r <= rows; r++) rowY[r] = rowY[r - 1] + 250 + 250 * rnd();
  const lines: LineGeometry[] = [];
  for (let i = 0; i < parallelCount; i++) {
    const r = Math.floor(i / cols), c = i % cols;
    const x0 = c * blockM + 100 * rnd();
    const lengthM = 2000 + 1200 * rnd();
    const waveM = 15 + 20 * rnd(), periodM = 600 + 800 * rnd(), phase = 6.3 * rnd();
    const pts: number[] = [];
    for (let x = 0; x <= lengthM; x += 25) pts.push(x0 + x, rowY[r] + waveM * Math.sin(phase + (x / periodM) * 2 * Math.PI) + 1.5 * (rnd() - 0.5));
    // some canals digitised the other way, as drains often are
    if (rnd() < 0.3) reversePairs(pts);
    lines.push({ id: `c${String(i).padStart(6, '0')}`, parts: [Float64Array.from(pts)] });
  }
  const width = cols * blockM, height = rowY[rows];
  for (let i = 0; i < crossCount; i++) {
    const x = width * rnd(), y = height * rnd();
    const angle = Math.PI / 2 + (rnd() - 0.5);
    const lengthM = 800 + 1500 * rnd();
    const pts = [x, y, x + lengthM * Math.cos(angle), y + lengthM * Math.sin(angle)];
    lines.push({ id: `x${String(i).padStart(6, '0')}`, parts: [Float64Array.from(pts)] });
  }
  return lines;
}

function reversePairs(pts: number[]): void {
  const n = pts.length / 2;
  for (let i = 0; i < n / 2; i++) {
    const j = n - 1 - i;
    [pts[2 * i], pts[2 * j]] = [pts[2 * j], pts[2 * i]];
    [pts[2 * i + 1], pts[2 * j + 1]] = [pts[2 * j + 1], pts[2 * i + 1]];
  }
}
