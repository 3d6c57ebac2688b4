// Writes the invented input fixtures of the screen tests, with positions placed by geodesic
// distances (geographiclib-geodesic), so that "400 m apart" holds on the ellipsoid.
// Run: npx tsx scripts/make-screen-fixtures.ts
import GeographicLib from 'geographiclib-geodesic';
import { mkdirSync, writeFileSync } from 'node:fs';

const geod = GeographicLib.Geodesic.WGS84;
const round = (v: number) => Math.round(v * 1e7) / 1e7;

function move(lonLat: [number, number], azimuthDeg: number, distanceM: number): [number, number] {
  const r = geod.Direct(lonLat[1], lonLat[0], azimuthDeg, distanceM);
  return [r.lon2 as number, r.lat2 as number];
}

function write(path: string, features: object[]): void {
  const text = `{"type":"FeatureCollection","features":[\n${features.map((f) => JSON.stringify(f)).join(',\n')}\n]}\n`;
  writeFileSync(path, text);
}

function line(id: string, properties: object, positions: [number, number][]): object {
  return { type: 'Feature', properties: { id, ...properties }, geometry: { type: 'LineString', coordinates: positions.map(([a, b]) => [round(a), round(b)]) } };
}

function box(id: string, properties: object, southWest: [number, number], transectLengthM: number, heightM: number): object {
  const se = move(southWest, 90, transectLengthM);
  const ne = move(se, 0, heightM);
  const nw = move(southWest, 0, heightM);
  const ring = [southWest, se, ne, nw, southWest].map(([a, b]) => [round(a), round(b)]);
  return { type: 'Feature', properties: { id, ...properties }, geometry: { type: 'Polygon', coordinates: [ring] } };
}

// Two straight parallel canals 400 m apart over 2 km: stages 105 m and 103 m, base 90 m, K 10 m/d.
{
  const dir = 'test/fixtures/screen/parallel-pair';
  mkdirSync(dir, { recursive: true });
  const origin: [number, number] = [30.5, 29.5];
  const upper = [0, 1000, 2000].map((d) => move(origin, 90, d));
  const lower = upper.map((p) => move(p, 180, 400));
  write(`${dir}/canals.geojson`, [
    line('a-upper', { kind: 'canal', name: 'Upper Test Canal', stage_m: 105 }, upper),
    line('b-lower', { kind: 'canal', name: 'Lower Test Canal', stage_m: 103 }, lower),
  ]);
  write(`${dir}/aquifer.geojson`, [
    box('sand', { k_m_d: 10, base_m: 90, ground_m: 108, recharge_mm_yr: 0 }, move(move(origin, 180, 4000), 270, 4000), 10000, 8000),
  ]);
}
