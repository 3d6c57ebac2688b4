// Shared by the hydraulics tests: loading zones into a TransectSolver, a seeded generator, and a
// closeness check that names what it compares.
import { expect } from 'vitest';
import { SOLVE_OK, SOLVE_STATUS_NAMES, TransectSolver } from '../../src/hydraulics/transect-solver.js';
import type { StripProblem, ZoneSpec } from '../../src/hydraulics/solve-strip.js';

/** Fills the solver's zone arrays and solves; throws unless the solve succeeds. */
export function solveOk(solver: TransectSolver, problem: StripProblem): TransectSolver {
  const status = solveWith(solver, problem);
  if (status !== SOLVE_OK) throw new Error(`Unexpected solve status: ${SOLVE_STATUS_NAMES[status]}.`);
  return solver;
}

export function solveWith(solver: TransectSolver, problem: StripProblem): number {
  problem.zones.forEach((zone, j) => {
    solver.lengthM[j] = zone.lengthM;
    solver.kMPerDay[j] = zone.kMPerDay;
    solver.rechargeMPerDay[j] = zone.rechargeMPerDay;
    solver.groundM[j] = zone.groundM;
  });
  return solver.solve(problem.ownStageM, problem.partnerStageM, problem.baseM, problem.zones.length);
}

export function oneZone(ownStageM: number, partnerStageM: number, baseM: number, zone: ZoneSpec): StripProblem {
  return { ownStageM, partnerStageM, baseM, zones: [zone] };
}

/** |got - want| <= tol, with the quantity named in the failure message. */
export function expectNear(got: number, want: number, tol: number, what: string): void {
  expect(Number.isFinite(got), `${what}: got ${got}`).toBe(true);
  expect(Math.abs(got - want), `${what}: got ${got}, want ${want} (tolerance ${tol})`).toBeLessThanOrEqual(tol);
}

/** Mulberry32, a small seeded generator, so random cases are the same on every run. */
export { seededRandom } from '../../bench/network.js';
