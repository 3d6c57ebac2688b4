// A synthetic canal network in metres for the geometry bench and its partition test: rows of
// roughly parallel wavy canals a few km long, digitised with jitter, and some cross canals.
import type { LineGeometry } from '../src/geometry/index.js';
import { chooseWorkCrs } from '../src/geometry/work-crs.js';

import { seededRandom } from '../src/shared/random.js';

// the seeded generator, so a network is the same on every run
export { seededRandom };

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

/**
 * A synthetic district as GeoJSON features, as a user would give it: the network above in an
 * invented plain of UTM zone 43N, every third line a drain a few metres lower (so strips lose and
 * gain and the risk classes vary), and one aquifer zone 4 km beyond the lines.
 */
export function syntheticDistrict(count: number): { lineFeatures: object[]; zoneFeatures: object[]; crs: string } {
  // an invented plain in UTM zone 43N; the network's metres are offsets from this corner
  const CRS = 'EPSG:32643';
  const ORIGIN_X = 300_000, ORIGIN_Y = 3_300_000;
  const { crs } = chooseWorkCrs([74, 29, 76, 30], CRS);
  const toLonLat = (x: number, y: number) => crs.inverse([ORIGIN_X + x, ORIGIN_Y + y]);

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
  return { lineFeatures, zoneFeatures, crs: CRS };
}

/** Stations per line of syntheticNetwork at a step (m), from a sample of 2,000 lines: to aim a bench at a station count. */
export function stationsPerLine(stepM: number): number {
  const sample = syntheticNetwork(2000, 1);
  let stations = 0;
  for (const g of sample) {
    const p = g.parts[0];
    let m = 0;
    for (let i = 2; i < p.length; i += 2) m += Math.hypot(p[i] - p[i - 2], p[i + 1] - p[i - 1]);
    stations += Math.floor(m / stepM) + 1;
  }
  return stations / sample.length;
}
