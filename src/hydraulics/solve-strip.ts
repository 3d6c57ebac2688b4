// A plain-object front to TransectSolver for one-off solves, with a sentence for each failure:
// for library use and tests.
// The district pipeline uses TransectSolver directly so that its inner loop allocates nothing.
import { SOLVE_OK, SOLVE_STATUS_NAMES, TransectSolver, type SolveStatusName } from './transect-solver.js';

export interface ZoneSpec {
  lengthM: number;
  kMPerDay: number;
  /** Areal recharge (m/d); negative for net evaporation or pumping. */
  rechargeMPerDay: number;
  groundM: number;
}

export interface StripProblem {
  ownStageM: number;
  partnerStageM: number;
  baseM: number;
  /** Zones in series from line a to line b. */
  zones: ZoneSpec[];
  /** Optional beds of line a (own) and line b (partner); a clean bed when absent. */
  ownBed?: BedSpec;
  partnerBed?: BedSpec;
}

export interface BedSpec {
  /** The bed's conductance per metre of line on this side (m/d): the side's wetted perimeter over the bed resistance. */
  conductanceMPerDay: number;
  /** Elevation of the bed's underside (m); below it the bank head no longer matters. Default: none. */
  floorM?: number;
}

export interface StripSolution {
  ok: true;
  transectLengthM: number;
  ownSeepageM2PerDay: number;
  partnerSeepageM2PerDay: number;
  peakWaterTableM: number;
  peakOffsetM: number;
  divideOffsetM: number;
  minDepthM: number;
  minDepthOffsetM: number;
  meanThicknessM: number;
  dupuitRatio: number;
  massResidualM2PerDay: number;
  /** Water table at the banks of a and b (m). */
  ownBankHeadM: number;
  partnerBankHeadM: number;
  /** |seepage through a bed - seepage into the aquifer| at the worse bank (m^2/d). */
  bedResidualM2PerDay: number;
  /** Water-table elevation (m) at distance xM from line a. */
  headAt(xM: number): number;
  /** Flow towards line b (m^2/d) at distance xM from line a. */
  fluxAt(xM: number): number;
  /** Length (m) where the water table is less than depthM below ground. */
  shallowLengthM(depthM: number): number;
}

export interface StripFailure {
  ok: false;
  reason: SolveStatusName;
  detail: string;
}

export function solveStrip(problem: StripProblem): StripSolution | StripFailure {
  const solver = new TransectSolver(Math.max(1, problem.zones.length));
  problem.zones.forEach((zone, j) => {
    solver.lengthM[j] = zone.lengthM;
    solver.kMPerDay[j] = zone.kMPerDay;
    solver.rechargeMPerDay[j] = zone.rechargeMPerDay;
    solver.groundM[j] = zone.groundM;
  });
  solver.ownBedConductanceMPerDay = problem.ownBed?.conductanceMPerDay ?? Infinity;
  solver.ownBedFloorM = problem.ownBed?.floorM ?? -Infinity;
  solver.partnerBedConductanceMPerDay = problem.partnerBed?.conductanceMPerDay ?? Infinity;
  solver.partnerBedFloorM = problem.partnerBed?.floorM ?? -Infinity;
  const status = solver.solve(problem.ownStageM, problem.partnerStageM, problem.baseM, problem.zones.length);
  if (status !== SOLVE_OK) {
    const reason = SOLVE_STATUS_NAMES[status];
    return { ok: false, reason, detail: describeFailure(reason, problem, solver.failedZone) };
  }
  return {
    ok: true,
    transectLengthM: solver.transectLengthM,
    ownSeepageM2PerDay: solver.ownSeepageM2PerDay,
    partnerSeepageM2PerDay: solver.partnerSeepageM2PerDay,
    peakWaterTableM: solver.peakWaterTableM,
    peakOffsetM: solver.peakOffsetM,
    divideOffsetM: solver.divideOffsetM,
    minDepthM: solver.minDepthM,
    minDepthOffsetM: solver.minDepthOffsetM,
    meanThicknessM: solver.meanThicknessM,
    dupuitRatio: solver.dupuitRatio,
    massResidualM2PerDay: solver.massResidualM2PerDay,
    ownBankHeadM: solver.ownBankHeadM,
    partnerBankHeadM: solver.partnerBankHeadM,
    bedResidualM2PerDay: solver.bedResidualM2PerDay,
    headAt: (xM) => solver.headAt(xM),
    fluxAt: (xM) => solver.fluxAt(xM),
    shallowLengthM: (depthM) => solver.shallowLengthM(depthM),
  };
}

export function describeFailure(reason: SolveStatusName, problem: StripProblem, zone: number): string {
  const where = zone >= 0 ? ` in zone ${zone + 1} of ${problem.zones.length}` : '';
  switch (reason) {
    case 'no-zones':
      return 'the transect crosses no aquifer zone';
    case 'non-finite-input':
      return `an input is not a finite number${where}`;
    case 'non-positive-length':
      return `zone length ${problem.zones[zone]?.lengthM} m is not positive${where}`;
    case 'non-positive-conductivity':
      return `hydraulic conductivity ${problem.zones[zone]?.kMPerDay} m/d is not positive${where}`;
    case 'stage-at-or-below-base':
      return `a line's stage (a ${problem.ownStageM} m, b ${problem.partnerStageM} m) is at or below the aquifer base ${problem.baseM} m`;
    case 'bed-solve-failed':
      return "the heads at the banks of the lines' beds did not converge";
    case 'aquifer-dries':
      return `the water table would fall to the aquifer base${where}: the Dupuit-Forchheimer strip solution does not hold`;
    default:
      return reason;
  }
}
