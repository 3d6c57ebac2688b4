// A line whose bed resists seepage (a third-type boundary): the strip solution against closed
// forms, the clean-bed limit, a bed the water table has fallen below, and properties whatever the
// inputs (conservation, the bed's own balance, more resistance never passing more water).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { solveStrip, type StripProblem, type StripSolution } from '../../src/hydraulics/solve-strip.js';

function solved(problem: StripProblem): StripSolution {
  const solution = solveStrip(problem);
  if (!solution.ok) throw new Error(`${solution.reason}: ${solution.detail}`);
  return solution;
}

const BASE = 100;

describe('a line with a resistive bed', () => {
  it('matches the closed form for one resistive bank, one zone and no recharge', () => {
    // Dupuit-Forchheimer between the banks, q = K (h0^2 - hL^2) / (2L) (Dupuit-Forchheimer discharge,
    // e.g. Bear (1972), Dynamics of Fluids in Porous Media, section 8.2 [from memory]), and through the
    // bed q = C (H - h0) (a semi-pervious bed of resistance c: q' = P (H - h) / c, H. Bouwer (1978),
    // Groundwater Hydrology [from memory]), so h0 solves (K/2L) h0^2 + C h0 - (K hL^2 / 2L + C H) = 0 [derived]
    for (const [K, L, H, hL, C] of [
      [10, 500, 20, 15, 0.05],
      [2, 200, 25, 18, 0.5],
      [50, 1500, 30, 29, 0.01],
    ]) {
      const a = K / (2 * L), c0 = -(K * hL * hL) / (2 * L) - C * H;
      const h0 = (-C + Math.sqrt(C * C - 4 * a * c0)) / (2 * a);
      const want = C * (H - h0);
      const got = solved({
        ownStageM: BASE + H,
        partnerStageM: BASE + hL,
        baseM: BASE,
        zones: [{ lengthM: L, kMPerDay: K, rechargeMPerDay: 0, groundM: BASE + 40 }],
        ownBed: { conductanceMPerDay: C },
      });
      expect(Math.abs(got.ownSeepageM2PerDay - want) / want).toBeLessThan(1e-10);
      expect(got.ownBankHeadM).toBeCloseTo(BASE + h0, 9);
      expect(got.partnerBankHeadM).toBe(BASE + hL);
    }
  });

  it('for small head differences, is the aquifer and both beds as resistances in series', () => {
    // The head loss splits into the flow through the aquifer, L / (K D), and the entry resistance of
    // each bed, 1/C (L.F. Ernst (1962) splits a drain's head loss this way; H.P. Ritzema (ed., 1994),
    // Drainage Principles and Applications, ILRI Publication 16, chapter 8 [from memory]):
    // q = (Ha - Hb) / (L / (K D) + 1/Ca + 1/Cb), D the saturated thickness, exact as Ha - Hb -> 0.
    const K = 8, L = 400, D = 20, dH = 0.002, Ca = 0.04, Cb = 0.1;
    const got = solved({
      ownStageM: BASE + D + dH,
      partnerStageM: BASE + D,
      baseM: BASE,
      zones: [{ lengthM: L, kMPerDay: K, rechargeMPerDay: 0, groundM: BASE + 40 }],
      ownBed: { conductanceMPerDay: Ca },
      partnerBed: { conductanceMPerDay: Cb },
    });
    const want = dH / (L / (K * D) + 1 / Ca + 1 / Cb);
    expect(Math.abs(got.ownSeepageM2PerDay - want) / want).toBeLessThan(1e-4);
    expect(got.partnerSeepageM2PerDay).toBeCloseTo(-got.ownSeepageM2PerDay, 12);
  });

  it('passes conductance x (stage - underside) once the water table falls below the bed', () => {
    // A canal perched above a deep water table: seepage through the bed no longer depends on the
    // water table, q = P (H_canal - z_underside) / c (H. Bouwer (1978), Groundwater Hydrology [from memory])
    const C = 0.02, stage = BASE + 30, floor = BASE + 28;
    const got = solved({
      ownStageM: stage,
      partnerStageM: BASE + 10,
      baseM: BASE,
      zones: [{ lengthM: 300, kMPerDay: 1, rechargeMPerDay: 0, groundM: BASE + 40 }],
      ownBed: { conductanceMPerDay: C, floorM: floor },
    });
    expect(got.ownBankHeadM).toBeLessThan(floor);
    expect(got.ownSeepageM2PerDay).toBeCloseTo(C * (stage - floor), 12);
  });

  it('gives the clean-bed solution in the limit of no resistance', () => {
    const problem: StripProblem = {
      ownStageM: BASE + 22,
      partnerStageM: BASE + 18,
      baseM: BASE,
      zones: [
        { lengthM: 300, kMPerDay: 5, rechargeMPerDay: 0.001, groundM: BASE + 25 },
        { lengthM: 450, kMPerDay: 20, rechargeMPerDay: 0.0005, groundM: BASE + 24 },
      ],
    };
    const clean = solved(problem);
    const nearlyClean = solved({ ...problem, ownBed: { conductanceMPerDay: 1e9 }, partnerBed: { conductanceMPerDay: 1e9 } });
    expect(Math.abs(nearlyClean.ownSeepageM2PerDay - clean.ownSeepageM2PerDay)).toBeLessThan(1e-7 * Math.abs(clean.ownSeepageM2PerDay));
    expect(Math.abs(nearlyClean.partnerSeepageM2PerDay - clean.partnerSeepageM2PerDay)).toBeLessThan(1e-7 * Math.abs(clean.partnerSeepageM2PerDay));
    expect(nearlyClean.peakWaterTableM).toBeCloseTo(clean.peakWaterTableM, 6);
  });
});

describe('properties of the bed solution', () => {
  const drawn = fc.record({
    h0: fc.double({ min: 5, max: 40, noNaN: true }),
    hL: fc.double({ min: 5, max: 40, noNaN: true }),
    zones: fc.array(
      fc.record({
        lengthM: fc.double({ min: 50, max: 3000, noNaN: true }),
        kMPerDay: fc.double({ min: 0.1, max: 100, noNaN: true }),
        rechargeMPerDay: fc.double({ min: -0.0005, max: 0.002, noNaN: true }),
        groundM: fc.constant(BASE + 60),
      }),
      { minLength: 1, maxLength: 5 },
    ),
    // bed resistance 1 to 1000 days on a wetted perimeter of 2 to 30 m, half on each side
    cA: fc.double({ min: 1, max: 1000, noNaN: true }),
    cB: fc.double({ min: 1, max: 1000, noNaN: true }),
    perimeter: fc.double({ min: 2, max: 30, noNaN: true }),
  });
  const problem = (d: { h0: number; hL: number; zones: StripProblem['zones'] }, cA: number, cB: number, perimeter: number): StripProblem => ({
    ownStageM: BASE + d.h0,
    partnerStageM: BASE + d.hL,
    baseM: BASE,
    zones: d.zones,
    ownBed: { conductanceMPerDay: perimeter / 2 / cA },
    partnerBed: { conductanceMPerDay: perimeter / 2 / cB },
  });

  it('conserves water, and each bed passes what enters the aquifer at its bank, to 1e-9', () => {
    fc.assert(
      fc.property(drawn, (d) => {
        const result = solveStrip(problem(d, d.cA, d.cB, d.perimeter));
        if (!result.ok) return result.reason === 'aquifer-dries';
        // the scale of the terms that cancel at a bank: what each bed would pass with the aquifer at its base
        const scale = Math.max(Math.abs(result.ownSeepageM2PerDay), Math.abs(result.partnerSeepageM2PerDay), (d.perimeter / 2 / d.cA) * d.h0, (d.perimeter / 2 / d.cB) * d.hL);
        expect(Math.abs(result.massResidualM2PerDay)).toBeLessThan(1e-9 * scale);
        expect(result.bedResidualM2PerDay).toBeLessThan(1e-9 * scale);
        return true;
      }),
      { numRuns: 300 },
    );
  });

  it("never lets more water through a line's bed when its resistance grows", () => {
    fc.assert(
      fc.property(drawn, fc.double({ min: 1.01, max: 100, noNaN: true }), (d, factor) => {
        const before = solveStrip(problem(d, d.cA, d.cB, d.perimeter));
        const after = solveStrip(problem(d, d.cA * factor, d.cB, d.perimeter));
        if (!before.ok || !after.ok) return true;
        // up to rounding of the terms that cancel at the bank (what the bed would pass with the aquifer at its base)
        const rounding = 1e-12 * (d.perimeter / 2 / d.cA) * d.h0;
        expect(Math.abs(after.ownSeepageM2PerDay)).toBeLessThanOrEqual(Math.abs(before.ownSeepageM2PerDay) + rounding);
        return true;
      }),
      { numRuns: 300 },
    );
  });
});
