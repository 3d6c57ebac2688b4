// The spread from uncertain K against closed forms: no range gives the deterministic run; with one
// zone and no recharge the loss is proportional to K, so its percentiles are K's percentiles
// (a log-normal's) times the deterministic loss over K; one seed gives one answer.
import { describe, expect, it } from 'vitest';
import { screenDistrict } from '../../src/screening/screen.js';
import { percentile, readZoneSpreads, spreadFromK, Z90 } from '../../src/screening/spread.js';
import { DEFAULT_RULES } from '../../src/shared/input-rules.js';
import { box, checkedLocal, line } from './local-district.js';

const BASE = 90, L = 400, LENGTH = 3000;
function pair(k: number, recharge: number, zoneProperties: Record<string, unknown> = {}) {
  const zoneFeatures = [box('Z', { k_m_d: k, base_m: BASE, ground_m: 120, recharge_mm_yr: recharge, ...zoneProperties }, [0, -L, LENGTH, 0])];
  const { lines, zones, settings } = checkedLocal(
    [line('C', { kind: 'canal', stage_m: BASE + 15 }, [[0, 0], [LENGTH, 0]]), line('D', { kind: 'drain', stage_m: BASE + 12 }, [[0, -L], [LENGTH, -L]])],
    zoneFeatures,
    { stripsOnly: true },
  );
  const result = screenDistrict(lines, zones, settings);
  return { result, spreads: readZoneSpreads('zones.geojson', zoneFeatures, zones, DEFAULT_RULES) };
}

describe('spread from uncertain K', () => {
  it('gives the deterministic run when the range has no width', () => {
    const { result, spreads } = pair(10, 200, { k_low_m_d: 10, k_high_m_d: 10 });
    expect(spreads.problems).toEqual([]);
    const spread = spreadFromK(result, spreads.spreads, { samples: 20, seed: 7, correlated: false, top: 20 });
    const strip = result.strips[0];
    expect(spread.strips[0].lossM3PerDayKm).toEqual({ p10: strip.lossM3PerDayKm, p50: strip.lossM3PerDayKm, p90: strip.lossM3PerDayKm });
    expect(spread.strips[0].riskShare[strip.risk ?? 'unsolved']).toBe(1);
    expect(spread.strips[0].topShare).toBe(1);
  });

  it('with one zone and no recharge, gives loss percentiles of K percentiles times the loss per unit K', () => {
    // q = K (h0^2 - hL^2) / (2L): loss in proportion to K (Dupuit-Forchheimer discharge; Bear (1972), Dynamics of
    // Fluids in Porous Media, section 8.2 [from memory]); K log-normal with P10 = 5 and P90 = 20 m/d, median 10
    const { result, spreads } = pair(10, 0, { k_low_m_d: 5, k_high_m_d: 20 });
    expect(spreads.spreads[0].medianMPerDay).toBeCloseTo(10, 12);
    expect(spreads.spreads[0].logSd).toBeCloseTo(Math.log(4) / (2 * Z90), 12);
    const spread = spreadFromK(result, spreads.spreads, { samples: 2000, seed: 11, correlated: false, top: 20 });
    const perK = result.strips[0].lossM3PerDayKm / 10;
    // the log-normal's own percentiles are 5, 10 and 20 m/d; 2000 seeded draws find them within 5%
    for (const [got, k] of [[spread.strips[0].lossM3PerDayKm.p10, 5], [spread.strips[0].lossM3PerDayKm.p50, 10], [spread.strips[0].lossM3PerDayKm.p90, 20]] as const) {
      expect(Math.abs(got / (perK * k) - 1)).toBeLessThan(0.05);
    }
  });

  it('moves a range with a K the run scaled (multipliers fitted to wells, applied)', () => {
    const { result, spreads } = pair(10, 0, { k_low_m_d: 5, k_high_m_d: 20 });
    const zoneFeatures = [box('Z', { k_m_d: 10, base_m: BASE, ground_m: 120, recharge_mm_yr: 0, k_low_m_d: 5, k_high_m_d: 20 }, [0, -L, LENGTH, 0])];
    const scaled = readZoneSpreads('zones.geojson', zoneFeatures, [{ ...result.zones[0], kMPerDay: 20 }], DEFAULT_RULES).spreads[0];
    expect(scaled.medianMPerDay).toBeCloseTo(2 * spreads.spreads[0].medianMPerDay, 12);
    expect(scaled.logSd).toBe(spreads.spreads[0].logSd);
  });

  it('gives one answer for one seed, another for another', () => {
    const { result, spreads } = pair(10, 200, { k_log_sd: 0.5 });
    const once = spreadFromK(result, spreads.spreads, { samples: 50, seed: 3, correlated: false, top: 20 });
    const again = spreadFromK(result, spreads.spreads, { samples: 50, seed: 3, correlated: false, top: 20 });
    const other = spreadFromK(result, spreads.spreads, { samples: 50, seed: 4, correlated: false, top: 20 });
    expect(JSON.stringify(again)).toBe(JSON.stringify(once));
    expect(JSON.stringify(other)).not.toBe(JSON.stringify(once));
  });

  it('takes percentiles as the common definition does', () => {
    // linear interpolation between closest ranks: the 10th percentile of 1..11 is 2 (NIST/SEMATECH e-Handbook, R-7, common practice)
    expect(percentile(Float64Array.from({ length: 11 }, (_, i) => i + 1), 0.1)).toBe(2);
    expect(percentile([1, 2, 3, 4], 0.5)).toBe(2.5);
  });

  it('names a zone whose range is half given, or given twice', () => {
    expect(pair(10, 0, { k_low_m_d: 5 }).spreads.problems[0]).toMatchObject({ place: { featureId: 'Z', field: 'k_high_m_d' }, message: expect.stringMatching(/needs both "k_low_m_d" and "k_high_m_d"/) });
    expect(pair(10, 0, { k_low_m_d: 5, k_high_m_d: 20, k_log_sd: 0.3 }).spreads.problems[0]).toMatchObject({ place: { field: 'k_log_sd' } });
    expect(pair(10, 0, { k_low_m_d: 20, k_high_m_d: 5 }).spreads.problems[0]).toMatchObject({ place: { field: 'k_high_m_d' }, message: expect.stringMatching(/below/) });
  });
});
