// Writes data-demo/wells.geojson: invented piezometers for the demo district. Their readings are
// made, not measured: the demo screened with the district solve as it is, except that the medium
// sand (Z-2) conducts TRUE_K_FACTOR times what aquifer.geojson says, sampled at seeded places and
// given seeded errors of READING_ERROR_M (standard deviation). So the fit should suggest about
// TRUE_K_FACTOR for Z-2 and about 1 elsewhere. Run: npx tsx scripts/make-demo-wells.ts
// Deterministic: same script and demo, same bytes.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { seededRandom } from '../bench/network.js';
import { defaultConfig, loadDistrict, screenLoaded } from '../src/index.js';

const DEMO = join(dirname(fileURLToPath(import.meta.url)), '..', 'data-demo');
const TRUE_K_FACTOR = 2;
const READING_ERROR_M = 0.05;
const WELLS = 40;

const config = defaultConfig();
const district = await loadDistrict(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'), config);
district.zones = district.zones.map((zone) => (zone.id === 'Z-2' ? { ...zone, kMPerDay: zone.kMPerDay * TRUE_K_FACTOR } : zone));
const result = screenLoaded(district, config);
const solved = result.district;
if (!solved) throw new Error('the demo has no district solve');
const random = seededRandom(20261015);
// a normal deviate by Box-Muller from two uniform draws
const gaussian = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
const { columns, rows, cellM, originX, originY } = solved.grid;
const features: object[] = [];
let tries = 0;
while (features.length < WELLS && tries++ < 100_000) {
  // inside the lines' part of the district, away from the outer edge
  const col = Math.floor(random() * columns), row = Math.floor(random() * rows);
  const g = row * columns + col;
  // a free cell (not a line, not outside), its neighbours free too: a well stands in a field, not in a canal
  const free = (c: number, r: number) => c >= 0 && r >= 0 && c < columns && r < rows && solved.cellKind[r * columns + c] === 1;
  if (![[0, 0], [1, 0], [-1, 0], [0, 1], [0, -1]].every(([dc, dr]) => free(col + dc, row + dr))) continue;
  const x = originX + (col + 0.5) * cellM, y = originY + (row + 0.5) * cellM;
  const [lon, lat] = result.crs.inverse([x, y]);
  const reading = solved.waterTableM[g] + READING_ERROR_M * gaussian();
  features.push({
    type: 'Feature',
    properties: { id: `PZ-${String(features.length + 1).padStart(2, '0')}`, water_table_m: Math.round(reading * 100) / 100, date: '2026-10-15' },
    geometry: { type: 'Point', coordinates: [Math.round(lon * 1e7) / 1e7, Math.round(lat * 1e7) / 1e7] },
  });
}
writeFileSync(join(DEMO, 'wells.geojson'), `{\n"type": "FeatureCollection",\n"features": [\n${features.map((f) => JSON.stringify(f)).join(',\n')}\n]\n}\n`);
process.stderr.write(`wrote ${features.length} wells to ${join(DEMO, 'wells.geojson')} (Z-2 conducting ${TRUE_K_FACTOR} times its K, readings +-${READING_ERROR_M} m)\n`);
