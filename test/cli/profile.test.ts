import { appendFileSync, copyFileSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { profileCommand } from '../../src/cli/profile-command.js';
import { safeId } from '../../src/output/profile-table.js';
import { DataError } from '../../src/shared/errors.js';
import { freshDir, readCsv, readJson, ROOT, runCli } from './run-cli.js';

const DEMO = join(ROOT, 'data-demo');

/** A copy of the demo data screened into a run folder of its own (strips only: a profile draws a strip's transect). */
function screenedCopy(): { data: string; run: string } {
  const data = freshDir('profile-data');
  for (const name of ['canals.geojson', 'aquifer.geojson']) copyFileSync(join(DEMO, name), join(data, name));
  const run = freshDir('profile-run');
  const screen = runCli(['screen', '--canals', join(data, 'canals.geojson'), '--aquifer', join(data, 'aquifer.geojson'), '--out', run, '--quiet', '--strips-only']);
  expect(screen.status, screen.stderr).toBe(0);
  return { data, run };
}

function capture() {
  const out: string[] = [], err: string[] = [];
  return { io: { out: (text: string) => void out.push(text), err: (text: string) => void err.push(text) }, out, err };
}

describe('profileCommand', () => {
  let run: string;
  let data: string;
  let strips: any[];
  beforeAll(() => {
    ({ run, data } = screenedCopy());
    strips = readJson(join(run, 'strips.geojson')).features.map((f: any) => f.properties);
  });

  it('writes the SVG and the CSV of the top strip into the run folder', async () => {
    const top = readCsv(join(run, 'ranking.csv'))[0];
    // change detector: the invented demo's top-ranked strip; the file name below follows from it
    expect(top.strip_id).toBe('D-02|C-01|0');
    const { io, out, err } = capture();
    expect(await profileCommand({ run, strip: top.strip_id }, io)).toBe(0);
    const strip = strips.find((s) => s.strip_id === top.strip_id);

    const svg = readFileSync(join(run, 'profile-D-02_C-01_0.svg'), 'utf8');
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    const label = svg.match(/<text class="peak-label" data-strip-id="([^"]*)"[^>]*>([^<]*)<\/text>/);
    expect(label?.[1]).toBe('D-02|C-01|0');
    expect(label?.[2]).toBe(`${strip.peak_water_table_m.toFixed(2)} m`);

    const text = readFileSync(join(run, 'profile-D-02_C-01_0.csv'), 'utf8');
    expect(text.split('\n')[0]).toBe('x_m,water_table_m,ground_m,base_m');
    const rows = readCsv(join(run, 'profile-D-02_C-01_0.csv')).map((row) => Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Number(v)])));
    expect(rows.length).toBeGreaterThan(200);
    expect(rows[0].x_m).toBe(0);
    for (let i = 1; i < rows.length; i++) expect(rows[i].x_m).toBeGreaterThan(rows[i - 1].x_m);
    // the demo's base is 150 m everywhere; its strip lies in the medium sand, ground 180.5 m
    expect(new Set(rows.map((row) => row.base_m))).toEqual(new Set([150]));
    expect(new Set(rows.map((row) => row.ground_m))).toEqual(new Set([180.5]));
    // the highest sample is the peak, which the profile samples exactly
    expect(Math.max(...rows.map((row) => row.water_table_m))).toBeCloseTo(strip.peak_water_table_m, 3);
    // away from the banks (10 m beside each line), the water table is nowhere shallower than the strip's smallest depth
    const width = rows[rows.length - 1].x_m;
    const inland = rows.filter((row) => row.x_m >= 10 && row.x_m <= width - 10);
    expect(Math.min(...inland.map((row) => row.ground_m - row.water_table_m))).toBeGreaterThan(strip.min_depth_m - 1e-3);

    expect(err.join('')).toMatch(/wrote profile-D-02_C-01_0\.svg, profile-D-02_C-01_0\.csv/);
    expect(out.join('')).toMatch(/peak water table 179\.62 m/);
    expect(out.join('')).toMatch(/CAUTION: Screening estimate/);
  });

  it('writes into --out when given, and only the two profile files', async () => {
    const out = join(freshDir('profile-out'), 'nested');
    const strip = strips.find((s) => s.risk === 'ponded');
    expect(await profileCommand({ run, strip: strip.strip_id, out }, capture().io)).toBe(0);
    const name = `profile-${safeId(strip.strip_id)}`;
    expect(existsSync(join(out, `${name}.svg`))).toBe(true);
    expect(existsSync(join(out, `${name}.csv`))).toBe(true);
    const svg = readFileSync(join(out, `${name}.svg`), 'utf8');
    expect(svg).toContain(`${strip.peak_water_table_m.toFixed(2)} m</text>`);
  });

  it("measures x from the strip's line a, as peak_offset_m is, whichever side the key transect came from", async () => {
    const out = freshDir('profile-side');
    const strip = strips.find((s) => s.strip_id === 'D-06|C-06|0');
    expect(await profileCommand({ run, strip: strip.strip_id, out }, capture().io)).toBe(0);
    const rows = readCsv(join(out, 'profile-D-06_C-06_0.csv')).map((row) => Object.fromEntries(Object.entries(row).map(([k, v]) => [k, Number(v)])));
    const highest = rows.reduce((best, row) => (row.water_table_m > best.water_table_m ? row : best));
    expect(highest.x_m).toBeCloseTo(strip.peak_offset_m, 2);
    expect(highest.water_table_m).toBeCloseTo(strip.peak_water_table_m, 3);
    // line b, the canal C-06, loses water into this strip and the drain D-06 (line a) takes it in,
    // so the peak is C-06's end of the water table, the far end from line a
    expect(rows[0].x_m).toBe(0);
    expect(rows[rows.length - 1].water_table_m).toBeCloseTo(strip.peak_water_table_m, 3);
    expect(rows[rows.length - 1].x_m).toBeCloseTo(strip.peak_offset_m, 2);
  });

  it('names a few valid ids when the strip is unknown', async () => {
    const attempt = profileCommand({ run, strip: 'C-11|D-99|0' }, capture().io);
    await expect(attempt).rejects.toThrow(DataError);
    await expect(profileCommand({ run, strip: 'C-11|D-99|0' }, capture().io)).rejects.toThrow(
      /run\.json: no strip "C-11\|D-99\|0" in this run; its strips include "C-11\|D-09\|0", "C-10\|C-11\|0"/,
    );
    await expect(profileCommand({ run, strip: 'nothing-like-it' }, capture().io)).rejects.toThrow(/"D-02\|C-01\|0", .*\(27 strips in all; see ranking\.csv\)/);
  });

  it('refuses an input that changed since the run, naming the file', async () => {
    const changed = screenedCopy();
    appendFileSync(join(changed.data, 'aquifer.geojson'), '\n');
    await expect(profileCommand({ run: changed.run, strip: 'D-02|C-01|0' }, capture().io)).rejects.toThrow(
      new RegExp(`${join(changed.data, 'aquifer.geojson').replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')}: changed since the run in .*run\\.json \\(SHA-256 now [0-9a-f]{64}, recorded [0-9a-f]{64}\\)`),
    );
  });

  it('refuses a folder without run.json, and a record with a setting it does not know, naming the key as run.json writes it', async () => {
    const empty = freshDir('profile-empty');
    await expect(profileCommand({ run: empty, strip: 'D-02|C-01|0' }, capture().io)).rejects.toThrow(/run\.json: not found: is .* an output folder of doab screen\?/);

    const edited = freshDir('profile-edited');
    const record = readJson(join(run, 'run.json'));
    record.settings.newSettingM = 5;
    writeFileSync(join(edited, 'run.json'), JSON.stringify(record));
    await expect(profileCommand({ run: edited, strip: 'D-02|C-01|0' }, capture().io)).rejects.toThrow(/run\.json: unknown key "settings\.newSettingM"/);

    delete record.settings.newSettingM;
    record.settings.stepM = -1;
    writeFileSync(join(edited, 'run.json'), JSON.stringify(record));
    await expect(profileCommand({ run: edited, strip: 'D-02|C-01|0' }, capture().io)).rejects.toThrow(/"settings\.stepM" must be a positive number/);
  });

  it('re-runs with the recorded settings, not the defaults', async () => {
    // a run with a coarser step has other strips; the profile must find them
    const coarse = freshDir('profile-coarse');
    const screen = runCli(['screen', '--canals', join(data, 'canals.geojson'), '--aquifer', join(data, 'aquifer.geojson'), '--out', coarse, '--step', '250', '--quiet', '--strips-only']);
    expect(screen.status, screen.stderr).toBe(0);
    const coarseStrips = readJson(join(coarse, 'strips.geojson')).features.map((f: any) => f.properties);
    const onlyCoarse = coarseStrips.find((s: any) => !strips.some((t) => t.strip_id === s.strip_id && t.length_m === s.length_m));
    expect(onlyCoarse).toBeDefined();
    const { io, out } = capture();
    expect(await profileCommand({ run: coarse, strip: onlyCoarse.strip_id }, io)).toBe(0);
    expect(out.join('')).toContain(`peak water table ${onlyCoarse.peak_water_table_m.toFixed(2)} m`);
  });

  it('makes a file name of any id', () => {
    expect(safeId('D-02|C-01|0')).toBe('D-02_C-01_0');
    expect(safeId('../../etc/x y')).toBe('.._.._etc_x_y');
    expect(safeId(`a&"'<>\\b`)).toBe('a______b');
  });
});

describe('doab profile (through the CLI)', () => {
  let run: string;
  let data: string;
  beforeAll(() => {
    ({ run, data } = screenedCopy());
  });

  it('writes the profile files and exits 0', () => {
    const out = freshDir('profile-cli-out');
    const result = runCli(['profile', '--run', run, '--strip', 'D-02|C-01|0', '--out', out]);
    expect(result.status, result.stderr).toBe(0);
    expect(existsSync(join(out, 'profile-D-02_C-01_0.svg'))).toBe(true);
    expect(readFileSync(join(out, 'profile-D-02_C-01_0.csv'), 'utf8')).toMatch(/^x_m,water_table_m,ground_m,base_m\n0,/);
    expect(result.stdout).toMatch(/^Strip D-02\|C-01\|0: key transect from D-02 to C-01/);
  });

  it('exits 1 with the valid ids for an unknown strip, and 2 without --strip', () => {
    const unknown = runCli(['profile', '--run', run, '--strip', 'C-99']);
    expect(unknown.status).toBe(1);
    expect(unknown.stderr).toMatch(/doab: error: .*run\.json: no strip "C-99" in this run; its strips include "D-02\|C-01\|0"/);
    const missing = runCli(['profile', '--run', run]);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/--strip/);
  });

  it('exits 1 naming the input that changed since the run', () => {
    const canals = join(data, 'canals.geojson');
    writeFileSync(canals, readFileSync(canals, 'utf8').replace('Heron Main Canal', 'Heron Main Canal (renamed)'));
    const changed = runCli(['profile', '--run', run, '--strip', 'D-02|C-01|0']);
    expect(changed.status).toBe(1);
    expect(changed.stderr).toContain(`doab: error: ${canals}: changed since the run`);
  });
});
