// Stable GIS schemas: GDAL's ogrinfo (an independent reader) sees one geometry type per layer and
// the same type for every field of doab's own in two different districts, whatever their numbers.
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, ROOT, runCliInProcess } from '../cli/run-cli.js';

const hasOgr = spawnSync('ogrinfo', ['--version']).status === 0;

/** Geometry type and field types of a layer, as ogrinfo reports them. */
function schema(path: string): { geometry: string; fields: Record<string, string> } {
  const info = spawnSync('ogrinfo', ['-so', '-al', path], { encoding: 'utf8' });
  expect(info.status, info.stderr).toBe(0);
  const geometry = /^Geometry: (.+)$/m.exec(info.stdout)?.[1] ?? '';
  const fields: Record<string, string> = {};
  for (const match of info.stdout.matchAll(/^(\w+): (\w+) \(/gm)) if (match[1] !== 'Geometry') fields[match[1]] = match[2];
  return { geometry, fields };
}

async function screen(canals: string, aquifer: string, extra: string[] = []): Promise<string> {
  const out = join(freshDir('schema'), 'out');
  const run = await runCliInProcess(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--quiet', '--transects', ...extra]);
  expect(run.status, run.stderr).toBe(0);
  return out;
}

describe('layer schemas as GDAL reads them', () => {
  it('are the same in two districts: one geometry type per layer, every field of ours the same type', async () => {
    if (!hasOgr) {
      expect(process.env.CI, 'ogrinfo (Debian gdal-bin) is missing').toBeFalsy();
      return;
    }
    const pair = await screen(join(ROOT, 'test/fixtures/screen/parallel-pair/canals.geojson'), join(ROOT, 'test/fixtures/screen/parallel-pair/aquifer.geojson'));
    const demo = await screen(join(ROOT, 'data-demo/canals.geojson'), join(ROOT, 'data-demo/aquifer.geojson'), ['--cell', '40']);
    const expected: Record<string, string> = { 'strips.geojson': 'Polygon', 'canals.geojson': 'Multi Line String', 'transects.geojson': 'Line String' };
    for (const [layer, geometry] of Object.entries(expected)) {
      const a = schema(join(pair, layer)), b = schema(join(demo, layer));
      expect(a.geometry, layer).toBe(geometry);
      expect(b.geometry, layer).toBe(geometry);
      // the inputs' own attributes differ between the districts; doab's fields must not
      const ours = Object.keys(a.fields).filter((field) => field in b.fields && !['id', 'kind', 'name', 'stage_m'].includes(field));
      expect(ours.length, layer).toBeGreaterThan(5);
      for (const field of ours) expect(`${field}: ${b.fields[field]}`, layer).toBe(`${field}: ${a.fields[field]}`);
      for (const field of ours) if (/_m$|_m3_d|_m2_d|_ha$/.test(field)) expect(`${field}: ${a.fields[field]}`, layer).toBe(`${field}: Real`);
    }
  }, 60_000);
});
