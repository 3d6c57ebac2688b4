// doab init-config: a starting config that matches the user's own attribute names, which check
// and screen then accept, giving the same results as the same data under doab's names.
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/input/config.js';
import { freshDir, readJson, ROOT, runCliInProcess } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');

/** The fixture with the attributes renamed as a district office might name them. */
function renamedDistrict(dir: string): { canals: string; aquifer: string } {
  const canals = readJson(join(PAIR, 'canals.geojson'));
  for (const feature of canals.features) {
    const p = feature.properties;
    feature.properties = { CANAL_ID: p.id, TYPE: p.kind.toUpperCase(), WL: p.stage_m, NAME: p.name };
  }
  const aquifer = readJson(join(PAIR, 'aquifer.geojson'));
  for (const feature of aquifer.features) {
    const p = feature.properties;
    feature.properties = { ZONE: p.id, KSAT: p.k_m_d, BOT: p.base_m, DEM: p.ground_m, NET_RECHARGE: p.recharge_mm_yr };
  }
  const paths = { canals: join(dir, 'canals.geojson'), aquifer: join(dir, 'aquifer.geojson') };
  writeFileSync(paths.canals, JSON.stringify(canals));
  writeFileSync(paths.aquifer, JSON.stringify(aquifer));
  return paths;
}

describe('doab init-config', () => {
  it('matches renamed attributes, and check and screen then accept the data', async () => {
    const dir = freshDir('init-config');
    const { canals, aquifer } = renamedDistrict(dir);
    const config = join(dir, 'doab.jsonc');
    const made = await runCliInProcess(['init-config', '--canals', canals, '--aquifer', aquifer, '--out', config]);
    expect(made.status, made.stderr).toBe(0);
    const text = readFileSync(config, 'utf8');
    expect(text).toMatch(/^\/\/ doab config/);
    // every attribute found is listed in a comment, with a sample value
    for (const name of ['CANAL_ID', 'TYPE', 'WL', 'KSAT', 'BOT', 'DEM', 'NET_RECHARGE']) expect(text).toMatch(new RegExp(`//\\s+${name} \\(`));
    const parsed = parseConfig(config, text);
    expect(parsed.rules.fields.lines).toMatchObject({ id: 'CANAL_ID', kind: 'TYPE', stage: 'WL', name: 'NAME' });
    expect(parsed.rules.fields.zones).toEqual({
      id: 'ZONE', k: 'KSAT', base: 'BOT', ground: 'DEM', recharge: 'NET_RECHARGE', edgeHead: 'edge_head_m', kLow: 'k_low_m_d', kHigh: 'k_high_m_d', kLogSd: 'k_log_sd',
    });
    // the kind attribute's own words are listed beside kindWords, for the user to map
    expect(text).toContain('// Values of "TYPE" in your file: "CANAL"');
    // a single stage field was found, so the start/end pair is not called missing
    expect(text).toMatch(/"stageStart": "stage_start_m", \/\/ .*not in your file, and not needed: the other stage form is/);
    expect(text).not.toMatch(/NOT FOUND/);
    // the header's commands run as written
    expect(text).toContain(`//   doab check --canals ${canals} --aquifer ${aquifer} --config ${config}`);

    // without the config the renamed file has no ids; with it, no problem at all
    expect((await runCliInProcess(['check', '--canals', canals, '--aquifer', aquifer])).status).toBe(1);
    const checked = await runCliInProcess(['check', '--canals', canals, '--aquifer', aquifer, '--config', config]);
    expect(checked.status, checked.stdout).toBe(0);
    expect(checked.stdout).toMatch(/0 errors, 0 warnings/);

    const out = join(dir, 'out');
    const screened = await runCliInProcess(['screen', '--canals', canals, '--aquifer', aquifer, '--config', config, '--out', out, '--quiet']);
    expect(screened.status, screened.stderr).toBe(0);
    const reference = freshDir('init-config-ref');
    expect((await runCliInProcess(['screen', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', reference, '--quiet'])).status).toBe(0);
    expect(readFileSync(join(out, 'ranking.csv'), 'utf8')).toBe(readFileSync(join(reference, 'ranking.csv'), 'utf8'));
  });

  it("offers the optional bed, K range and wells fields, matched where the file has them, and check accepts the result", async () => {
    const dir = freshDir('init-beds');
    const canals = readJson(join(PAIR, 'canals.geojson'));
    for (const feature of canals.features) Object.assign(feature.properties, { CLOGGING: 20, BED_WIDTH: 3, FLOW_DEPTH: 1.2 });
    writeFileSync(join(dir, 'canals.geojson'), JSON.stringify(canals));
    const out = join(dir, 'doab.jsonc');
    const run = await runCliInProcess(['init-config', '--canals', join(dir, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out]);
    expect(run.status, run.stderr).toBe(0);
    const text = readFileSync(out, 'utf8');
    const parsed = parseConfig(out, text);
    expect(parsed.rules.fields.lines).toMatchObject({ bedResistance: 'CLOGGING', bottomWidth: 'BED_WIDTH', waterDepth: 'FLOW_DEPTH', wettedPerimeter: 'wetted_perimeter_m' });
    expect(text).toMatch(/"wettedPerimeter": "wetted_perimeter_m", \/\/ optional: .*; not in your file/);
    expect(parsed.rules.fields.wells).toEqual({ id: 'id', observed: 'water_table_m', date: 'date' });
    expect(parsed.rules.defaults).toMatchObject({ bedResistanceD: 0, wettedPerimeterM: null, bankSlope: 1.5 });
    expect(text).not.toMatch(/NOT FOUND/);
    const checked = await runCliInProcess(['check', '--canals', join(dir, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--config', out]);
    expect(checked.status, checked.stdout + checked.stderr).toBe(0);
  });

  it('does not overwrite a file unless told to', async () => {
    const dir = freshDir('init-config-force');
    const config = join(dir, 'doab.jsonc');
    writeFileSync(config, '{}');
    const args = ['init-config', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', config];
    const refused = await runCliInProcess(args);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/^doab: usage error: --out .* already exists.*--force/);
    expect(readFileSync(config, 'utf8')).toBe('{}');
    expect((await runCliInProcess([...args, '--force'])).status).toBe(0);
    expect(existsSync(config) && readFileSync(config, 'utf8').startsWith('// doab config')).toBe(true);
    // an input is never the target, --force or not, whatever the path says
    const input = join(dir, 'canals.geojson');
    writeFileSync(input, readFileSync(join(PAIR, 'canals.geojson')));
    const before = readFileSync(input);
    for (const target of [input, join(dir, '.', 'canals.geojson')]) {
      const refusedInput = await runCliInProcess(['init-config', '--canals', input, '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', target, '--force']);
      expect(refusedInput.status).toBe(2);
      expect(refusedInput.stderr).toMatch(/--out .* is your input/);
    }
    expect(readFileSync(input).equals(before)).toBe(true);
    // a folder is no file to replace: said as such, not as a file that --force would replace
    const folder = await runCliInProcess(['init-config', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', dir]);
    expect(folder.status).toBe(2);
    expect(folder.stderr).toMatch(/--out .* is not a regular file; name a file for the config/);
  });
});
