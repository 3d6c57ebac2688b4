// Properties the strip solution must have whatever the inputs: conservation, symmetry, the sense
// of its response to K and to stage, consistency of its summaries with the profile, and refusal
// of inputs that have no Dupuit-Forchheimer solution.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SOLVE_OK, SOLVE_STATUS_NAMES, TransectSolver } from '../../src/hydraulics/transect-solver.js';
import { solveStrip, type StripProblem, type ZoneSpec } from '../../src/hydraulics/solve-strip.js';
import { expectNear, solveWith } from './strip-fixtures.js';

// Shrinking a failure of the dense-sampling properties can take long; stop it after a while and
// report the counterexample found so far.
const RUNS = { numRuns: 300, interruptAfterTimeLimit: 30_000 };

interface Drawn {
  baseM: number;
  h0: number;
  hL: number;
  zones: ZoneSpec[];
}

function arbitraryStrip(recharge: { min: number; max: number }, maxZones = 6): fc.Arbitrary<Drawn> {
  const zone = fc.record({
    lengthM: fc.double({ min: 50, max: 3000, noNaN: true }),
    kMPerDay: fc.double({ min: 0.1, max: 100, noNaN: true }),
    rechargeMPerDay: fc.double({ ...recharge, noNaN: true }),
    // ground above the base, shifted by the base below
    groundM: fc.double({ min: 3, max: 50, noNaN: true }),
  });
  return fc
    .record({
      baseM: fc.double({ min: -50, max: 500, noNaN: true }),
      h0: fc.double({ min: 5, max: 40, noNaN: true }),
      hL: fc.double({ min: 5, max: 40, noNaN: true }),
      zones: fc.array(zone, { minLength: 1, maxLength: maxZones }),
    })
    .map((d) => ({ ...d, zones: d.zones.map((z) => ({ ...z, groundM: d.baseM + z.groundM })) }));
}

function problemOf(d: Drawn): StripProblem {
  return { ownStageM: d.baseM + d.h0, partnerStageM: d.baseM + d.hL, baseM: d.baseM, zones: d.zones };
}

const totalRecharge = (zones: ZoneSpec[]) => zones.reduce((sum, z) => sum + z.rechargeMPerDay * z.lengthM, 0);
const resistance = (zones: ZoneSpec[]) => zones.reduce((sum, z) => sum + z.lengthM / z.kMPerDay, 0);

/**
 * A flow scale for tolerances: the recharge that must leave through the lines, or the flow the
 * higher line would send through the zones in series if the other were at the base.
 */
function flowScale(d: Drawn): number {
  const rechargeAbs = d.zones.reduce((sum, z) => sum + Math.abs(z.rechargeMPerDay) * z.lengthM, 0);
  return Math.max(rechargeAbs, Math.max(d.h0, d.hL) ** 2 / (2 * resistance(d.zones)));
}

const a = new TransectSolver(8);
const b = new TransectSolver(8);

describe('mass balance', () => {
  it('seepage a + seepage b + sum(N l) = 0: all recharge leaves through the two lines', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: -2e-4, max: 2e-3 }), (d) => {
        fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
        const scale = flowScale(d);
        expectNear(a.ownSeepageM2PerDay + a.partnerSeepageM2PerDay + totalRecharge(d.zones), 0, 1e-9 * scale, 'balance');
        expectNear(a.massResidualM2PerDay, 0, 1e-9 * scale, 'reported residual');
        // flux at the ends of the profile matches the seepage the solver reports
        expectNear(a.fluxAt(0), a.ownSeepageM2PerDay, 1e-9 * scale, 'q(0)');
        expectNear(a.fluxAt(a.transectLengthM), -a.partnerSeepageM2PerDay, 1e-9 * scale, 'q(L)');
      }),
      RUNS,
    );
  });
});

describe('symmetry: swapping the lines and reversing the zones mirrors the solution', () => {
  function mirrored(d: Drawn): Drawn {
    return { baseM: d.baseM, h0: d.hL, hL: d.h0, zones: [...d.zones].reverse() };
  }

  it('seepages swap, peak head is the same and the mirrored peak offset is a peak of the original', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: -2e-4, max: 2e-3 }), (d) => {
        fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
        expect(solveWith(b, problemOf(mirrored(d)))).toBe(SOLVE_OK);
        const scale = flowScale(d);
        expectNear(b.ownSeepageM2PerDay, a.partnerSeepageM2PerDay, 1e-9 * scale, 'mirrored seepage a');
        expectNear(b.partnerSeepageM2PerDay, a.ownSeepageM2PerDay, 1e-9 * scale, 'mirrored seepage b');
        const headScale = Math.abs(d.baseM) + (a.peakWaterTableM - d.baseM);
        expectNear(b.peakWaterTableM, a.peakWaterTableM, 1e-11 * headScale, 'peak head');
        expectNear(b.minDepthM, a.minDepthM, 1e-9 * 50, 'smallest depth');
        // two equal peaks may be reported from either end, so check the mirrored place is a peak
        expectNear(a.headAt(a.transectLengthM - b.peakOffsetM), a.peakWaterTableM, 1e-9 * headScale, 'head at the mirrored peak');
        for (const f of [0.1, 0.37, 0.5, 0.81]) {
          expectNear(b.headAt(b.transectLengthM - f * a.transectLengthM), a.headAt(f * a.transectLengthM), 1e-9 * headScale, 'profile');
        }
      }),
      RUNS,
    );
  });

  it('with recharge everywhere and unequal stages the peak is unique and its offset mirrors exactly', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: 1e-5, max: 2e-3 }), (d) => {
        fc.pre(Math.abs(d.h0 - d.hL) >= 0.01);
        expect(solveWith(a, problemOf(d))).toBe(SOLVE_OK);
        expect(solveWith(b, problemOf(mirrored(d)))).toBe(SOLVE_OK);
        expectNear(b.peakOffsetM, a.transectLengthM - a.peakOffsetM, 1e-6 * a.transectLengthM, 'mirrored peak offset');
        if (Number.isNaN(a.divideOffsetM)) expect(b.divideOffsetM).toBeNaN();
        else expectNear(b.divideOffsetM, a.transectLengthM - a.divideOffsetM, 1e-6 * a.transectLengthM, 'mirrored divide');
      }),
      RUNS,
    );
  });
});

describe('response to conductivity and stage', () => {
  const scaled = (d: Drawn, factor: number): Drawn => ({
    ...d,
    zones: d.zones.map((z) => ({ ...z, kMPerDay: z.kMPerDay * factor })),
  });
  const factor = fc.double({ min: 1.01, max: 10, noNaN: true });

  it('without recharge, scaling every K by s scales the seepage by s', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: 0, max: 0 }), factor, (d, s) => {
        fc.pre(Math.abs(d.h0 - d.hL) >= 0.01);
        expect(solveWith(a, problemOf(d))).toBe(SOLVE_OK);
        expect(solveWith(b, problemOf(scaled(d, s)))).toBe(SOLVE_OK);
        expect(Math.abs(b.ownSeepageM2PerDay)).toBeGreaterThan(Math.abs(a.ownSeepageM2PerDay));
        expect(Math.abs(b.partnerSeepageM2PerDay)).toBeGreaterThan(Math.abs(a.partnerSeepageM2PerDay));
        // [derived] q = (h0^2 - hL^2)/(2 sum(l/K)) is proportional to K
        // (the tolerance is on the flow scale: with a short, permeable first zone the small
        // difference of u across it carries only about 1e-9 of the seepage's digits)
        expectNear(b.ownSeepageM2PerDay, s * a.ownSeepageM2PerDay, 1e-9 * s * flowScale(d), 'scaled seepage');
      }),
      RUNS,
    );
  });

  it('with recharge, the higher line loses more when every K is scaled up', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: -2e-4, max: 2e-3 }), factor, (d, s) => {
        fc.pre(Math.abs(d.h0 - d.hL) >= 0.01);
        fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
        // scaling K up only shrinks the effect of recharge, so the scaled strip cannot dry out
        expect(solveWith(b, problemOf(scaled(d, s)))).toBe(SOLVE_OK);
        const higherA = d.h0 > d.hL;
        const before = higherA ? a.ownSeepageM2PerDay : a.partnerSeepageM2PerDay;
        const after = higherA ? b.ownSeepageM2PerDay : b.partnerSeepageM2PerDay;
        expect(after).toBeGreaterThan(before);
        // [derived] u is linear in the boundary values and in N/K: with K -> sK the part of q(0)
        // driven by the stages scales by s and the part driven by recharge does not change, so
        // the increase is (s - 1)(h_high^2 - h_low^2)/(2 sum(l/K)).
        const rise = ((s - 1) * Math.abs(d.h0 * d.h0 - d.hL * d.hL)) / (2 * resistance(d.zones));
        expectNear(after - before, rise, 1e-8 * flowScale(d), 'increase');
      }),
      RUNS,
    );
  });

  it('raising stage a raises seepage a, and line b gains what line a loses more', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: -2e-4, max: 2e-3 }), fc.double({ min: 0.01, max: 5, noNaN: true }), (d, rise) => {
        fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
        expect(solveWith(b, problemOf({ ...d, h0: d.h0 + rise }))).toBe(SOLVE_OK);
        expect(b.ownSeepageM2PerDay).toBeGreaterThan(a.ownSeepageM2PerDay);
        expect(b.partnerSeepageM2PerDay).toBeLessThan(a.partnerSeepageM2PerDay);
        const scale = flowScale(d);
        expectNear(b.partnerSeepageM2PerDay - a.partnerSeepageM2PerDay, -(b.ownSeepageM2PerDay - a.ownSeepageM2PerDay), 1e-9 * scale, 'b change');
        // [derived] by linearity in u, the change is the change in h0^2 over the series resistance
        const du = (d.h0 + rise) ** 2 - d.h0 ** 2;
        expectNear(b.ownSeepageM2PerDay - a.ownSeepageM2PerDay, du / (2 * resistance(d.zones)), 1e-9 * scale, 'a change');
        expect(b.peakWaterTableM).toBeGreaterThanOrEqual(a.peakWaterTableM);
      }),
      RUNS,
    );
  });
});

describe('shallowLengthM', () => {
  it('a mound between equal canals [derived]: 400 m of the strip within 2 m of the ground', () => {
    // h0 = hL = 10, L = 1000, N/K = 1e-3/10 = 1e-4: u = 100 + 1e-4 x (1000 - x), peak u 125.
    // Ground 13 m above the base, depth 2 m: shallow where u > 11^2 = 121, x (1000 - x) > 210000,
    // x in (300, 700).
    const s = solveStrip({
      ownStageM: 100,
      partnerStageM: 100,
      baseM: 90,
      zones: [{ lengthM: 1000, kMPerDay: 10, rechargeMPerDay: 1e-3, groundM: 103 }],
    });
    if (!s.ok) throw new Error(s.detail);
    expectNear(s.shallowLengthM(2), 400, 1e-9, 'shallow length');
    expectNear(s.shallowLengthM(0), 0, 0, 'water table above ground');
    expectNear(s.shallowLengthM(13), 1000, 0, 'the base is 13 m down');
    expectNear(s.headAt(300), 101, 1e-12, 'head at the crossing');
    // banks of 350 m beside each canal leave (350, 650), all of it shallow; banks of 100 m leave
    // the whole 400 m
    const t = new TransectSolver(1);
    solveWith(t, { ownStageM: 100, partnerStageM: 100, baseM: 90, zones: [{ lengthM: 1000, kMPerDay: 10, rechargeMPerDay: 1e-3, groundM: 103 }] });
    expectNear(t.shallowLengthM(2, 350), 300, 1e-9, 'shallow length beyond 350 m banks');
    expectNear(t.shallowLengthM(2, 100), 400, 1e-9, 'shallow length beyond 100 m banks');
    expectNear(t.shallowLengthM(13, 100), 800, 1e-9, 'all but the banks');
    // the smallest depth is at the crest, 13 - sqrt(125) m [derived], whatever the banks
    expectNear(t.minDepthM, 13 - Math.sqrt(125), 1e-12, 'smallest depth');
    t.scanDepth(450);
    expectNear(t.minDepthM, 13 - Math.sqrt(125), 1e-12, 'smallest depth beyond 450 m banks');
    expectNear(t.minDepthOffsetM, 500, 1e-9, 'at the crest');
  });

  it('agrees with a dense sampling of depth along the transect, with and without bank margins', () => {
    let partial = 0;
    fc.assert(
      fc.property(
        arbitraryStrip({ min: -2e-4, max: 2e-3 }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        fc.oneof(fc.constant(0), fc.double({ min: 0, max: 0.6, noNaN: true })),
        (d, depth, marginFraction) => {
          fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
          const marginM = marginFraction * a.transectLengthM;
          // the margin is capped at half the width: then nothing is left
          const from = Math.min(marginM, a.transectLengthM / 2), to = a.transectLengthM - from;
          const samples = 20_000, dx = (to - from) / samples;
          const zoneEnd = zoneEnds(d.zones);
          // A water table within rounding of the depth limit may count either way, so the
          // sampling brackets the answer with limits a hair shallower and deeper.
          const hair = 1e-9 * (Math.abs(d.baseM) + 100);
          let shallowLeast = 0, shallowMost = 0, zone = 0;
          for (let i = 0; i < samples; i++) {
            const x = from + (i + 0.5) * dx;
            while (zone < d.zones.length - 1 && x > zoneEnd[zone]) zone++;
            const depthThere = d.zones[zone].groundM - a.headAt(x);
            if (depthThere < depth - hair) shallowLeast += dx;
            if (depthThere < depth + hair) shallowMost += dx;
          }
          // each zone has at most two crossings and two edges, each off by at most one sample
          const got = marginM === 0 ? a.shallowLengthM(depth) : a.shallowLengthM(depth, marginM);
          const tol = (4 * d.zones.length + 2) * dx + 1e-9 * a.transectLengthM;
          expect(got, `shallow length ${got}, sampled ${shallowLeast}..${shallowMost}`).toBeGreaterThanOrEqual(shallowLeast - tol);
          expect(got, `shallow length ${got}, sampled ${shallowLeast}..${shallowMost}`).toBeLessThanOrEqual(shallowMost + tol);
          if (got > 0.01 * a.transectLengthM && got < 0.99 * (to - from)) partial++;
        },
      ),
      RUNS,
    );
    // the property is only worth something if many strips are partly shallow
    expect(partial).toBeGreaterThan(RUNS.numRuns / 10);
  });
});

function zoneEnds(zones: ZoneSpec[]): number[] {
  const ends: number[] = [];
  zones.reduce((x, z) => (ends.push(x + z.lengthM), x + z.lengthM), 0);
  return ends;
}

describe('smallest depth', () => {
  it('is the least of a dense sampling of depth, and found where it is, with and without bank margins', () => {
    fc.assert(
      fc.property(
        arbitraryStrip({ min: -2e-4, max: 2e-3 }),
        fc.oneof(fc.constant(0), fc.double({ min: 0, max: 0.45, noNaN: true })),
        (d, marginFraction) => {
          fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
          const marginM = marginFraction * a.transectLengthM;
          if (marginM > 0) a.scanDepth(marginM);
          const from = marginM, to = a.transectLengthM - marginM;
          const zoneEnd = zoneEnds(d.zones);
          // least depth at x with the ground of any zone whose closed interval holds x
          const leastDepthAt = (x: number): number => {
            let least = Infinity;
            for (let j = 0; j < d.zones.length; j++) {
              const start = j === 0 ? 0 : zoneEnd[j - 1];
              if (x >= start - 1e-9 && x <= zoneEnd[j] + 1e-9) least = Math.min(least, d.zones[j].groundM - a.headAt(x));
            }
            return least;
          };
          const samples = 5000, dx = (to - from) / samples;
          let least = Infinity, largestStep = 0, previousHead = a.headAt(from);
          for (let i = 0; i <= samples; i++) {
            const x = from + i * dx;
            least = Math.min(least, leastDepthAt(x));
            const head = a.headAt(x);
            largestStep = Math.max(largestStep, Math.abs(head - previousHead));
            previousHead = head;
          }
          const headScale = Math.abs(d.baseM) + (a.peakWaterTableM - d.baseM);
          expect(a.minDepthM).toBeLessThanOrEqual(least + 1e-9 * headScale);
          expect(a.minDepthM).toBeGreaterThanOrEqual(least - largestStep - 1e-9 * headScale);
          expect(a.minDepthOffsetM).toBeGreaterThanOrEqual(from - 1e-9 * a.transectLengthM);
          expect(a.minDepthOffsetM).toBeLessThanOrEqual(to + 1e-9 * a.transectLengthM);
          expectNear(leastDepthAt(a.minDepthOffsetM), a.minDepthM, 1e-9 * headScale, 'depth at the offset');
        },
      ),
      RUNS,
    );
  });
});

describe('invalid physics returns the reason, not a number', () => {
  const good: StripProblem = {
    ownStageM: 105,
    partnerStageM: 103,
    baseM: 90,
    zones: [
      { lengthM: 200, kMPerDay: 10, rechargeMPerDay: 0, groundM: 110 },
      { lengthM: 300, kMPerDay: 5, rechargeMPerDay: 1e-4, groundM: 110 },
    ],
  };
  const withZone = (j: number, patch: Partial<ZoneSpec>): StripProblem => ({
    ...good,
    zones: good.zones.map((z, i) => (i === j ? { ...z, ...patch } : z)),
  });

  function expectReason(problem: StripProblem, reason: string, detailPart?: string): void {
    const result = solveStrip(problem);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.reason).toBe(reason);
    if (detailPart) expect(result.detail).toContain(detailPart);
    // a failure carries no numbers a caller could mistake for an answer
    expect(Object.values(result).filter((v) => typeof v === 'number')).toEqual([]);
  }

  it('the reference problem solves', () => {
    expect(solveStrip(good).ok).toBe(true);
  });

  it.each([
    ['stage a at the base', { ...good, ownStageM: 90 }],
    ['stage b below the base', { ...good, partnerStageM: 89.99 }],
    ['both stages below the base', { ...good, ownStageM: 80, partnerStageM: 70 }],
  ])('%s: stage-at-or-below-base', (_name, problem) => {
    expectReason(problem, 'stage-at-or-below-base', 'at or below the aquifer base 90 m');
  });

  it.each([
    ['zero K in zone 2', withZone(1, { kMPerDay: 0 }), 'in zone 2 of 2'],
    ['negative K in zone 1', withZone(0, { kMPerDay: -3 }), 'in zone 1 of 2'],
  ])('%s: non-positive-conductivity', (_name, problem, where) => {
    expectReason(problem, 'non-positive-conductivity', where);
  });

  it.each([
    ['zero length', withZone(0, { lengthM: 0 })],
    ['negative length', withZone(1, { lengthM: -10 })],
  ])('%s: non-positive-length', (_name, problem) => {
    expectReason(problem, 'non-positive-length');
  });

  it.each([
    ['NaN stage a', { ...good, ownStageM: NaN }],
    ['infinite stage b', { ...good, partnerStageM: Infinity }],
    ['NaN base', { ...good, baseM: NaN }],
    ['NaN length', withZone(0, { lengthM: NaN })],
    ['NaN K', withZone(1, { kMPerDay: NaN })],
    ['infinite K', withZone(1, { kMPerDay: Infinity })],
    ['NaN recharge', withZone(0, { rechargeMPerDay: NaN })],
    ['infinite ground', withZone(1, { groundM: Infinity })],
  ])('%s: non-finite-input', (_name, problem) => {
    expectReason(problem, 'non-finite-input');
  });

  it('NaN ground (not known: a DEM gives it) solves the flow as any ground does, its depth from the zones that know theirs', () => {
    const known = solveStrip(good);
    const unknown = solveStrip(withZone(1, { groundM: NaN }));
    if (!known.ok || !unknown.ok) throw new Error('expected both to solve');
    expect(unknown.ownSeepageM2PerDay).toBe(known.ownSeepageM2PerDay);
    expect(unknown.peakWaterTableM).toBe(known.peakWaterTableM);
    // the zone without ground gives no depth; the others still do
    expect(unknown.minDepthM).toBeGreaterThanOrEqual(known.minDepthM);
    const none = solveStrip({ ...good, zones: good.zones.map((zone) => ({ ...zone, groundM: NaN })) });
    if (!none.ok) throw new Error('expected it to solve');
    expect(none.minDepthM).toBeNaN();
  });

  it('no zones: no-zones', () => {
    expectReason({ ...good, zones: [] }, 'no-zones');
  });

  it('strong net evaporation that dries the aquifer: aquifer-dries', () => {
    // u = 4 - 1e-3 x (1000 - x) would be 4 - 250 in the middle [derived]
    expectReason(
      { ownStageM: 12, partnerStageM: 12, baseM: 10, zones: [{ lengthM: 1000, kMPerDay: 1, rechargeMPerDay: -1e-3, groundM: 20 }] },
      'aquifer-dries',
      'in zone 1 of 1',
    );
  });

  it('one zone under evaporation dries exactly when the closed-form minimum of u is not positive', () => {
    // [derived] from u(x) of Woessner and Poeter (2020) 7.3 with N < 0: an interior minimum at
    // x_d = L/2 - K (h0^2 - hL^2)/(2 N L), where u = (h0^2 + hL^2)/2 + N L^2/(4K) + K (h0^2 - hL^2)^2/(4 N L^2)
    let dried = 0;
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 20, noNaN: true }),
        fc.double({ min: 0.5, max: 20, noNaN: true }),
        fc.double({ min: 50, max: 3000, noNaN: true }),
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.double({ min: -5e-3, max: -1e-7, noNaN: true }),
        (h0, hL, len, k, n) => {
          const du = h0 * h0 - hL * hL;
          const xd = len / 2 - (k * du) / (2 * n * len);
          const uMin = xd > 0 && xd < len
            ? (h0 * h0 + hL * hL) / 2 + (n * len * len) / (4 * k) + (k * du * du) / (4 * n * len * len)
            : Math.min(h0 * h0, hL * hL);
          fc.pre(Math.abs(uMin) > 1e-6 * (h0 * h0 + hL * hL));
          const status = solveWith(a, { ownStageM: h0, partnerStageM: hL, baseM: 0, zones: [{ lengthM: len, kMPerDay: k, rechargeMPerDay: n, groundM: 50 }] });
          expect(SOLVE_STATUS_NAMES[status]).toBe(uMin > 0 ? 'ok' : 'aquifer-dries');
          if (uMin <= 0) dried++;
        },
      ),
      RUNS,
    );
    expect(dried).toBeGreaterThan(RUNS.numRuns / 10);
    expect(dried).toBeLessThan(RUNS.numRuns * 0.9);
  });

  it('the typed-array solver reports the status code and leaves the seepage NaN', () => {
    const s = new TransectSolver(2);
    s.lengthM[0] = 100;
    s.kMPerDay[0] = -1;
    expect(SOLVE_STATUS_NAMES[s.solve(20, 18, 10, 1)]).toBe('non-positive-conductivity');
    expect(s.failedZone).toBe(0);
    expect(s.ownSeepageM2PerDay).toBeNaN();
    expect(s.partnerSeepageM2PerDay).toBeNaN();
    expect(SOLVE_STATUS_NAMES[s.solve(20, 18, 10, 3)]).toBe('no-zones');
  });
});

describe('mean thickness and the Dupuit ratio', () => {
  // Adaptive Simpson (each interval halved until its two halves agree with the whole), on the
  // solver's own water table: it follows sqrt(u) wherever the water table sags towards the base.
  function adaptiveSimpson(f: (x: number) => number, from: number, to: number, tolerance: number): number {
    const simpson = (x0: number, x1: number, f0: number, fm: number, f1: number) => ((x1 - x0) / 6) * (f0 + 4 * fm + f1);
    const refine = (x0: number, x1: number, f0: number, fm: number, f1: number, whole: number, tol: number, depth: number): number => {
      const xm = (x0 + x1) / 2, fl = f((x0 + xm) / 2), fr = f((xm + x1) / 2);
      const left = simpson(x0, xm, f0, fl, fm), right = simpson(xm, x1, fm, fr, f1);
      if (depth >= 40 || Math.abs(left + right - whole) <= 15 * tol) return left + right + (left + right - whole) / 15;
      return refine(x0, xm, f0, fl, fm, left, tol / 2, depth + 1) + refine(xm, x1, fm, fr, f1, right, tol / 2, depth + 1);
    };
    const f0 = f(from), fm = f((from + to) / 2), f1 = f(to);
    return refine(from, to, f0, fm, f1, simpson(from, to, f0, fm, f1), tolerance, 0);
  }

  function denseMeanThickness(s: TransectSolver, d: Drawn): number {
    let integral = 0, x0 = 0;
    for (const z of d.zones) {
      const thickness = (x: number) => Math.sqrt(Math.max(s.uAt(x), 0));
      integral += adaptiveSimpson(thickness, x0, x0 + z.lengthM, 1e-11 * z.lengthM * (d.h0 + d.hL));
      x0 += z.lengthM;
    }
    return integral / x0;
  }

  it('lies between the thinnest and thickest water table, and the ratio is L over it', () => {
    fc.assert(
      fc.property(arbitraryStrip({ min: -2e-4, max: 2e-3 }), (d) => {
        fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
        let lo = Infinity, hi = 0;
        for (let i = 0; i <= 2000; i++) {
          const h = a.headAt((i / 2000) * a.transectLengthM) - d.baseM;
          lo = Math.min(lo, h);
          hi = Math.max(hi, h);
        }
        expect(a.meanThicknessM).toBeGreaterThanOrEqual(lo * (1 - 1e-9));
        expect(a.meanThicknessM).toBeLessThanOrEqual(hi * (1 + 1e-9));
        expectNear(a.dupuitRatio, a.transectLengthM / a.meanThicknessM, 1e-12 * a.dupuitRatio, 'L / mean thickness');
      }),
      RUNS,
    );
  });

  it('agrees with dense numerical integration to 1e-6', () => {
    // the solver integrates sqrt(u) in closed form; the bound is the adaptive Simpson reference's
    fc.assert(
      fc.property(arbitraryStrip({ min: -2e-4, max: 2e-3 }), (d) => {
        fc.pre(solveWith(a, problemOf(d)) === SOLVE_OK);
        const mean = denseMeanThickness(a, d);
        expectNear(a.meanThicknessM, mean, 1e-6 * mean, 'mean thickness');
        expectNear(a.dupuitRatio, a.transectLengthM / mean, 1e-6 * a.dupuitRatio, 'Dupuit ratio');
      }),
      RUNS,
    );
  });

  // [derived] Without recharge h = sqrt(h0^2 - (h0^2 - hL^2) x/L), whose mean over [0, L] is
  // (2/3)(h0^3 - hL^3)/(h0^2 - hL^2); 40 m to 20 m gives (2/3)(64000 - 8000)/1200 = 280/9 = 31.111 m.
  const meanWithoutRecharge = (h0: number, hL: number) => ((2 / 3) * (h0 ** 3 - hL ** 3)) / (h0 ** 2 - hL ** 2);
  const withoutRecharge = (h0: number, hL: number): TransectSolver => {
    const s = new TransectSolver(1);
    solveWith(s, { ownStageM: h0, partnerStageM: hL, baseM: 0, zones: [{ lengthM: 1000, kMPerDay: 10, rechargeMPerDay: 0, groundM: 50 }] });
    return s;
  };

  it('one zone without recharge: mean h = (2/3)(h0^3 - hL^3)/(h0^2 - hL^2) [derived]', () => {
    expectNear(meanWithoutRecharge(40, 20), 280 / 9, 1e-12, 'closed form');
    expectNear(withoutRecharge(40, 20).meanThicknessM, 280 / 9, 1e-9, '40 m to 20 m');
    expectNear(withoutRecharge(40, 20).dupuitRatio, 1000 / (280 / 9), 1e-9, 'Dupuit ratio');
    expectNear(withoutRecharge(40, 5).meanThicknessM, meanWithoutRecharge(40, 5), 1e-6 * meanWithoutRecharge(40, 5), '40 m to 5 m');
    expectNear(withoutRecharge(40, 0.01).meanThicknessM, meanWithoutRecharge(40, 0.01), 1e-6 * meanWithoutRecharge(40, 0.01), '40 m to 0.01 m');
  });

  it('one zone without recharge, 40 m to 1 m: mean thickness exact to 1e-6', () => {
    expectNear(withoutRecharge(40, 1).meanThicknessM, meanWithoutRecharge(40, 1), 1e-6 * meanWithoutRecharge(40, 1), '40 m to 1 m');
  });

  it('a deep sag: mean thickness from the closed form, 5.15042 m [derived]', () => {
    // A sag to 1 m between two lines 10 m above the base: with N/K = -3.96e-4, u = 1 + 3.96e-4 s^2,
    // s = x - 500, and the mean of sqrt(1 + c s^2) over [-500, 500] is
    //   (1/L)[s sqrt(1 + c s^2) + asinh(s sqrt(c))/sqrt(c)] at s = 500 = (5000 + 150.4155)/1000 = 5.15042 m.
    // (Before the solver integrated sqrt(u) exactly it gave 5.0424 m here.)
    const s = new TransectSolver(1);
    solveWith(s, { ownStageM: 110, partnerStageM: 110, baseM: 100, zones: [{ lengthM: 1000, kMPerDay: 1, rechargeMPerDay: -3.96e-4, groundM: 115 }] });
    const c = 3.96e-4;
    const sagMean = (500 * Math.sqrt(1 + c * 500 * 500) + Math.asinh(500 * Math.sqrt(c)) / Math.sqrt(c)) / 1000;
    expectNear(sagMean, 5.15042, 5e-6, 'closed form');
    expectNear(s.headAt(500), 101, 1e-9, 'head at the sag');
    expectNear(s.meanThicknessM, sagMean, 1e-9 * sagMean, 'mean thickness');
    expectNear(s.dupuitRatio, 1000 / sagMean, 1e-9 * s.dupuitRatio, 'Dupuit ratio');
  });
});
