// A line that faces the same partner on both of its sides: a drain inside a U-shaped canal. Each
// strip must take the drain's transects from its own side, and the drain's loss must add up.
import { describe, expect, it } from 'vitest';
import { chooseWorkCrs } from '../../src/io/crs.js';
import { checkLines, checkZones } from '../../src/screening/district-inputs.js';
import { DEFAULT_RULES } from '../../src/screening/input-rules.js';
import { screenDistrict } from '../../src/screening/screen.js';
import { DEFAULT_SETTINGS } from '../../src/screening/settings.js';

const { crs } = chooseWorkCrs([30.4, 29.4, 30.6, 29.6], 'EPSG:32636');
const E0 = 300_000, N0 = 3_265_000;
const lonLat = (points: number[][]) => points.map(([x, y]) => crs.inverse([E0 + x, N0 + y]));

const K = 10, BASE = 90, CANAL = 105, DRAIN = 101;

function district() {
  const lines = checkLines('u.geojson', [
    // the U: a leg 500 m north of the drain, round the east end, back along a leg 800 m south
    { type: 'Feature', properties: { id: 'A', kind: 'canal', stage_m: CANAL }, geometry: { type: 'LineString', coordinates: lonLat([[0, 500], [4000, 500], [4600, -150], [4000, -800], [0, -800]]) } },
    { type: 'Feature', properties: { id: 'D', kind: 'drain', stage_m: DRAIN }, geometry: { type: 'LineString', coordinates: lonLat([[0, 0], [3500, 0]]) } },
  ], DEFAULT_RULES);
  const zones = checkZones('z.geojson', [
    { type: 'Feature', properties: { id: 'Z', k_m_d: K, base_m: BASE, ground_m: 108 }, geometry: { type: 'Polygon', coordinates: [lonLat([[-5000, -5000], [10000, -5000], [10000, 5000], [-5000, 5000], [-5000, -5000]])] } },
  ], DEFAULT_RULES);
  expect([...lines.problems, ...zones.problems]).toEqual([]);
  return screenDistrict(lines.records, zones.records, { ...DEFAULT_SETTINGS, crs: 'EPSG:32636' });
}

describe('a line facing one partner on both sides', () => {
  it("gives each strip the drain's transects from its own side", () => {
    const result = district();
    const strips = result.strips.filter((s) => s.canalA === 'A' && s.canalB === 'D' && s.lengthM > 1000);
    expect(strips).toHaveLength(2);
    for (const strip of strips) {
      // no recharge: q = K (h0^2 - hL^2) / (2L) (Dupuit; W.W. Woessner and E.P. Poeter (2020), section 7.3 [published])
      const expected = (K * ((CANAL - BASE) ** 2 - (DRAIN - BASE) ** 2)) / (2 * strip.spacingMeanM);
      expect(strip.qAM2PerDay).toBeCloseTo(expected, 3);
      expect(strip.qBM2PerDay).toBeCloseTo(-expected, 3);
    }
    const spacings = strips.map((s) => Math.round(s.spacingMeanM / 100) * 100).sort((a, b) => a - b);
    expect(spacings).toEqual([500, 800]);
  });

  it("counts each of the drain's transects in one strip only, so its loss adds up", () => {
    const result = district();
    const drain = result.lines.findIndex((line) => line.id === 'D');
    const fromStrips = result.strips.reduce((sum, s) => sum + (s.lineA === drain ? s.lossAM3PerDay : s.lineB === drain ? s.lossBM3PerDay : 0), 0);
    expect(fromStrips).toBeCloseTo(result.lineSummaries[drain].lossM3PerDay, 6);
    // both sides of the 3.5 km drain take in water: about 3500 m times the two closed-form gains
    const gain = 3500 * K * ((CANAL - BASE) ** 2 - (DRAIN - BASE) ** 2) / 2 * (1 / 500 + 1 / 800);
    expect(-result.lineSummaries[drain].lossM3PerDay / gain).toBeGreaterThan(0.97);
    expect(-result.lineSummaries[drain].lossM3PerDay / gain).toBeLessThan(1.03);
  });
});
