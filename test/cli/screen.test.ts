import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import * as gjv from 'geojson-validation';
import { beforeAll, describe, expect, it } from 'vitest';
import { freshDir, readCsv, readJson, ROOT, runCli } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const DEMO = join(ROOT, 'data-demo');

const STRIP_FIELDS = [
  'strip_id', 'line_a', 'line_b', 'length_m', 'spacing_m', 'spacing_min_m', 'spacing_max_m', 'q_a_m2_d', 'q_b_m2_d',
  'loss_a_m3_d', 'loss_b_m3_d', 'peak_water_table_m', 'peak_offset_m', 'min_depth_m', 'risk', 'risk_area_ha', 'dupuit_ratio_min', 'flags',
];
const LINE_FIELDS = ['net_loss_m3_d', 'net_loss_m3_d_km', 'paired_m', 'unpaired_m', 'unpaired_reasons'];
const RANKING_FIELDS = [
  'rank', 'strip_id', 'line_a', 'line_b', 'length_m', 'spacing_m', 'loss_m3_d', 'loss_m3_d_km', 'loss_m3_yr',
  'losing_line', 'losing_share', 'min_depth_m', 'risk', 'risk_area_ha', 'district_loss_m3_d_km', 'district_min_depth_m', 'flags',
];
const TEXT_FIELDS = new Set(['strip_id', 'line_a', 'line_b', 'losing_line', 'risk', 'flags']);

function screen(canals: string, aquifer: string, extra: string[] = []) {
  const out = freshDir('screen');
  const run = runCli(['screen', '--canals', canals, '--aquifer', aquifer, '--out', out, '--transects', ...extra]);
  return { out, run };
}

/** Twice the signed area of a lon/lat ring: positive when counter-clockwise. */
function signedArea2(ring: number[][]): number {
  let sum = 0;
  for (let i = 0; i + 1 < ring.length; i++) sum += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return sum;
}

function checkLayers(out: string) {
  const strips = readJson(join(out, 'strips.geojson'));
  const canals = readJson(join(out, 'canals.geojson'));
  const transects = readJson(join(out, 'transects.geojson'));
  for (const layer of [strips, canals, transects]) {
    // RFC 7946 structure, checked by an independent validator
    expect(gjv.valid(layer, true)).toEqual([]);
  }
  for (const feature of strips.features) {
    // RFC 7946 section 3.1.6: exterior rings counter-clockwise
    expect(signedArea2(feature.geometry.coordinates[0])).toBeGreaterThan(0);
    for (const field of STRIP_FIELDS) {
      expect(feature.properties, field).toHaveProperty(field);
      const value = feature.properties[field];
      if (TEXT_FIELDS.has(field)) expect(typeof value).toBe('string');
      // a number, or null with the strip flagged (unsolved, or one-sided with no stations of b)
      else if (value === null) expect(feature.properties.flags).toMatch(/unsolved|one-sided/);
      else expect(Number.isFinite(value), `${field}=${value}`).toBe(true);
    }
    for (const position of feature.geometry.coordinates[0]) {
      for (const v of position) expect(Math.abs(v * 1e7 - Math.round(v * 1e7))).toBeLessThan(1e-6);
    }
  }
  for (const feature of canals.features) for (const field of LINE_FIELDS) expect(feature.properties).toHaveProperty(field);
  const ranking = readCsv(join(out, 'ranking.csv'));
  expect(Object.keys(ranking[0] ?? {})).toEqual(RANKING_FIELDS);
  expect(ranking.length).toBe(strips.features.length);
  return { strips, canals, transects, ranking, record: readJson(join(out, 'run.json')) };
}

describe('doab screen on two parallel canals', () => {
  let layers: ReturnType<typeof checkLayers>;
  let run: ReturnType<typeof runCli>;
  beforeAll(() => {
    const result = screen(join(PAIR, 'canals.geojson'), join(PAIR, 'aquifer.geojson'));
    run = result.run;
    expect(run.status, run.stderr).toBe(0);
    layers = checkLayers(result.out);
  });

  it('gives the seepage of the closed form', () => {
    // Dupuit discharge q = K (h0^2 - hL^2) / (2L) (C.W. Fetter, Applied Hydrogeology, Dupuit equation [from memory];
    // W.W. Woessner and E.P. Poeter (2020), section 7.3 [published]): K 10, h0 15, hL 13, L 400 -> 0.700 m^2/d.
    expect(layers.strips.features).toHaveLength(1);
    const strip = layers.strips.features[0].properties;
    // both start at the same longitude: the southern b-lower is line a (by geometry), a-upper line b
    expect(strip.line_a).toBe('b-lower');
    expect(strip.q_b_m2_d).toBeGreaterThan(0.7 * 0.99);
    expect(strip.q_b_m2_d).toBeLessThan(0.7 * 1.01);
    expect(strip.loss_b_m3_d).toBeGreaterThan(1400 * 0.98);
    expect(strip.loss_b_m3_d).toBeLessThan(1400 * 1.02);
    // the lower canal gains what the upper loses
    expect(strip.q_b_m2_d).toBeCloseTo(-strip.q_a_m2_d, 3);
    expect(strip.loss_b_m3_d / strip.loss_a_m3_d).toBeCloseTo(-1, 2);
    expect(strip.spacing_m).toBeGreaterThan(400 * 0.999);
    expect(strip.spacing_m).toBeLessThan(400 * 1.001);
    expect(strip.risk).toBe('safe');
    // the whole 2 km of both canals face each other
    expect(strip.chainage_a_from_m).toBeCloseTo(0, 6);
    expect(strip.chainage_a_to_m).toBeGreaterThan(2000 * 0.999);
    expect(strip.chainage_a_to_m).toBeLessThan(2000 * 1.001);
    expect(strip.chainage_b_from_m).toBeLessThan(100);
    expect(strip.chainage_b_to_m).toBeGreaterThan(1900);
  });

  it('closes the mass balance on every transect', () => {
    for (const feature of layers.transects.features) {
      const p = feature.properties;
      if (p.solve !== 'ok') continue;
      expect(Math.abs(p.seepage_m2_d + p.partner_seepage_m2_d + p.recharge_m2_d)).toBeLessThan(1e-4);
    }
  });

  it('prints the summary and the caution', () => {
    expect(run.stdout).toMatch(/Top 1 strips/);
    expect(run.stdout).toMatch(/CAUTION: Screening estimate/);
    const strip = layers.strips.features[0].properties;
    expect(layers.record.totals.net_seepage_into_aquifer_strips_alone.lost_by_losing_lines_m3_d).toBeCloseTo(Math.max(strip.loss_a_m3_d, strip.loss_b_m3_d), 0);
  });
});

describe('doab screen on the demo district', () => {
  let out: string;
  let run: ReturnType<typeof runCli>;
  let layers: ReturnType<typeof checkLayers>;
  beforeAll(() => {
    const result = screen(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'));
    expect(result.run.status, result.run.stderr).toBe(0);
    run = result.run;
    out = result.out;
    layers = checkLayers(out);
  });

  it('adds up: district = sum over lines = sum over strips plus unpaired parts', () => {
    const lineLosses = layers.canals.features.map((f: any) => f.properties.net_loss_m3_d as number);
    const positive = lineLosses.filter((v: number) => v > 0).reduce((a: number, b: number) => a + b, 0);
    const net = lineLosses.reduce((a: number, b: number) => a + b, 0);
    expect(layers.record.totals.net_seepage_into_aquifer.lost_by_losing_lines_m3_d).toBeCloseTo(positive, -1);
    expect(Math.abs(layers.record.totals.net_seepage_into_aquifer.m3_d - net)).toBeLessThan(1e-3 * Math.max(1, Math.abs(positive)));
    // unpaired reaches are not solved: they add length, not loss
    const stripNet = layers.strips.features.reduce((a: number, f: any) => a + (f.properties.loss_a_m3_d ?? 0) + (f.properties.loss_b_m3_d ?? 0), 0);
    const stripLinesNet = layers.canals.features.reduce((a: number, f: any) => a + (f.properties.strip_net_loss_m3_d ?? 0), 0);
    expect(Math.abs(stripNet - stripLinesNet)).toBeLessThan(1e-3 * Math.max(1, Math.abs(positive)));
  });

  it('writes lines.csv: every line once, ranked by the net loss per km that canals.geojson carries', () => {
    const rows = readCsv(join(out, 'lines.csv'));
    expect(Object.keys(rows[0])).toEqual([
      'rank', 'line_id', 'name', 'kind', 'length_m', 'net_loss_m3_d', 'net_loss_m3_d_km', 'net_loss_m3_yr', 'loss_method',
      'coarse_cell_diff_m3_d', 'strip_net_loss_m3_d', 'covers_share', 'solved_sides_m', 'paired_m', 'unpaired_m',
    ]);
    expect(rows.map((row) => row.line_id).sort()).toEqual(layers.canals.features.map((f: any) => f.properties.id).sort());
    const perKm = rows.map((row) => Number(row.net_loss_m3_d_km));
    for (let i = 1; i < perKm.length; i++) expect(perKm[i]).toBeLessThanOrEqual(perKm[i - 1]);
    for (const row of rows) {
      const feature = layers.canals.features.find((f: any) => f.properties.id === row.line_id);
      expect(Number(row.net_loss_m3_d)).toBe(feature.properties.net_loss_m3_d);
      expect(row.loss_method).toBe(feature.properties.loss_method);
      // the district solve's figure covers the whole line, both sides
      expect(Number(row.covers_share)).toBe(row.loss_method === 'district' ? 1 : Number(row.solved_sides_m) / (2 * Number(row.length_m)));
      // a year is 365.25 days (Julian year, common practice); both figures are rounded to 6 digits
      expect(Number(row.net_loss_m3_yr) / (Number(row.net_loss_m3_d) * 365.25)).toBeCloseTo(1, 4);
    }
    expect(run.stdout).toMatch(new RegExp(`Lines that lose most per km \\(district solve; all in lines\\.csv\\): ${rows[0].line_id} `));
  });

  it('ranks by loss per km, and the ranking and risk classes are not all alike', () => {
    const perKm = layers.ranking.map((row) => Number(row.loss_m3_d_km));
    for (let i = 1; i < perKm.length; i++) expect(perKm[i]).toBeLessThanOrEqual(perKm[i - 1]);
    expect(new Set(layers.ranking.map((row) => row.risk)).size).toBeGreaterThanOrEqual(3);
    expect(layers.ranking.length).toBeGreaterThanOrEqual(8);
  });

  it('ranks by smallest depth with --rank-by risk, the same strips', () => {
    // the strips' own ranking: the district solve changes none of it, so it is left out for speed
    const byRisk = screen(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'), ['--rank-by', 'risk', '--strips-only']);
    expect(byRisk.run.status, byRisk.run.stderr).toBe(0);
    const rows = readCsv(join(byRisk.out, 'ranking.csv'));
    const depths = rows.map((row) => Number(row.min_depth_m));
    for (let i = 1; i < depths.length; i++) expect(depths[i]).toBeGreaterThanOrEqual(depths[i - 1]);
    expect(rows.map((row) => Number(row.rank))).toEqual(rows.map((_, i) => i + 1));
    expect(rows.map((row) => row.strip_id).sort()).toEqual(layers.ranking.map((row) => row.strip_id).sort());
    expect(rows[0].risk).toBe('ponded');
  });

  it('records inputs, settings and counts in run.json', () => {
    const record = layers.record;
    expect(record.inputs.canals.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(record.settings.stepM).toBe(100);
    // when it started, to the second, within this test's own run of it
    expect(Date.now() - Date.parse(record.started_at)).toBeGreaterThanOrEqual(0);
    expect(Date.now() - Date.parse(record.started_at)).toBeLessThan(10 * 60_000);
    expect(record.settings.risk.waterloggedDepthM).toBe(2);
    expect(record.work_crs.epsg).toBeGreaterThan(32600);
    expect(record.counts.strips).toBe(layers.strips.features.length);
  });

  it('gives identical bytes on a second run', () => {
    // two strips-only runs (the district solve's own reruns are checked byte for byte in test/output/rasters.test.ts)
    const first = screen(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'), ['--strips-only']);
    const again = screen(join(DEMO, 'canals.geojson'), join(DEMO, 'aquifer.geojson'), ['--strips-only']);
    expect(first.run.status).toBe(0);
    expect(again.run.status).toBe(0);
    for (const name of ['strips.geojson', 'canals.geojson', 'transects.geojson', 'ranking.csv', 'lines.csv', 'strips.sld', 'lines.sld']) {
      expect(readFileSync(join(again.out, name)).equals(readFileSync(join(first.out, name))), name).toBe(true);
    }
  });

  it('opens in GDAL, an independent reader', () => {
    const hasOgr = spawnSync('ogrinfo', ['--version']).status === 0;
    if (!hasOgr) {
      // under CI the reader must be there (.ci/run installs gdal-bin); elsewhere say why it was skipped
      expect(process.env.CI, 'ogrinfo (Debian gdal-bin) is missing').toBeFalsy();
      return;
    }
    const expected: Record<string, [number, string[]]> = {
      'strips.geojson': [layers.strips.features.length, STRIP_FIELDS],
      'canals.geojson': [layers.canals.features.length, ['id', ...LINE_FIELDS]],
      'transects.geojson': [layers.transects.features.length, ['line', 'partner', 'seepage_m2_d']],
    };
    for (const [name, [count, fields]] of Object.entries(expected)) {
      const info = execFileSync('ogrinfo', ['-ro', '-so', '-al', join(out, name)], { encoding: 'utf8' });
      expect(info).toMatch(new RegExp(`Feature Count: ${count}\\b`));
      for (const field of fields) expect(info, `${name} ${field}`).toMatch(new RegExp(`^${field}: `, 'm'));
    }
    const csv = execFileSync('ogrinfo', ['-ro', '-so', '-al', join(out, 'ranking.csv')], { encoding: 'utf8' });
    expect(csv).toMatch(new RegExp(`Feature Count: ${layers.ranking.length}\\b`));
  });
});

describe('doab screen exit codes', () => {
  it('exits 2 on bad usage', () => {
    const run = runCli(['screen', '--canals', join(PAIR, 'canals.geojson')]);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/--aquifer/);
    expect(runCli(['screen', '--canals', 'a', '--aquifer', 'b', '--out', 'c', '--step', 'ten']).status).toBe(2);
  });

  it('exits 1 on bad data, names the file, feature and field, and writes nothing', () => {
    const dir = freshDir('bad');
    const canals = readJson(join(PAIR, 'canals.geojson'));
    canals.features[1].properties.stage_m = '103,5';
    const path = join(dir, 'canals.geojson');
    writeFileSync(path, JSON.stringify(canals));
    const out = join(dir, 'out');
    const run = runCli(['screen', '--canals', path, '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out]);
    expect(run.status).toBe(1);
    expect(run.stderr).toContain(path);
    expect(run.stderr).toMatch(/feature 1 \(id "b-lower"\), field "stage_m"/);
    expect(run.stderr).not.toMatch(/at .*\.ts:\d+/);
    expect(existsSync(out) ? readdirSync(out) : []).toEqual([]);
  });

  it('exits 1 on a truncated file', () => {
    const dir = freshDir('trunc');
    const path = join(dir, 'canals.geojson');
    writeFileSync(path, readFileSync(join(PAIR, 'canals.geojson'), 'utf8').slice(0, 120));
    const run = runCli(['screen', '--canals', path, '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', join(dir, 'out')]);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/not valid JSON/);
  });
});
