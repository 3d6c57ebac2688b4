// A line that faces the same partner on both of its sides: a drain inside a U-shaped canal. Each
// strip must take the drain's transects from its own side, and the drain's loss must add up.
import { describe, expect, it } from 'vitest';
import { box, line, screenLocal } from './local-district.js';

const K = 10, BASE = 90, CANAL = 105, DRAIN = 101;

function district() {
  return screenLocal(
    [
      // the U: a leg 500 m north of the drain, round the east end, back along a leg 800 m south
      line('A', { kind: 'canal', stage_m: CANAL }, [[0, 500], [4000, 500], [4600, -150], [4000, -800], [0, -800]]),
      line('D', { kind: 'drain', stage_m: DRAIN }, [[0, 0], [3500, 0]]),
    ],
    [box('Z', { k_m_d: K, base_m: BASE, ground_m: 108 }, [-5000, -5000, 10000, 5000])],
  );
}

describe('a line facing one partner on both sides', () => {
  it("gives each strip the drain's transects from its own side", () => {
    const result = district();
    // D's first vertex (0, 0) lies south of A's (0, 500), so D is each strip's line a
    const strips = result.strips.filter((s) => s.lineAId === 'D' && s.lineBId === 'A' && s.lengthM > 1000);
    expect(strips).toHaveLength(2);
    for (const strip of strips) {
      // no recharge: q = K (h0^2 - hL^2) / (2L) (Dupuit; W.W. Woessner and E.P. Poeter (2020), section 7.3 [published])
      const expected = (K * ((CANAL - BASE) ** 2 - (DRAIN - BASE) ** 2)) / (2 * strip.strip.spacingMeanM);
      expect(strip.qBM2PerDay).toBeCloseTo(expected, 3);
      expect(strip.qAM2PerDay).toBeCloseTo(-expected, 3);
    }
    const spacings = strips.map((s) => Math.round(s.strip.spacingMeanM / 100) * 100).sort((a, b) => a - b);
    expect(spacings).toEqual([500, 800]);
  });

  it("counts each of the drain's transects in one strip only, so its loss adds up", () => {
    const result = district();
    const drain = result.lines.findIndex((line) => line.id === 'D');
    const fromStrips = result.strips.reduce((sum, s) => sum + (s.strip.lineA === drain ? s.lossAM3PerDay : s.strip.lineB === drain ? s.lossBM3PerDay : 0), 0);
    expect(fromStrips).toBeCloseTo(result.lineSummaries[drain].netLossM3PerDay, 6);
    // both sides of the 3.5 km drain take in water: about 3500 m times the two closed-form gains
    const gain = 3500 * K * ((CANAL - BASE) ** 2 - (DRAIN - BASE) ** 2) / 2 * (1 / 500 + 1 / 800);
    expect(-result.lineSummaries[drain].netLossM3PerDay / gain).toBeGreaterThan(0.97);
    expect(-result.lineSummaries[drain].netLossM3PerDay / gain).toBeLessThan(1.03);
  });
});
