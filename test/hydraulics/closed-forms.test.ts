// The strip solver against the closed forms of steady Dupuit-Forchheimer flow between two fully
// penetrating canals on a horizontal base (x from line a at 0 to line b at L, q towards +x).
// Sign convention of the solver: ownSeepageM2PerDay = q(0) (positive when line a loses),
// partnerSeepageM2PerDay = -q(L) (positive when line b loses).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { TransectSolver } from '../../src/hydraulics/transect-solver.js';
import type { StripProblem } from '../../src/hydraulics/solve-strip.js';
import { expectNear, oneZone, solveOk } from './strip-fixtures.js';

// Closed forms for one zone; h0, hL saturated thicknesses, N recharge (m/d), K (m/d).
// Source of all four: C.W. Fetter, Applied Hydrogeology, chapter on groundwater flow, the Dupuit
// equations with recharge W [from memory]; W.W. Woessner and E.P. Poeter (2020), Hydrogeologic
// Properties of Earth Materials and Principles of Groundwater Flow, The Groundwater Project,
// section 7.3 [published].
// u(x) = h^2 = h0^2 - (h0^2 - hL^2) x/L + (N/K) x (L - x)
function uClosed(h0: number, hL: number, lengthM: number, k: number, n: number, x: number): number {
  return h0 * h0 - ((h0 * h0 - hL * hL) * x) / lengthM + (n / k) * x * (lengthM - x);
}
// q(x) = K (h0^2 - hL^2)/(2L) - N (L/2 - x)
function qClosed(h0: number, hL: number, lengthM: number, k: number, n: number, x: number): number {
  return (k * (h0 * h0 - hL * hL)) / (2 * lengthM) - n * (lengthM / 2 - x);
}
// x_d = L/2 - K (h0^2 - hL^2)/(2 N L), inside the strip only if N L^2/K > |h0^2 - hL^2|
function divideClosed(h0: number, hL: number, lengthM: number, k: number, n: number): number {
  return lengthM / 2 - (k * (h0 * h0 - hL * hL)) / (2 * n * lengthM);
}
// u_max = (h0^2 + hL^2)/2 + N L^2/(4K) + K (h0^2 - hL^2)^2/(4 N L^2)
function uMaxClosed(h0: number, hL: number, lengthM: number, k: number, n: number): number {
  const du = h0 * h0 - hL * hL;
  return (h0 * h0 + hL * hL) / 2 + (n * lengthM * lengthM) / (4 * k) + (k * du * du) / (4 * n * lengthM * lengthM);
}

interface Case {
  name: string;
  baseM: number;
  ownStageM: number;
  partnerStageM: number;
  lengthM: number;
  kMPerDay: number;
  rechargeMPerDay: number;
}

function problemOf(c: Case): StripProblem {
  return oneZone(c.ownStageM, c.partnerStageM, c.baseM, {
    lengthM: c.lengthM,
    kMPerDay: c.kMPerDay,
    rechargeMPerDay: c.rechargeMPerDay,
    groundM: c.ownStageM + 50,
  });
}

// Handpicked to cover: no recharge, a divide inside, a divide outside, net evaporation, thin and
// thick aquifers, line b higher than line a, equal stages.
const cases: Case[] = [
  { name: 'REFERENCES canal example', baseM: 90, ownStageM: 105, partnerStageM: 103, lengthM: 400, kMPerDay: 10, rechargeMPerDay: 0 },
  { name: 'two rivers with recharge', baseM: 0, ownStageM: 20, partnerStageM: 18, lengthM: 1000, kMPerDay: 0.5, rechargeMPerDay: 0.05 / 365 },
  { name: 'equal stages, mound', baseM: 50, ownStageM: 62, partnerStageM: 62, lengthM: 800, kMPerDay: 5, rechargeMPerDay: 1e-3 },
  { name: 'divide outside the strip', baseM: 0, ownStageM: 30, partnerStageM: 10, lengthM: 500, kMPerDay: 20, rechargeMPerDay: 2e-4 },
  { name: 'net evaporation', baseM: 0, ownStageM: 15, partnerStageM: 14, lengthM: 600, kMPerDay: 8, rechargeMPerDay: -1e-4 },
  { name: 'thin, permeable', baseM: 10, ownStageM: 14, partnerStageM: 12.5, lengthM: 250, kMPerDay: 80, rechargeMPerDay: 5e-4 },
  { name: 'line b higher', baseM: -20, ownStageM: -12, partnerStageM: -8, lengthM: 1500, kMPerDay: 2, rechargeMPerDay: 4e-4 },
  { name: 'wide, tight', baseM: 200, ownStageM: 235, partnerStageM: 215, lengthM: 3000, kMPerDay: 0.3, rechargeMPerDay: 3e-5 },
];

describe('one zone without recharge (Fetter [from memory]; Woessner and Poeter 2020, 7.3 [published])', () => {
  it('canals 400 m apart at 105 m and 103 m, base 90 m, K 10 m/d: a loses 0.700 m^2/d, b gains it', () => {
    const s = solveOk(new TransectSolver(1), problemOf(cases[0]));
    // q = K (h0^2 - hL^2)/(2L) = 10 (15^2 - 13^2)/800 = 10 * 56/800 = 0.7 m^2/d [derived]
    expectNear(s.ownSeepageM2PerDay, 0.7, 1e-12, 'seepage a');
    expectNear(s.partnerSeepageM2PerDay, -0.7, 1e-12, 'seepage b');
    expect(s.divideOffsetM).toBeNaN();
    expectNear(s.peakWaterTableM, 105, 1e-12, 'peak head');
    expectNear(s.peakOffsetM, 0, 0, 'peak offset');
  });

  it.each(cases.filter((c) => c.rechargeMPerDay === 0).concat([
    { name: 'b higher, no recharge', baseM: 0, ownStageM: 7, partnerStageM: 19, lengthM: 900, kMPerDay: 35, rechargeMPerDay: 0 },
    { name: 'small difference', baseM: 3, ownStageM: 33.01, partnerStageM: 33, lengthM: 2000, kMPerDay: 1.5, rechargeMPerDay: 0 },
  ]))('$name: q = K (h0^2 - hL^2)/(2L) and h(x)^2 = h0^2 - (h0^2 - hL^2) x/L', (c) => {
    const s = solveOk(new TransectSolver(1), problemOf(c));
    const h0 = c.ownStageM - c.baseM, hL = c.partnerStageM - c.baseM;
    const q = (c.kMPerDay * (h0 * h0 - hL * hL)) / (2 * c.lengthM);
    const qTol = 1e-12 * (c.kMPerDay * (h0 * h0 + hL * hL)) / (2 * c.lengthM);
    expectNear(s.ownSeepageM2PerDay, q, qTol, 'seepage a');
    expectNear(s.partnerSeepageM2PerDay, -q, qTol, 'seepage b');
    for (const f of [0, 0.1, 0.25, 0.5, 0.75, 0.9, 1]) {
      const x = f * c.lengthM;
      const h = Math.sqrt(h0 * h0 - ((h0 * h0 - hL * hL) * x) / c.lengthM);
      expectNear(s.headAt(x), c.baseM + h, 1e-12 * (h0 + hL), `head at ${x} m`);
      expectNear(s.fluxAt(x), q, qTol, `flux at ${x} m`);
    }
  });
});

describe('one zone with uniform recharge (Fetter [from memory]; Woessner and Poeter 2020, 7.3 [published])', () => {
  it.each(cases)('$name: u(x), q(x), divide and maximum height', (c) => {
    const s = solveOk(new TransectSolver(1), problemOf(c));
    const { lengthM: len, kMPerDay: k, rechargeMPerDay: n } = c;
    const h0 = c.ownStageM - c.baseM, hL = c.partnerStageM - c.baseM;
    const qScale = Math.max((k * (h0 * h0 + hL * hL)) / (2 * len), Math.abs(n) * len);
    expectNear(s.ownSeepageM2PerDay, qClosed(h0, hL, len, k, n, 0), 1e-12 * qScale, 'seepage a = q(0)');
    expectNear(s.partnerSeepageM2PerDay, -qClosed(h0, hL, len, k, n, len), 1e-12 * qScale, 'seepage b = -q(L)');
    // q(L) - q(0) = N L: the recharge leaves through the two lines
    expectNear(s.ownSeepageM2PerDay + s.partnerSeepageM2PerDay, -n * len, 1e-12 * qScale, 'mass balance');
    for (const f of [0, 1 / 7, 1 / 3, 0.5, 0.8, 1]) {
      const x = f * len;
      const u = uClosed(h0, hL, len, k, n, x);
      expectNear(s.uAt(x), u, 1e-12 * Math.max(h0 * h0, hL * hL, u), `u at ${x} m`);
      expectNear(s.headAt(x), c.baseM + Math.sqrt(u), 1e-12 * (Math.abs(c.baseM) + Math.sqrt(u)), `head at ${x} m`);
      expectNear(s.fluxAt(x), qClosed(h0, hL, len, k, n, x), 1e-12 * qScale, `flux at ${x} m`);
    }

    const divideInside = n > 0 && (n * len * len) / k > Math.abs(h0 * h0 - hL * hL);
    if (divideInside) {
      const xd = divideClosed(h0, hL, len, k, n);
      expectNear(s.divideOffsetM, xd, 1e-9 * len, 'divide');
      expectNear(s.peakOffsetM, xd, 1e-9 * len, 'peak offset');
      const uMax = uMaxClosed(h0, hL, len, k, n);
      expectNear(s.peakWaterTableM, c.baseM + Math.sqrt(uMax), 1e-10 * Math.sqrt(uMax), 'peak head');
      expectNear(uClosed(h0, hL, len, k, n, xd), uMax, 1e-10 * uMax, 'u(x_d) = u_max');
    } else {
      expect(s.divideOffsetM).toBeNaN();
      expectNear(s.peakWaterTableM, Math.max(c.ownStageM, c.partnerStageM), 0, 'peak head at the higher line');
      expectNear(s.peakOffsetM, c.ownStageM >= c.partnerStageM ? 0 : len, 0, 'peak offset at the higher line');
    }
  });

  it('the handpicked cases include divides inside and outside the strip', () => {
    const inside = cases.filter((c) => {
      const h0 = c.ownStageM - c.baseM, hL = c.partnerStageM - c.baseM;
      return c.rechargeMPerDay > 0 && (c.rechargeMPerDay * c.lengthM ** 2) / c.kMPerDay > Math.abs(h0 * h0 - hL * hL);
    });
    expect(inside.length).toBeGreaterThanOrEqual(3);
    expect(inside.length).toBeLessThan(cases.length - 2);
  });

  it('random single zones agree with the closed forms', () => {
    const solver = new TransectSolver(1);
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 50, noNaN: true }),
        fc.double({ min: 1, max: 50, noNaN: true }),
        fc.double({ min: 50, max: 5000, noNaN: true }),
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.double({ min: 1e-6, max: 2e-3, noNaN: true }),
        (h0, hL, len, k, n) => {
          solveOk(solver, oneZone(100 + h0, 100 + hL, 100, { lengthM: len, kMPerDay: k, rechargeMPerDay: n, groundM: 300 }));
          const qScale = Math.max((k * (h0 * h0 + hL * hL)) / (2 * len), n * len);
          expectNear(solver.ownSeepageM2PerDay, qClosed(h0, hL, len, k, n, 0), 1e-11 * qScale, 'seepage a');
          expectNear(solver.partnerSeepageM2PerDay, -qClosed(h0, hL, len, k, n, len), 1e-11 * qScale, 'seepage b');
          for (const f of [0.2, 0.5, 0.7]) {
            expectNear(solver.fluxAt(f * len), qClosed(h0, hL, len, k, n, f * len), 1e-11 * qScale, 'flux');
          }
          const xd = divideClosed(h0, hL, len, k, n);
          if (xd > 1e-6 * len && xd < len * (1 - 1e-6)) {
            expectNear(solver.divideOffsetM, xd, 1e-8 * len, 'divide');
            const uMax = uMaxClosed(h0, hL, len, k, n);
            expectNear(solver.peakWaterTableM, 100 + Math.sqrt(uMax), 1e-9 * Math.sqrt(uMax), 'peak head');
          } else if (xd < -1e-6 * len || xd > len * (1 + 1e-6)) {
            expect(solver.divideOffsetM).toBeNaN();
          }
        },
      ),
      { seed: 20240601, numRuns: 300 },
    );
  });
});

describe('zones in series without recharge', () => {
  // [derived] With N = 0 the flow q is the same in every zone, and inside zone i Darcy-Dupuit
  // gives q = K_i (u_i-1 - u_i)/(2 l_i), i.e. u_i-1 - u_i = q (2 l_i/K_i): each zone is a
  // resistance 2 l_i/K_i to the flow of u. Resistances in series add, so summing over the zones
  //   h0^2 - hL^2 = 2 q sum(l_i/K_i)  =>  q = (h0^2 - hL^2)/(2 sum(l_i/K_i)),
  // and u at the edge after zone i is h0^2 - 2 q sum_{k<=i}(l_k/K_k).
  function seriesFlux(h0: number, hL: number, zones: { lengthM: number; kMPerDay: number }[]): number {
    const resistance = zones.reduce((sum, z) => sum + z.lengthM / z.kMPerDay, 0);
    return (h0 * h0 - hL * hL) / (2 * resistance);
  }

  it('REFERENCES example: h0 12, hL 10, 400 m at K 5 then 600 m at K 20 gives 0.2 m^2/d [derived]', () => {
    const zones = [
      { lengthM: 400, kMPerDay: 5, rechargeMPerDay: 0, groundM: 30 },
      { lengthM: 600, kMPerDay: 20, rechargeMPerDay: 0, groundM: 30 },
    ];
    const s = solveOk(new TransectSolver(2), { ownStageM: 12, partnerStageM: 10, baseM: 0, zones });
    // (144 - 100)/(2 (80 + 30)) = 44/220 = 0.2
    expectNear(s.ownSeepageM2PerDay, 0.2, 1e-14, 'seepage a');
    expectNear(s.partnerSeepageM2PerDay, -0.2, 1e-14, 'seepage b');
    // u at the zone edge: 144 - 2 (0.2)(80) = 112
    expectNear(s.headAt(400), Math.sqrt(112), 1e-12, 'head at the zone edge');
    expectNear(s.fluxAt(200), 0.2, 1e-14, 'flux in zone 1');
    expectNear(s.fluxAt(700), 0.2, 1e-14, 'flux in zone 2');
  });

  it('random zones in series', () => {
    const solver = new TransectSolver(8);
    const zone = fc.record({
      lengthM: fc.double({ min: 100, max: 3000, noNaN: true }),
      kMPerDay: fc.double({ min: 0.1, max: 100, noNaN: true }),
    });
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 40, noNaN: true }),
        fc.double({ min: 5, max: 40, noNaN: true }),
        fc.array(zone, { minLength: 1, maxLength: 8 }),
        (h0, hL, zs) => {
          const zones = zs.map((z) => ({ ...z, rechargeMPerDay: 0, groundM: 100 }));
          solveOk(solver, { ownStageM: 10 + h0, partnerStageM: 10 + hL, baseM: 10, zones });
          const q = seriesFlux(h0, hL, zs);
          // the flux a line would carry with the other line at the base, so a near-zero q is
          // still checked to a meaningful absolute tolerance
          const qScale = seriesFlux(Math.max(h0, hL), 0, zs);
          expectNear(solver.ownSeepageM2PerDay, q, 1e-9 * qScale, 'seepage a');
          expectNear(solver.partnerSeepageM2PerDay, -q, 1e-9 * qScale, 'seepage b');
          let u = h0 * h0, x = 0;
          for (const z of zs) {
            x += z.lengthM;
            u -= (2 * q * z.lengthM) / z.kMPerDay;
            expectNear(solver.headAt(x), 10 + Math.sqrt(Math.max(u, 0)), 1e-9 * Math.max(h0, hL), `head at ${x} m`);
          }
        },
      ),
      { seed: 4242, numRuns: 300 },
    );
  });
});
