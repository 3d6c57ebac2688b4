// `doab screen --samples N --seed S` through the CLI, in process: the spread tables and record, one
// answer for one seed, and usage errors for bad counts.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, freshDir, readCsv, readJson, runCliInProcess } from './run-cli.js';

const DEMO = join(ROOT, 'data-demo');
const screen = (out: string, extra: string[]) =>
  runCliInProcess(['screen', '--canals', join(DEMO, 'canals.geojson'), '--aquifer', join(DEMO, 'aquifer.geojson'), '--out', out, '--strips-only', '--quiet', ...extra]);

describe('doab screen --samples', () => {
  it('writes the spread per strip and per line, the same for the same seed', async () => {
    const dir = freshDir('spread');
    const [a, b] = [join(dir, 'a'), join(dir, 'b')];
    expect((await screen(a, ['--samples', '40', '--seed', '9'])).status).toBe(0);
    expect((await screen(b, ['--samples', '40', '--seed', '9'])).status).toBe(0);
    for (const name of ['spread-strips.csv', 'spread-lines.csv']) expect(readFileSync(join(b, name), 'utf8')).toBe(readFileSync(join(a, name), 'utf8'));
    const strips = readCsv(join(a, 'spread-strips.csv'));
    expect(strips).toHaveLength(readCsv(join(a, 'ranking.csv')).length);
    for (const row of strips) {
      // percentiles in order, shares of the draws summing to one
      expect(Number(row.loss_m3_d_km_p10)).toBeLessThanOrEqual(Number(row.loss_m3_d_km_p50));
      expect(Number(row.loss_m3_d_km_p50)).toBeLessThanOrEqual(Number(row.loss_m3_d_km_p90));
      const shares = ['ponded', 'waterlogged', 'potential', 'safe', 'unsolved'].reduce((sum, risk) => sum + Number(row[`share_${risk}`]), 0);
      expect(shares).toBeCloseTo(1, 9);
    }
    const record = readJson(join(a, 'run.json'));
    expect(record.k_spread).toMatchObject({ samples: 40, seed: 9, zones_drawn: 'independently' });
    expect(record.k_spread.zones).toHaveLength(5);
    expect(record.k_spread.lost_by_losing_lines_m3_d.p10).toBeLessThan(record.k_spread.lost_by_losing_lines_m3_d.p90);
  });

  it.each([
    [['--samples', '0'], /--samples must be a whole number from 1 to 100000/],
    [['--samples', '2.5'], /--samples must be a whole number/],
    [['--seed', '4'], /--seed and --correlated-k need --samples/],
  ])('refuses %j as a usage error', async (args, message) => {
    const run = await screen(join(freshDir('spread-bad'), 'out'), args);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(message);
  });
});
