// `doab screen --wells` through the CLI, in process: the wells' table, layer, record and report
// section; the fitted multipliers suggested, then applied with --apply-k-fit (and carried into
// doab profile); bad wells stop the run with file, feature and field named.
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { box, line, lonLat } from '../screening/local-district.js';
import { freshDir, readCsv, readJson, runCliInProcess } from './run-cli.js';

const YEAR_DAYS = 365.25; // Julian year, as src/shared/units.ts [published]
const BASE = 90, H_CANAL = 15, H_DRAIN = 12, L = 400, K_TRUE = 10, RECHARGE = 400;
const N = RECHARGE / 1000 / YEAR_DAYS;
// Dupuit-Forchheimer between two lines with recharge, x from the canal (Bear (1972), Dynamics of Fluids in Porous Media, section 8.2 [from memory])
const closedForm = (x: number) => BASE + Math.sqrt(H_CANAL ** 2 - ((H_CANAL ** 2 - H_DRAIN ** 2) * x) / L + (N / K_TRUE) * x * (L - x));

describe('doab screen --wells', () => {
  let dir: string;
  const collection = (features: object[]) => JSON.stringify({ type: 'FeatureCollection', features });
  beforeAll(() => {
    dir = freshDir('wells');
    writeFileSync(join(dir, 'canals.geojson'), collection([
      line('C', { kind: 'canal', stage_m: BASE + H_CANAL }, [[0, 0], [3000, 0]]),
      line('D', { kind: 'drain', stage_m: BASE + H_DRAIN }, [[0, -L], [3000, -L]]),
    ]));
    // the inputs say K = 5 m/d; the wells read a water table of 10 m/d
    writeFileSync(join(dir, 'aquifer.geojson'), collection([box('Z', { k_m_d: K_TRUE / 2, base_m: BASE, ground_m: 120, recharge_mm_yr: RECHARGE }, [0, -L, 3000, 0])]));
    writeFileSync(join(dir, 'wells.geojson'), collection([60, 150, 220, 300, 360].map((x, i) => ({
      type: 'Feature',
      properties: { id: `PZ-${i + 1}`, water_table_m: closedForm(x), date: '2026-10-01' },
      geometry: { type: 'Point', coordinates: lonLat([[1000 + 200 * i, -x]])[0] },
    }))));
  });
  const screen = (out: string, extra: string[] = []) =>
    runCliInProcess(['screen', '--canals', join(dir, 'canals.geojson'), '--aquifer', join(dir, 'aquifer.geojson'), '--out', join(dir, out), '--strips-only', '--wells', join(dir, 'wells.geojson'), ...extra]);

  it('writes the wells, suggests the multiplier the wells call for, and does not apply it', async () => {
    const run = await screen('suggested');
    expect(run.status, run.stderr).toBe(0);
    const rows = readCsv(join(dir, 'suggested', 'wells.csv'));
    expect(Object.keys(rows[0])).toEqual(['well_id', 'zone_id', 'date', 'observed_m', 'computed_m', 'residual_m', 'method', 'note']);
    expect(rows).toHaveLength(5);
    expect(rows.every((row) => row.method === 'strips' && row.zone_id === 'Z')).toBe(true);
    const record = readJson(join(dir, 'suggested', 'run.json'));
    expect(record.wells.k_fit.applied).toBe(false);
    expect(Math.abs(record.wells.k_fit.zones[0].multiplier / 2 - 1)).toBeLessThan(0.05);
    // not applied: the water table is still that of K = 5, wetter than the wells
    expect(record.wells.all.mean_error_m).toBeGreaterThan(0.05);
    expect(readJson(join(dir, 'suggested', 'wells.geojson')).features[0].geometry.type).toBe('Point');
    expect(readFileSync(join(dir, 'suggested', 'report.html'), 'utf8')).toContain('<section id="wells">');
    expect(run.stdout).toMatch(/K multipliers that best fit the wells \(suggested, not applied/);
  });

  it('applies the multiplier with --apply-k-fit, says so, and doab profile screens with it too', async () => {
    const run = await screen('applied', ['--apply-k-fit']);
    expect(run.status, run.stderr).toBe(0);
    const record = readJson(join(dir, 'applied', 'run.json'));
    expect(record.wells.k_fit.applied).toBe(true);
    expect(record.wells.all.rmse_m).toBeLessThan(0.01);
    expect(record.warnings.join('\n')).toMatch(/carries the multipliers fitted to the wells \(--apply-k-fit\): Z x2\.0/);
    const strip = readJson(join(dir, 'applied', 'strips.geojson')).features[0].properties;
    const profiled = await runCliInProcess(['profile', '--run', join(dir, 'applied'), '--strip', strip.strip_id]);
    expect(profiled.status, profiled.stderr).toBe(0);
    expect(profiled.stdout).toContain(`peak water table ${strip.peak_water_table_m.toFixed(2)} m`);
  });

  it('stops on a bad well with file, feature and field named, and writes nothing', async () => {
    const bad = join(dir, 'bad-wells.geojson');
    writeFileSync(bad, collection([{ type: 'Feature', properties: { id: 'PZ-9', water_table_m: '101,5' }, geometry: { type: 'Point', coordinates: lonLat([[100, -100]])[0] } }]));
    const run = await runCliInProcess(['screen', '--canals', join(dir, 'canals.geojson'), '--aquifer', join(dir, 'aquifer.geojson'), '--out', join(dir, 'never'), '--strips-only', '--wells', bad]);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/bad-wells\.geojson, feature 0 \(id "PZ-9"\), field "water_table_m": expected a finite number/);
    expect(existsSync(join(dir, 'never'))).toBe(false);
  });

  it('refuses --apply-k-fit without --wells as a usage error', async () => {
    const run = await runCliInProcess(['screen', '--canals', join(dir, 'canals.geojson'), '--aquifer', join(dir, 'aquifer.geojson'), '--out', join(dir, 'never-2'), '--apply-k-fit']);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/--apply-k-fit needs --wells/);
  });
});
