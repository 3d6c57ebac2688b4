// `doab lining` through the CLI, in process: a plan on an earlier run writes its tables, layer,
// report section and record; a bad plan writes nothing and names the file, reach and key.
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { LINING_COLUMNS, PROGRAMME_COLUMNS } from '../../src/index.js';
import { freshDir, readCsv, readJson, ROOT, runCliInProcess } from './run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');

describe('doab lining', () => {
  let run: string;
  let work: string;
  beforeAll(async () => {
    work = freshDir('lining');
    run = join(work, 'run');
    // the parallel pair with its lower line a drain: what the canal loses leaves the canals
    const canals = JSON.parse(readFileSync(join(PAIR, 'canals.geojson'), 'utf8'));
    canals.features[1].properties.kind = 'drain';
    writeFileSync(join(work, 'canals.geojson'), JSON.stringify(canals));
    const screened = await runCliInProcess(['screen', '--canals', join(work, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', run, '--strips-only', '--quiet']);
    expect(screened.status, screened.stderr).toBe(0);
  });

  function planFile(name: string, plan: object | string): string {
    const path = join(work, name);
    writeFileSync(path, typeof plan === 'string' ? plan : JSON.stringify(plan));
    return path;
  }

  it('writes the reaches, the programme, the layer, a report with its lining section and a record', async () => {
    const plan = planFile('plan.json', {
      lining: { thickness_m: 0.1, k_m_d: 0.001 },
      life_years: 20,
      budget: { km: 1.5 },
      reaches: [
        { id: 'upper-east', line: 'a-upper', from_m: 1000, to_m: 2000, wetted_perimeter_m: 6, cost_per_km: 50_000 },
        { id: 'upper-west', line: 'a-upper', from_m: 0, to_m: 1000, wetted_perimeter_m: 6, cost_per_km: 50_000 },
        { id: 'lower', line: 'b-lower', wetted_perimeter_m: 6 },
      ],
    });
    const out = join(work, 'lined');
    const result = await runCliInProcess(['lining', '--run', run, '--plan', plan, '--out', out]);
    expect(result.status, result.stderr).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['lining-programme.csv', 'lining.csv', 'lining.geojson', 'report.html', 'run.json']);
    const reaches = readCsv(join(out, 'lining.csv'));
    expect(Object.keys(reaches[0])).toEqual([...LINING_COLUMNS]);
    expect(reaches.map((r) => r.reach_id)).toEqual(['upper-east', 'upper-west', 'lower']);
    // the canal loses water to the drain: lining it saves water; it is the only canal, so what the canals keep is what it stops losing
    expect(Number(reaches[0].saved_m3_d)).toBeGreaterThan(0);
    expect(Number(reaches[0].saved_m3_d)).toBeCloseTo(Number(reaches[0].line_loss_now_m3_d) - Number(reaches[0].line_loss_lined_m3_d), 1);
    // lining the drain instead holds the water table up: the canal loses less, and the strip gets shallower
    expect(Number(reaches[2].saved_m3_d)).toBeGreaterThan(0);
    const [, nowB, linedB] = /(-?[\d.]+)->(-?[\d.]+) m/.exec(reaches[2].strips_affected) ?? [];
    expect(Number(linedB)).toBeLessThan(Number(nowB));
    expect(reaches.every((r) => r.method === 'strips')).toBe(true);
    const programme = readCsv(join(out, 'lining-programme.csv'));
    expect(Object.keys(programme[0])).toEqual([...PROGRAMME_COLUMNS]);
    // 1.5 km of budget: one of the two 1 km reaches of the upper canal
    expect(programme).toHaveLength(1);
    expect(Number(programme[0].km_total)).toBeCloseTo(1, 6);
    const layer = readJson(join(out, 'lining.geojson'));
    expect(layer.features).toHaveLength(3);
    expect(layer.features[0].geometry.type).toBe('MultiLineString');
    const record = readJson(join(out, 'run.json'));
    expect(record.lining.plan.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(record.lining.programme).toEqual([programme[0].reach_id]);
    expect(record.outputs).toContain('lining.csv');
    const report = readFileSync(join(out, 'report.html'), 'utf8');
    expect(report).toContain('<section id="lining">');
    expect(report).toContain('upper-east');
    expect(result.stdout).toContain('CAUTION');
  });

  it('refuses a bad plan with exit 1, naming file, reach and key, and writes nothing', async () => {
    const plan = planFile('bad-plan.json', { reaches: [{ id: 'R-1', line: 'a-upper', lining: { resistance_d: 100 }, cost_per_km: 'cheap' }] });
    const out = join(work, 'never');
    const result = await runCliInProcess(['lining', '--run', run, '--plan', plan, '--out', out]);
    expect(result.status).toBe(1);
    expect(result.stderr).toMatch(/bad-plan\.json, feature 0 \(id "R-1"\), field "cost_per_km": must be a finite number/);
    expect(existsSync(out)).toBe(false);
  });

  it('refuses a reach on a line the run does not have, before writing', async () => {
    const plan = planFile('unknown-line.json', { lining: { resistance_d: 100 }, reaches: [{ id: 'R-9', line: 'no-such-line', wetted_perimeter_m: 5 }] });
    const out = join(work, 'never-2');
    const result = await runCliInProcess(['lining', '--run', run, '--plan', plan, '--out', out]);
    expect(result.status).toBe(1);
    expect(result.stderr).toMatch(/unknown-line\.json, feature 0 \(id "R-9"\), field "line": no line "no-such-line"/);
    expect(existsSync(out)).toBe(false);
  });
});
