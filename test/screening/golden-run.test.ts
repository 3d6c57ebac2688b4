// A golden run: the parallel-pair fixture screened by `doab screen` and compared byte for byte
// with strips.geojson and canals.geojson under test/fixtures/screen/parallel-pair/golden/, which a
// person can open over the inputs in a GIS viewer. DOAB_UPDATE_GOLDEN=1 rewrites them on purpose;
// review the diff (and the layers in a viewer) before committing.
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshDir, ROOT, runCliInProcess } from '../cli/run-cli.js';

const PAIR = join(ROOT, 'test/fixtures/screen/parallel-pair');
const GOLDEN = join(PAIR, 'golden');

describe('golden run on the parallel pair', () => {
  it('writes the strips and lines layers as recorded', async () => {
    const out = join(freshDir('golden'), 'out');
    const run = await runCliInProcess(['screen', '--canals', join(PAIR, 'canals.geojson'), '--aquifer', join(PAIR, 'aquifer.geojson'), '--out', out, '--quiet']);
    expect(run.status, run.stderr).toBe(0);
    for (const name of ['strips.geojson', 'canals.geojson']) {
      const made = readFileSync(join(out, name), 'utf8');
      if (process.env.DOAB_UPDATE_GOLDEN === '1' || !existsSync(join(GOLDEN, name))) {
        mkdirSync(GOLDEN, { recursive: true });
        writeFileSync(join(GOLDEN, name), made);
      }
      expect(made, `${name} differs from the golden file`).toBe(readFileSync(join(GOLDEN, name), 'utf8'));
    }
    // what the golden strip must say, whatever was recorded: stages 105 and 103 m, base 90 m, K 10 m/d,
    // no recharge, spacing about 400 m: q = K (h0^2 - hL^2) / (2L) = 10 (225 - 169) / 800 = 0.7 m^2/d
    // (Dupuit-Forchheimer, e.g. Fetter, Applied Hydrogeology, 4th ed., section 5.x [from memory])
    const strip = JSON.parse(readFileSync(join(GOLDEN, 'strips.geojson'), 'utf8')).features[0].properties;
    const [upper, lower] = strip.line_a === 'a-upper' ? [strip.q_a_m2_d, strip.q_b_m2_d] : [strip.q_b_m2_d, strip.q_a_m2_d];
    expect(upper / 0.7).toBeCloseTo(400 / strip.spacing_m, 2);
    expect(lower).toBeCloseTo(-upper, 6);
  });
});
