// An independent numerical check of the strip solver: the same boundary-value problem written in
// h and the flow Q (m^2/d, towards line b),
//   h' = -Q/(K h)   (Darcy with the Dupuit assumption),   Q' = N   (recharge adds to the flow),
// integrated with the Gragg-Bulirsch-Stoer extrapolation code ODEX of E. Hairer and G. Wanner
// (E. Hairer, S.P. Norsett and G. Wanner, Solving Ordinary Differential Equations I, 2nd ed.,
// Springer 1993, section II.9 [from memory]), through its JavaScript port `odex`. It shoots on
// Q(0) until h(L) = hL. Nothing here uses u = h^2 or the zone solution the solver is built on.
//
// Each zone is a separate integration restarted at its edge, so the right-hand side is smooth in
// every call. Below H_FLOOR_M the right-hand side uses H_FLOOR_M instead of h: the true solutions
// compared here never get that thin, but a bad shooting guess can, and the floor keeps h(L) a
// continuous, decreasing function of Q(0) so the root finder can bracket it.
import { describe, expect, it } from 'vitest';
import { Outcome, Solver } from '#odex';
import { SOLVE_OK, TransectSolver } from '../../src/hydraulics/transect-solver.js';
import type { ZoneSpec } from '../../src/hydraulics/solve-strip.js';
import { expectNear, seededRandom, solveWith } from './strip-fixtures.js';

const ODE_TOLERANCE = 1e-12;
const H_FLOOR_M = 1e-3;
/** Cases whose ODE water table gets thinner than this are treated as drying out. */
const THINNEST_ACCEPTED_M = 0.05;

interface OdeCase {
  baseM: number;
  h0: number;
  hL: number;
  zones: ZoneSpec[];
}

interface OdeProfile {
  /** Q at x = 0 and at x = L. */
  flowStart: number;
  flowEnd: number;
  /** h at every zone edge, from line a to line b. */
  hEdge: number[];
  /** Highest h: at an edge or where Q turns from negative to positive inside a zone. */
  hPeak: number;
  hThinnest: number;
  shootingIterations: number;
}

function newIntegrator(dense: boolean): Solver {
  const ode = new Solver(2);
  ode.relativeTolerance = ODE_TOLERANCE;
  ode.absoluteTolerance = ODE_TOLERANCE;
  ode.maxSteps = 100_000;
  ode.denseOutput = dense;
  return ode;
}

const plain = newIntegrator(false);
const dense = newIntegrator(true);

function derivative(zone: ZoneSpec) {
  const k = zone.kMPerDay, n = zone.rechargeMPerDay;
  return (_t: number, y: number[]): number[] => [-y[1] / (k * Math.max(y[0], H_FLOOR_M)), n];
}

/** [h, Q] at distance tEnd into the zone, from [h, Q] at its edge. */
function integrate(zone: ZoneSpec, h: number, flow: number, tEnd: number): number[] {
  const result = plain.solve(derivative(zone), 0, [h, flow], tEnd);
  if (result.outcome !== Outcome.Converged) throw new Error(`ODEX stopped with outcome ${result.outcome}.`);
  return result.y;
}

function hAtEnd(c: OdeCase, flowStart: number): number {
  let y = [c.h0, flowStart];
  for (const zone of c.zones) y = integrate(zone, y[0], y[1], zone.lengthM);
  return y[0];
}

/** Q(0) with h(L) = hL: bracket, then the Illinois variant of regula falsi. */
function shoot(c: OdeCase): { flowStart: number; iterations: number } {
  const miss = (flow: number) => hAtEnd(c, flow) - c.hL;
  const resistance = c.zones.reduce((sum, z) => sum + z.lengthM / z.kMPerDay, 0);
  const recharge = c.zones.reduce((sum, z) => sum + Math.abs(z.rechargeMPerDay) * z.lengthM, 0);
  const step = (c.h0 * c.h0 + c.hL * c.hL) / (2 * resistance) + recharge;
  let lo = -step, hi = step;
  let fLo = miss(lo), fHi = miss(hi);
  let iterations = 2;
  while (fLo <= 0) { hi = lo; fHi = fLo; lo -= 2 * step * iterations; fLo = miss(lo); iterations++; }
  while (fHi >= 0) { lo = hi; fLo = fHi; hi += 2 * step * iterations; fHi = miss(hi); iterations++; }
  let side = 0;
  for (let i = 0; i < 200; i++) {
    const flow = (lo * fHi - hi * fLo) / (fHi - fLo);
    const f = miss(flow);
    iterations++;
    if (Math.abs(f) <= ODE_TOLERANCE * c.hL || hi - lo <= 1e-15 * Math.max(Math.abs(lo), Math.abs(hi))) {
      return { flowStart: flow, iterations };
    }
    if (f < 0) {
      hi = flow; fHi = f;
      if (side === -1) fLo /= 2;
      side = -1;
    } else {
      lo = flow; fLo = f;
      if (side === 1) fHi /= 2;
      side = 1;
    }
  }
  throw new Error(`Shooting did not converge for ${JSON.stringify(c)}.`);
}

function odeProfile(c: OdeCase): OdeProfile {
  const { flowStart, iterations } = shoot(c);
  const hEdge = [c.h0];
  let hPeak = c.h0, hThinnest = c.h0;
  let y = [c.h0, flowStart];
  for (const zone of c.zones) {
    const zoneStart = y;
    // distances into the zone where Q turns from negative to positive (h stops rising)
    const turns: number[] = [];
    let previousFlow = zoneStart[1];
    const result = dense.solve(derivative(zone), 0, zoneStart, zone.lengthM, (step, tOld, t, yStep, interpolate) => {
      hThinnest = Math.min(hThinnest, yStep[0]);
      if (step > 1 && previousFlow < 0 && yStep[1] >= 0 && interpolate) {
        // bisect the integrator's dense output of Q over this step
        let a = tOld, b = t;
        for (let i = 0; i < 200 && b - a > 1e-13 * zone.lengthM; i++) {
          const mid = (a + b) / 2;
          if (interpolate(1, mid) < 0) a = mid;
          else b = mid;
        }
        turns.push((a + b) / 2);
      }
      previousFlow = yStep[1];
    });
    if (result.outcome !== Outcome.Converged) throw new Error(`ODEX stopped with outcome ${result.outcome}.`);
    // h at each turn from a second integration from the zone edge
    for (const t of turns) hPeak = Math.max(hPeak, integrate(zone, zoneStart[0], zoneStart[1], t)[0]);
    y = result.y;
    hEdge.push(y[0]);
    hPeak = Math.max(hPeak, y[0]);
  }
  return { flowStart, flowEnd: y[1], hEdge, hPeak, hThinnest, shootingIterations: iterations };
}

interface CaseRanges {
  rechargeMPerDay: [number, number];
  thicknessM: [number, number];
  /** Sets the recharge of a drawn case instead of drawing it. */
  sag?: (c: OdeCase) => void;
}

// Widths 100..3000 m per zone, K log-uniform over 0.1..100 m/d.
function randomCase(random: () => number, ranges: CaseRanges): OdeCase {
  const between = ([lo, hi]: [number, number]) => lo + (hi - lo) * random();
  const zoneCount = 1 + Math.floor(random() * 5);
  const zones: ZoneSpec[] = [];
  for (let j = 0; j < zoneCount; j++) {
    zones.push({
      lengthM: between([100, 3000]),
      kMPerDay: 0.1 * 1000 ** random(),
      rechargeMPerDay: between(ranges.rechargeMPerDay),
      groundM: 1000,
    });
  }
  const c = { baseM: between([-50, 250]), h0: between(ranges.thicknessM), hL: between(ranges.thicknessM), zones };
  ranges.sag?.(c);
  return c;
}

const solver = new TransectSolver(5);

/** Seeded cases that the solver accepts and the ODE keeps thicker than THINNEST_ACCEPTED_M. */
function acceptedCases(seed: number, count: number, ranges: CaseRanges) {
  const random = seededRandom(seed);
  const accepted: { c: OdeCase; ode: OdeProfile }[] = [];
  let rejected = 0;
  for (let attempt = 0; attempt < 20 * count && accepted.length < count; attempt++) {
    const c = randomCase(random, ranges);
    const status = solveWith(solver, { ownStageM: c.baseM + c.h0, partnerStageM: c.baseM + c.hL, baseM: c.baseM, zones: c.zones });
    if (status !== SOLVE_OK) { rejected++; continue; }
    const ode = odeProfile(c);
    if (ode.hThinnest < THINNEST_ACCEPTED_M) { rejected++; continue; }
    accepted.push({ c, ode });
  }
  return { accepted, rejected };
}

const CASE_COUNT = 200;
// the brief's ranges: recharge -2e-4..2e-3 m/d, thickness at the lines 5..40 m
const { accepted: mainCases, rejected } = acceptedCases(19_930_101, CASE_COUNT, {
  rechargeMPerDay: [-2e-4, 2e-3],
  thicknessM: [5, 40],
});
// Thin aquifers under net evaporation, where the water table sags towards the base. For one zone
// with h0 = hL = h, N = -s 4 K h^2/L^2 leaves h sqrt(1 - s) at the middle; the same rule with the
// transect's series conductivity and hL within 10 % of h0 aims the sag at s in 0.5..1.2 (past 1 it
// dries).
const THIN_COUNT = 40;
const thinRandom = seededRandom(31_415);
const { accepted: thinCases, rejected: thinRejected } = acceptedCases(7_041_989, THIN_COUNT, {
  rechargeMPerDay: [0, 0],
  thicknessM: [1, 8],
  sag: (c) => {
    const transectLengthM = c.zones.reduce((sum, z) => sum + z.lengthM, 0);
    const seriesK = transectLengthM / c.zones.reduce((sum, z) => sum + z.lengthM / z.kMPerDay, 0);
    c.hL = c.h0 * (0.9 + 0.2 * thinRandom());
    const aim = (0.5 + 0.7 * thinRandom()) * 4 * seriesK * Math.min(c.h0, c.hL) ** 2 / transectLengthM ** 2;
    for (const z of c.zones) z.rechargeMPerDay = -aim * (0.5 + thinRandom());
  },
});
const accepted = mainCases.concat(thinCases);

describe('strip solver against a shooting solution with ODEX (Hairer and Wanner)', () => {
  it(`finds ${CASE_COUNT} + ${THIN_COUNT} random cases that do not dry out, of every zone count`, () => {
    expect(mainCases.length).toBe(CASE_COUNT);
    expect(thinCases.length).toBe(THIN_COUNT);
    for (let zoneCount = 1; zoneCount <= 5; zoneCount++) {
      expect(mainCases.filter(({ c }) => c.zones.length === zoneCount).length).toBeGreaterThan(10);
    }
    // recharge and evaporation both appear, and some strips have a mound inside
    expect(mainCases.some(({ c }) => c.zones.some((z) => z.rechargeMPerDay < 0))).toBe(true);
    expect(mainCases.filter(({ ode }) => ode.hPeak > Math.max(...ode.hEdge) * (1 + 1e-9)).length).toBeGreaterThan(20);
    // the thin cases sag well below both lines, and some candidates dried out and were left out
    expect(thinCases.filter(({ c, ode }) => ode.hThinnest < 0.7 * Math.min(c.h0, c.hL)).length).toBeGreaterThan(10);
    expect(rejected + thinRejected).toBeGreaterThan(0);
  });

  it('the shooting solution meets the far line', () => {
    for (const { c, ode } of accepted) {
      expectNear(ode.hEdge[ode.hEdge.length - 1], c.hL, 1e-9 * c.hL, 'h(L)');
    }
  });

  it.each(accepted.map(({ c, ode }, i) => [`case ${i} (${c.zones.length} zones)`, c, ode] as const))(
    '%s: seepage at both lines, heads at the edges and the peak agree to 1e-6',
    (_name, c, ode) => {
      const status = solveWith(solver, { ownStageM: c.baseM + c.h0, partnerStageM: c.baseM + c.hL, baseM: c.baseM, zones: c.zones });
      expect(status).toBe(SOLVE_OK);
      // relative to the larger of the two end flows, so a line near the divide is still held to
      // a meaningful tolerance
      const flowScale = Math.max(Math.abs(ode.flowStart), Math.abs(ode.flowEnd));
      expectNear(solver.ownSeepageM2PerDay, ode.flowStart, 1e-6 * flowScale, 'seepage a = Q(0)');
      expectNear(solver.partnerSeepageM2PerDay, -ode.flowEnd, 1e-6 * flowScale, 'seepage b = -Q(L)');
      let x = 0;
      c.zones.forEach((zone, j) => {
        x += zone.lengthM;
        expectNear(solver.headAt(x) - c.baseM, ode.hEdge[j + 1], 1e-6 * ode.hEdge[j + 1], `h at edge ${j + 1}`);
      });
      expectNear(solver.peakWaterTableM - c.baseM, ode.hPeak, 1e-6 * ode.hPeak, 'peak thickness');
    },
  );
});
