// Strips, losses and risk classes depend on where the lines lie, never on their ids or on the order
// of the features: the demo (invented) and a generated district, screened as given and with the
// features reversed and every id renamed so that the ids sort the other way, give the same physical
// results, matched by geometry. Only the order of output rows and the ids in them may change.
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { syntheticNetwork, seededRandom } from '../../bench/network.js';
import { freshDir, readJson, ROOT, runCliInProcess } from '../cli/run-cli.js';
import { box, lonLat } from './local-district.js';

const DEMO = join(ROOT, 'data-demo');

/** The features reversed, each id replaced by one that sorts the other way, and line_a/line_b-free copies of results keyed by geometry. */
function renamed(path: string, out: string): Record<string, string> {
  const doc = JSON.parse(readFileSync(path, 'utf8'));
  const names: Record<string, string> = {};
  const ids = doc.features.map((f: any) => String(f.properties.id)).sort();
  ids.forEach((id: string, i: number) => (names[id] = `r${String(ids.length - i).padStart(4, '0')}`));
  doc.features = doc.features.reverse().map((f: any) => ({ ...f, properties: { ...f.properties, id: names[String(f.properties.id)] } }));
  writeFileSync(out, JSON.stringify(doc));
  return names;
}

async function screen(canals: string, aquifer: string, extra: string[] = []) {
  const out = join(freshDir('names'), 'out');
  const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--quiet', ...extra]);
  expect(run.status, run.stderr).toBe(0);
  return { strips: readJson(join(out, 'strips.geojson')).features, lines: readJson(join(out, 'canals.geojson')).features };
}

const PHYSICAL_STRIP = ['length_m', 'spacing_m', 'min_depth_m', 'risk', 'risk_area_ha'];

function byGeometry(features: any[], pick: (f: any) => unknown): Map<string, unknown> {
  return new Map(features.map((f) => [JSON.stringify(f.geometry.coordinates), pick(f)]));
}

/** A strip's physical figures whatever its a/b labels: the loss and seepage of each line, keyed by that line's geometry. */
function stripFigures(strip: any, lineGeometry: Map<string, string>): unknown {
  const p = strip.properties;
  const sides = [
    { line: lineGeometry.get(p.line_a), loss: p.loss_a_m3_d, q: p.q_a_m2_d },
    { line: lineGeometry.get(p.line_b), loss: p.loss_b_m3_d, q: p.q_b_m2_d },
  ].sort((x, y) => (String(x.line) < String(y.line) ? -1 : 1));
  return { ...Object.fromEntries(PHYSICAL_STRIP.map((key) => [key, p[key]])), sides };
}

async function compare(canals: string, aquifer: string, extra: string[] = []) {
  const dir = freshDir('names-in');
  const renamedCanals = join(dir, 'canals.geojson');
  renamed(canals, renamedCanals);
  const renamedAquifer = join(dir, 'aquifer.geojson');
  renamed(aquifer, renamedAquifer);
  const given = await screen(canals, aquifer, extra);
  const other = await screen(renamedCanals, renamedAquifer, extra);
  const geometryOf = (lines: any[]) => new Map(lines.map((f) => [String(f.properties.id), JSON.stringify(f.geometry.coordinates)]));
  const lineFigures = (f: any) => ({ net: f.properties.net_loss_m3_d, perKm: f.properties.net_loss_m3_d_km, paired: f.properties.paired_m, solved: f.properties.solved_sides_m });
  expect(byGeometry(other.lines, lineFigures)).toEqual(byGeometry(given.lines, lineFigures));
  expect(given.strips.length).toBeGreaterThan(3);
  expect(other.strips.length).toBe(given.strips.length);
  const givenStrips = byGeometry(given.strips, (s) => stripFigures(s, geometryOf(given.lines)));
  const otherStrips = byGeometry(other.strips, (s) => stripFigures(s, geometryOf(other.lines)));
  expect(otherStrips).toEqual(givenStrips);
}

describe('results do not depend on ids or on the order of features', () => {
  it('on the demo district, strips only', async () => {
    await compare(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'), ['--strips-only']);
  }, 60_000);

  it('on the demo district with the district solve (40 m cells, to keep the test quick)', async () => {
    await compare(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'), ['--cell', '40']);
  }, 60_000);

  it('on a generated district (seeded): canals and drains, stages from 100 to 106 m', async () => {
    const dir = freshDir('names-generated');
    const rnd = seededRandom(7);
    const lines = syntheticNetwork(30, 7).map((line, i) => ({
      type: 'Feature',
      properties: { id: line.id, kind: i % 3 === 0 ? 'drain' : 'canal', stage_m: i % 3 === 0 ? 100 + rnd() : 104 + 2 * rnd() },
      geometry: { type: 'LineString', coordinates: lonLat(Array.from({ length: line.parts[0].length / 2 }, (_, k) => [line.parts[0][2 * k], line.parts[0][2 * k + 1]])) },
    }));
    const zones = [box('west', { k_m_d: 8, base_m: 90, ground_m: 108, recharge_mm_yr: 50 }, [-500, -500, 6000, 9000]), box('east', { k_m_d: 20, base_m: 90, ground_m: 107, recharge_mm_yr: 0 }, [6000, -500, 14000, 9000])];
    const canals = join(dir, 'lines.geojson'), aquifer = join(dir, 'zones.geojson');
    writeFileSync(canals, JSON.stringify({ type: 'FeatureCollection', features: lines }));
    writeFileSync(aquifer, JSON.stringify({ type: 'FeatureCollection', features: zones }));
    await compare(canals, aquifer, ['--cell', '50']);
  }, 60_000);
});
