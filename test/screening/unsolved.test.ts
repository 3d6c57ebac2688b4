// Where the physics fails (here an aquifer that would dry between two canals under strong net
// evaporation) a strip and its lines have no loss to report: null and a flag, never a zero.
import { describe, expect, it } from 'vitest';
import { linesLayer, layerText, stripsLayer } from '../../src/output/layers.js';
import { box, line, screenLocal } from './local-district.js';

describe('unsolved transects', () => {
  it('give no loss (NaN, null in the layers), a flag and a warning', () => {
    // h = 2 m at both canals, N/K = -2900 mm/yr / 1 m/d: u(L/2) = 4 - 7.9e-3 * 200^2 < 0, dry
    const result = screenLocal(
      [line('A', { stage_m: 92 }, [[0, 0], [2000, 0]]), line('B', { stage_m: 92 }, [[0, -400], [2000, -400]])],
      [box('Z', { k_m_d: 1, base_m: 90, ground_m: 108, recharge_mm_yr: -2900 }, [-3000, -3000, 5000, 3000])],
      // the strip method's own figures: the district solve would give the lines a figure of its own
      { stripsOnly: true },
    );
    expect(result.strips).toHaveLength(1);
    const strip = result.strips[0];
    expect(strip.flags.join(';')).toMatch(/unsolved-\d+:aquifer-dries/);
    expect(strip.lossM3PerDay).toBeNaN();
    expect(strip.lossAM3PerDay).toBeNaN();
    expect(strip.risk).toBeNull();
    for (const summary of result.lineSummaries) {
      expect(summary.netLossM3PerDay).toBeNaN();
      expect(summary.solvedSidesM).toBe(0);
    }
    expect(result.totals.solvedSidesM).toBe(0);
    expect(result.warnings.join('\n')).toMatch(/could not be solved/);
    const stripProps = JSON.parse(layerText(stripsLayer(result))).features[0].properties;
    expect(stripProps.loss_a_m3_d).toBeNull();
    expect(stripProps.risk).toBe('unsolved');
    for (const feature of JSON.parse(layerText(linesLayer(result))).features) {
      expect(feature.properties.net_loss_m3_d).toBeNull();
      expect(feature.properties.net_loss_m3_d_km).toBeNull();
    }
  });
});
