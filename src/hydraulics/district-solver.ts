// The district solve: steady Dupuit-Forchheimer flow in an unconfined aquifer over a regular grid
// of square cells,
//   div(K h grad H) + N = 0,   h = H - base
// (J. Bear (1972), Dynamics of Fluids in Porous Media, chapter 8 [from memory]), with H the water
// table (m), K the hydraulic conductivity (m/d) and N the areal recharge (m/d, negative for a net
// loss).
//
// Finite volumes on the five-point stencil: between neighbouring active cells i and j the flow is
//   Q_ij = K_face hbar (H_i - H_j)          (m^3/d; face width = centre distance = cellM, so they cancel)
//   K_face = 2 K_i K_j / (K_i + K_j)        (harmonic mean: the two half-cells in series [derived])
//   hbar = (h_i + h_j) / 2                  (mean saturated thickness [derived])
// and no flow crosses into an outside cell. A free cell balances N cellM^2 against its outflows; a
// fixed cell holds the stage of the line burned into it.
//
// With one base under every cell, hbar (H_i - H_j) = (h_i^2 - h_j^2) / 2, so the discrete problem
// is linear in u = h^2 with Q_ij = (K_face / 2)(u_i - u_j) (K u / 2 is the discharge potential of
// O.D.L. Strack (1989), Groundwater Mechanics [from memory]) and one linear solve is exact. With
// differing bases the face thickness is lagged (Picard): hbar from the last iterate, a linear
// solve in H, until the largest change in head falls below a tolerance. The first iterate is the
// u-solve over the mean base; each linear solve starts from the last heads, and only the last ones
// run to the full tolerance.
//
// A cell whose saturated thickness falls to `dryThicknessM` or below is dry. It is counted, not
// refused: in u its value may go below 0 (its head is reported at its base), and under Picard the
// face thickness is floored at `dryThicknessM` so every linear system stays positive definite.
// Results next to dry cells are outside what the Dupuit-Forchheimer model describes.
//
// A line seldom runs through the centres of the cells it is burned into, and treating it as if it
// did moves it by up to half a cell. Where the grid gives `fixedFaceScale`, the face between a
// fixed cell and a free one is scaled by cellM / d, d the distance from the free cell's centre to
// the line along the axis joining the two centres: the Dirichlet condition taken where the line is
// (the ghost-fluid discretisation of F. Gibou, R. Fedkiw, L.-T. Cheng and M. Kang (2002), A second-
// order-accurate symmetric discretization of the Poisson equation on irregular domains, J. Comput.
// Phys. 176, 205-227 [from memory]). It only changes diagonal and right-hand side terms, so every
// system stays symmetric positive definite.
//
// A line whose bed resists seepage (a bed cell) does not hold its stage: its cell's head is unknown,
// and the bed passes Q = C (S - max(H, floor)) into it (m^3/d), C the bed's conductance over the
// cell (m^2/d: wetted perimeter x length of line in the cell / resistance), S the stage and floor
// the bed's underside, below which the water table no longer draws on the bed (the semi-pervious
// lining of H. Bouwer (1978), Groundwater Hydrology [from memory]). With the face scale above, the
// bed cell's head stands for the water table where the line runs, so it is the bank head of the
// bed law and no further grid resistance enters. The whole wetted perimeter counts: the cell holds
// both sides of the line. A bed cell is joined to every active neighbour, line cells too: what
// flows from it into another line's cell is water its bed passed, so as the resistance goes to 0
// the figures become those of fixed cells, whose flows into each other count in their exchange.
//
// In H (Picard, differing bases) the bed is linear: C on the diagonal, C S on the right. In u over
// one base, H = base + sqrt(u) is not: Newton on that term, sqrt(u) ~ h_k/2 + u/(2 h_k) about the
// last iterate's thickness h_k, puts C/(2 h_k) on the diagonal and C (S - base - h_k/2) on the
// right [derived]; the operator stays a symmetric M-matrix and the term is concave in u, so the
// iterates approach from below and never overshoot after the first (the monotone Newton of J.M.
// Ortega and W.C. Rheinboldt (1970), Iterative Solution of Nonlinear Equations in Several
// Variables, section 13.3 [from memory]). Where the last iterate is perched (below the floor) the
// bed passes C (S - floor) whatever the head; to keep the diagonal positive the same C/(2 h_k)
// stays there and its product with u_k moves to the right side (a fixed point at the same
// answer). The Newton steps run like the Picard steps: from a loose linear tolerance tightened
// each step, each from the last iterate, until no unknown head moves by headToleranceM in a step
// solved to the full tolerance. h_k is never taken below dryThicknessM.
//
// Every linear solve is conjugate gradients with a multigrid preconditioner (multigrid.ts). All
// sums run in one fixed order, so a rerun gives the same bits.
import { MultigridConjugateGradient, type MultigridOptions } from './multigrid.js';

export const CELL_OUTSIDE = 0;
export const CELL_FREE = 1;
export const CELL_FIXED = 2;
/** A cell of a line whose bed resists seepage: head unknown, exchanging through the bed. */
export const CELL_BED = 3;

export interface DistrictGrid {
  columns: number;
  rows: number;
  /** Side of a square cell (m). Cell index = row * columns + column. */
  cellM: number;
  /**
   * CELL_OUTSIDE (no flow), CELL_FREE (head unknown), CELL_FIXED (a line burned into the cell, or
   * an edge head) or CELL_BED (a line with a resistive bed: head unknown, exchanging through it).
   */
  cellKind: Uint8Array;
  kMPerDay: Float64Array;
  rechargeMPerDay: Float64Array;
  baseM: Float64Array;
  /** Stage of the line in the cell (m); read only where cellKind is CELL_FIXED or CELL_BED. */
  fixedHeadM: Float64Array;
  /**
   * Needed when any cell is CELL_BED, read only there: the bed's conductance over the cell
   * (m^2/d, > 0: wetted perimeter x length of line in the cell / bed resistance) and the
   * elevation of its underside (m; -Infinity when not known).
   */
  bed?: { conductanceM2PerDay: Float64Array; floorM: Float64Array };
  /**
   * Optional: a multiplier (> 0) of the face east of each cell (to cell + 1) and north of it (to
   * cell + columns), read only where the face joins a fixed or bed cell to another cell; 1 when absent.
   */
  fixedFaceScale?: { east: Float64Array; north: Float64Array };
}

export interface DistrictSolveOptions {
  /** Picard stops when no free cell's head changes by this much (m; default 1e-8). */
  headToleranceM?: number;
  /** Default 200. */
  maxPicardIterations?: number;
  /** Each linear solve stops at |residual| <= this * |right-hand side| (default 1e-11). */
  linearTolerance?: number;
  /** Per linear solve (default 1000). */
  maxLinearIterations?: number;
  /** A cell this thin or thinner is dry (m; default 1e-3). */
  dryThicknessM?: number;
  multigrid?: MultigridOptions;
}

export type DistrictSolveStatus = 'converged' | 'picard-not-converged' | 'newton-not-converged' | 'linear-not-converged';

export interface DistrictSolution {
  status: DistrictSolveStatus;
  /** Water table per cell (m): the stage in fixed cells, NaN outside. */
  headM: Float64Array;
  /** The indices of the cells that exchange with a line or an edge (fixed and bed cells), ascending. */
  fixedCells: Uint32Array;
  /**
   * Per fixed or bed cell, the water it gives the aquifer (m^3/d; positive when the line loses
   * water). A fixed cell: its flows into active neighbours less the recharge falling on the cell,
   * which joins the line. A bed cell: what the bed passes, C (S - max(H, floor)); the recharge on
   * the cell stays in the aquifer.
   */
  exchangeM3PerDay: Float64Array;
  /**
   * Per fixed or bed cell, what it sends across each of its four sides (m^3/d; negative when water
   * comes in): index 4k + side, sides in the order west, east, previous row, next row
   * (cellNeighbour's). A fixed cell's exchange is their sum less the recharge on the cell; so is a
   * bed cell's, up to its cell residual.
   */
  sideFlowM3PerDay: Float64Array;
  /** Recharge over every active cell (m^3/d). */
  totalRechargeM3PerDay: number;
  /** sum of exchanges + total recharge (m^3/d): 0 for an exact solve. */
  balanceResidualM3PerDay: number;
  /** |balance residual| over the larger of the water entering and leaving the aquifer. */
  balanceRelative: number;
  /** Largest |N cellM^2 (+ the bed's exchange) - outflows| over the free and bed cells (m^3/d), from the final heads. */
  largestCellResidualM3PerDay: number;
  /** Conjugate gradient iterations summed over all linear solves. */
  linearIterations: number;
  linearSolves: number;
  /** Picard iterations after the first u-solve (0 when every base is equal). */
  picardIterations: number;
  /** Newton iterations on the beds after the first u-solve (0 without bed cells, or with differing bases, where Picard carries the beds). */
  bedIterations: number;
  /** Largest change in head over the last Picard or Newton iteration (m; 0 when neither ran). */
  lastHeadChangeM: number;
  bedCellCount: number;
  dryCellCount: number;
  freeCellCount: number;
  /** Bytes the linear solver held in typed arrays. */
  solverBytes: number;
  /**
   * u = h^2 per cell (m^2) over the reference base, the unknowns the flows came from, when the
   * solve ran in u (one base under every cell); null under Picard. What districtFlows needs to
   * give the same flows again.
   */
  squaredThicknessM2: Float64Array | null;
}

/** The flows of a state of the grid: what balance gives from a solve, or from heads stitched together. */
export type DistrictFlows = Pick<
  DistrictSolution,
  'fixedCells' | 'exchangeM3PerDay' | 'sideFlowM3PerDay' | 'totalRechargeM3PerDay' | 'balanceResidualM3PerDay' | 'balanceRelative' | 'largestCellResidualM3PerDay' | 'dryCellCount'
>;

// Inexact Picard: while the heads still move, a linear solve far finer than the move is wasted, so
// the first step's linear tolerance is loose and each step tightens it until the full tolerance
// (R.S. Dembo, S.C. Eisenstat and T. Steihaug (1982), Inexact Newton methods, SIAM J. Numer.
// Anal. 19, 400-408 [from memory]). The step was tuned on the bench's uneven-base district, where
// it cut the conjugate gradient iterations from 84 to 30 at the same Picard count.
const LOOSEST_PICARD_TOLERANCE = 1e-4;
const PICARD_TOLERANCE_STEP = 0.03;

const DEFAULTS = {
  headToleranceM: 1e-8,
  maxPicardIterations: 200,
  linearTolerance: 1e-11,
  maxLinearIterations: 1000,
  dryThicknessM: 1e-3,
};

/**
 * Solves the steady water table over the grid. Throws on malformed input (naming the value);
 * physical trouble (no convergence, dry cells) is reported in the result.
 *
 *   const solution = solveDistrict(grid);
 *   solution.exchangeM3PerDay[k]   // loss of the line in cell solution.fixedCells[k]
 */
export function solveDistrict(grid: DistrictGrid, options: DistrictSolveOptions = {}): DistrictSolution {
  const settings = { ...DEFAULTS, ...options };
  checkSettings(settings);
  checkGrid(grid);
  checkEveryFreeGroupMeetsAFixedCell(grid);
  const { columns, rows, cellKind } = grid;
  const cellCount = columns * rows;
  const solver = new MultigridConjugateGradient(columns, rows, options.multigrid);

  let freeCellCount = 0, bedCellCount = 0;
  for (let g = 0; g < cellCount; g++) {
    if (cellKind[g] === CELL_FREE) freeCellCount++;
    else if (cellKind[g] === CELL_BED) bedCellCount++;
  }
  const { equalBases, referenceBaseM } = solveBase(grid);
  // one linear solve is exact only with equal bases and no bed
  const iterates = !equalBases || bedCellCount > 0;

  // u-solve: exact with equal bases and no bed, and the first iterate otherwise
  const headM = new Float64Array(cellCount);
  assemble(grid, solver, referenceBaseM, settings.dryThicknessM, null, false);
  solver.prepare();
  let tolerance = iterates ? Math.max(settings.linearTolerance, LOOSEST_PICARD_TOLERANCE) : settings.linearTolerance;
  let report = solver.solve(tolerance, settings.maxLinearIterations);
  let linearIterations = report.iterations, linearSolves = 1;
  readHeadsFromU(grid, solver.x, referenceBaseM, headM);
  let status: DistrictSolveStatus = report.converged ? 'converged' : 'linear-not-converged';

  let picardIterations = 0, bedIterations = 0, lastHeadChangeM = 0;
  if (iterates && report.converged) {
    // Picard in H with differing bases (the beds linear in H), else Newton in u on the beds
    const picard = !equalBases;
    status = picard ? 'picard-not-converged' : 'newton-not-converged';
    while ((picard ? picardIterations : bedIterations) < settings.maxPicardIterations) {
      if (picard) picardIterations++;
      else bedIterations++;
      tolerance = Math.max(settings.linearTolerance, tolerance * PICARD_TOLERANCE_STEP);
      if (picard) assemble(grid, solver, NaN, settings.dryThicknessM, headM, false);
      else assemble(grid, solver, referenceBaseM, settings.dryThicknessM, null, true);
      solver.prepare();
      report = solver.solve(tolerance, settings.maxLinearIterations);
      linearIterations += report.iterations;
      linearSolves++;
      lastHeadChangeM = picard ? readHeads(grid, solver.x, headM) : readHeadsFromU(grid, solver.x, referenceBaseM, headM);
      if (!report.converged) {
        status = 'linear-not-converged';
        break;
      }
      // only a step solved to the full tolerance may end the iteration
      if (lastHeadChangeM < settings.headToleranceM && tolerance === settings.linearTolerance) {
        status = 'converged';
        break;
      }
    }
  }

  let squaredThicknessM2: Float64Array | null = null;
  if (equalBases) {
    squaredThicknessM2 = new Float64Array(cellCount);
    const w = columns + 2;
    for (let row = 0; row < rows; row++) squaredThicknessM2.set(solver.x.subarray((row + 1) * w + 1, (row + 1) * w + 1 + columns), row * columns);
  }
  const result = districtFlows(grid, squaredThicknessM2, headM, { dryThicknessM: settings.dryThicknessM });
  return {
    status,
    headM,
    ...result,
    linearIterations,
    linearSolves,
    picardIterations,
    bedIterations,
    lastHeadChangeM,
    freeCellCount,
    bedCellCount,
    solverBytes: solver.bytes,
    squaredThicknessM2,
  };
}

/**
 * Whether one base lies under every active cell (the solve is then linear in u = h^2 over it), and
 * the reference base of u: that base, or the mean base (the first iterate's) when they differ.
 */
export function solveBase(grid: DistrictGrid): { equalBases: boolean; referenceBaseM: number } {
  const { cellKind, baseM } = grid;
  let activeCellCount = 0, baseSum = 0, firstBase = NaN, equalBases = true;
  for (let g = 0; g < cellKind.length; g++) {
    if (cellKind[g] === CELL_OUTSIDE) continue;
    activeCellCount++;
    baseSum += baseM[g];
    if (activeCellCount === 1) firstBase = baseM[g];
    else if (baseM[g] !== firstBase) equalBases = false;
  }
  return { equalBases, referenceBaseM: equalBases ? firstBase : baseSum / activeCellCount };
}

/**
 * Fills the solver's operator, right-hand side and first guess. `headM` null: the u-system over
 * `referenceBaseM`, its beds linearised about the stage (`newton` false: the first solve, from a
 * level guess) or about the u in the solver's x (`newton` true, which keeps x as the guess);
 * otherwise the H-system with the face thickness of `headM`. Thicknesses are floored at `dryM`.
 */
function assemble(
  grid: DistrictGrid,
  solver: MultigridConjugateGradient,
  referenceBaseM: number,
  dryM: number,
  headM: Float64Array | null,
  newton: boolean,
): void {
  const { columns, rows, cellM, cellKind, kMPerDay, rechargeMPerDay, baseM, fixedHeadM, fixedFaceScale, bed } = grid;
  const { eastT, northT, diag } = solver.fine;
  const rhs = solver.rhs, x = solver.x;
  const areaM2 = cellM * cellM;
  const w = columns + 2;
  eastT.fill(0);
  northT.fill(0);
  diag.fill(0);
  rhs.fill(0);

  // the first guess in u: the mean over line cells, a level water table at the lines' mean stage
  let guessU = 0;
  if (headM === null && !newton) {
    x.fill(0);
    let fixedCount = 0;
    for (let g = 0; g < cellKind.length; g++) {
      if (cellKind[g] !== CELL_FIXED && cellKind[g] !== CELL_BED) continue;
      guessU += fixedValue(fixedHeadM[g], referenceBaseM);
      fixedCount++;
    }
    guessU = fixedCount > 0 ? guessU / fixedCount : 0;
  } else if (headM !== null) x.fill(0);

  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const kind = cellKind[g];
      if (kind === CELL_OUTSIDE) continue;
      const p = (row + 1) * w + col + 1;
      if (kind === CELL_FREE || kind === CELL_BED) {
        rhs[p] += rechargeMPerDay[g] * areaM2;
        if (headM !== null) x[p] = headM[g];
        else if (!newton) x[p] = kind === CELL_BED ? fixedValue(fixedHeadM[g], referenceBaseM) : guessU;
      }
      if (kind === CELL_BED) {
        const c = (bed as NonNullable<DistrictGrid['bed']>).conductanceM2PerDay[g], floor = (bed as NonNullable<DistrictGrid['bed']>).floorM[g];
        const stageM = fixedHeadM[g];
        if (headM !== null) {
          // linear in H; a perched cell passes C (S - floor), its C H_k moved to the right side
          const hk = headM[g];
          diag[p] += c;
          rhs[p] += hk > floor ? c * stageM : c * (stageM - floor + hk);
        } else {
          // Newton on sqrt(u) about h_k (see the head of this file)
          const uk = newton ? x[p] : fixedValue(stageM, referenceBaseM);
          const root = Math.sqrt(uk > 0 ? uk : 0);
          const hk = root > dryM ? root : dryM;
          diag[p] += c / (2 * hk);
          rhs[p] += referenceBaseM + hk > floor ? c * (stageM - referenceBaseM - hk / 2) : c * (stageM - floor + hk / 2);
        }
      }
      for (let side = 0; side < 2; side++) {
        // side 0: the east face, side 1: the face to the next row
        if (side === 0 ? col + 1 >= columns : row + 1 >= rows) continue;
        const gj = side === 0 ? g + 1 : g + columns;
        const kindJ = cellKind[gj];
        if (kindJ === CELL_OUTSIDE || (kind === CELL_FIXED && kindJ === CELL_FIXED)) continue;
        const pj = side === 0 ? p + 1 : p + w;
        let t = headM === null
          ? faceCoefficientU(kMPerDay[g], kMPerDay[gj])
          : faceCoefficientH(kMPerDay[g], kMPerDay[gj], headM[g] - baseM[g], headM[gj] - baseM[gj], dryM);
        if (fixedFaceScale && (kind >= CELL_FIXED || kindJ >= CELL_FIXED)) t *= side === 0 ? fixedFaceScale.east[g] : fixedFaceScale.north[g];
        if (kind !== CELL_FIXED && kindJ !== CELL_FIXED) {
          if (side === 0) eastT[p] = t;
          else northT[p] = t;
          diag[p] += t;
          diag[pj] += t;
        } else if (kind !== CELL_FIXED) {
          diag[p] += t;
          rhs[p] += t * (headM === null ? fixedValue(fixedHeadM[gj], referenceBaseM) : fixedHeadM[gj]);
        } else {
          diag[pj] += t;
          rhs[pj] += t * (headM === null ? fixedValue(fixedHeadM[g], referenceBaseM) : fixedHeadM[g]);
        }
      }
    }
  }
}

// u of a fixed cell; a stage at or below the base gives a dry line (u = 0)
function fixedValue(stageM: number, baseM: number): number {
  const h = stageM - baseM;
  return h > 0 ? h * h : 0;
}

// Q = (K_face / 2)(u_i - u_j), K_face the harmonic mean [derived]
function faceCoefficientU(kI: number, kJ: number): number {
  return (kI * kJ) / (kI + kJ);
}

// Q = K_face hbar (H_i - H_j), hbar the mean thickness, neither side below 0, floored [derived]
function faceCoefficientH(kI: number, kJ: number, hI: number, hJ: number, floorM: number): number {
  const hbar = 0.5 * ((hI > 0 ? hI : 0) + (hJ > 0 ? hJ : 0));
  return ((2 * kI * kJ) / (kI + kJ)) * (hbar > floorM ? hbar : floorM);
}

/** Heads from u over the reference base; returns the largest change over the free and bed cells. */
function readHeadsFromU(grid: DistrictGrid, u: Float64Array, referenceBaseM: number, headM: Float64Array): number {
  const { columns, rows, cellKind, fixedHeadM } = grid;
  const w = columns + 2;
  let change = 0;
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const kind = cellKind[g];
      const value = u[(row + 1) * w + col + 1];
      const next = kind === CELL_OUTSIDE ? NaN : kind === CELL_FIXED ? fixedHeadM[g] : referenceBaseM + Math.sqrt(value > 0 ? value : 0);
      if (kind === CELL_FREE || kind === CELL_BED) {
        const d = Math.abs(next - headM[g]);
        if (d > change) change = d;
      }
      headM[g] = next;
    }
  }
  return change;
}

/** Copies the free and bed cells' heads from the solver; returns the largest change. */
function readHeads(grid: DistrictGrid, x: Float64Array, headM: Float64Array): number {
  const { columns, rows, cellKind } = grid;
  const w = columns + 2;
  let change = 0;
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      if (cellKind[g] !== CELL_FREE && cellKind[g] !== CELL_BED) continue;
      const next = x[(row + 1) * w + col + 1];
      const d = Math.abs(next - headM[g]);
      if (d > change) change = d;
      headM[g] = next;
    }
  }
  return change;
}

/**
 * Flows from a state of the grid: from u per cell (m^2) when `u` is given (one base: exactly the
 * flows the linear solve balanced), else from the heads with the face thickness of those same
 * heads. The solve's own state balances to its tolerance; heads put together from separate solves
 * (the district's tiles) need not, and the cell residuals say by how much.
 */
export function districtFlows(grid: DistrictGrid, u: Float64Array | null, headM: Float64Array, options: { dryThicknessM?: number } = {}): DistrictFlows {
  const { columns, rows, cellM, cellKind, kMPerDay, rechargeMPerDay, baseM, fixedHeadM, fixedFaceScale, bed } = grid;
  const dryThicknessM = options.dryThicknessM ?? DEFAULTS.dryThicknessM;
  const n = columns * rows;
  if (headM.length !== n) throw new Error(`Unexpected headM length: ${headM.length} (columns * rows = ${n}).`);
  if (u !== null && u.length !== n) throw new Error(`Unexpected u length: ${u.length} (columns * rows = ${n}).`);
  const referenceBaseM = u === null ? NaN : solveBase(grid).referenceBaseM;
  const areaM2 = cellM * cellM;
  let fixedCount = 0;
  for (let g = 0; g < cellKind.length; g++) if (cellKind[g] >= CELL_FIXED) fixedCount++;
  const fixedCells = new Uint32Array(fixedCount);
  const exchangeM3PerDay = new Float64Array(fixedCount);
  const sideFlowM3PerDay = new Float64Array(4 * fixedCount);

  let k = 0, totalRechargeM3PerDay = 0, inflow = 0, outflow = 0, largestCellResidualM3PerDay = 0, dryCellCount = 0;
  const dryU = dryThicknessM * dryThicknessM;
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const kind = cellKind[g];
      if (kind === CELL_OUTSIDE) continue;
      const valueI = u === null ? headM[g] : kind === CELL_FIXED ? fixedValue(fixedHeadM[g], referenceBaseM) : u[g];
      const rechargeM3PerDay = rechargeMPerDay[g] * areaM2;
      totalRechargeM3PerDay += rechargeM3PerDay;
      if (rechargeM3PerDay > 0) inflow += rechargeM3PerDay;
      else outflow -= rechargeM3PerDay;
      // the four neighbours in a fixed order: west, east, previous row, next row
      let out = 0;
      for (let side = 0; side < 4; side++) {
        let gj: number, face: number;
        if (side === 0) {
          if (col === 0) continue;
          gj = g - 1; face = gj;
        } else if (side === 1) {
          if (col + 1 === columns) continue;
          gj = g + 1; face = g;
        } else if (side === 2) {
          if (row === 0) continue;
          gj = g - columns; face = gj;
        } else {
          if (row + 1 === rows) continue;
          gj = g + columns; face = g;
        }
        const kindJ = cellKind[gj];
        if (kindJ === CELL_OUTSIDE) continue;
        const scale = fixedFaceScale && (kind >= CELL_FIXED || kindJ >= CELL_FIXED) ? (side < 2 ? fixedFaceScale.east[face] : fixedFaceScale.north[face]) : 1;
        let flow: number;
        if (u === null) {
          const t = faceCoefficientH(kMPerDay[g], kMPerDay[gj], headM[g] - baseM[g], headM[gj] - baseM[gj], dryThicknessM);
          flow = scale * t * (valueI - headM[gj]);
        } else {
          const valueJ = kindJ === CELL_FIXED ? fixedValue(fixedHeadM[gj], referenceBaseM) : u[gj];
          flow = scale * faceCoefficientU(kMPerDay[g], kMPerDay[gj]) * (valueI - valueJ);
        }
        out += flow;
        if (kind >= CELL_FIXED) sideFlowM3PerDay[4 * k + side] = flow;
      }
      // a bed passes C (S - max(H, floor)), H from the final heads; a fixed cell what it sends less its recharge
      const bedFlow = kind === CELL_BED ? bedExchange(bed!, g, fixedHeadM[g], headM[g]) : 0;
      if (kind >= CELL_FIXED) {
        const exchange = kind === CELL_BED ? bedFlow : out - rechargeM3PerDay;
        fixedCells[k] = g;
        exchangeM3PerDay[k++] = exchange;
        if (exchange > 0) inflow += exchange;
        else outflow -= exchange;
      }
      if (kind !== CELL_FIXED) {
        const residual = Math.abs(rechargeM3PerDay + bedFlow - out);
        if (residual > largestCellResidualM3PerDay) largestCellResidualM3PerDay = residual;
        const thickness = u === null ? headM[g] - baseM[g] : valueI;
        if (thickness <= (u === null ? dryThicknessM : dryU)) dryCellCount++;
      }
    }
  }
  let balanceResidualM3PerDay = totalRechargeM3PerDay;
  for (let j = 0; j < fixedCount; j++) balanceResidualM3PerDay += exchangeM3PerDay[j];
  const gross = Math.max(inflow, outflow);
  return {
    fixedCells,
    exchangeM3PerDay,
    sideFlowM3PerDay,
    totalRechargeM3PerDay,
    balanceResidualM3PerDay,
    balanceRelative: gross > 0 ? Math.abs(balanceResidualM3PerDay) / gross : 0,
    largestCellResidualM3PerDay,
    dryCellCount,
  };
}

/** What a bed passes into its cell (m^3/d): C (S - max(H, floor)) [H. Bouwer (1978), Groundwater Hydrology, from memory]. */
function bedExchange(bed: NonNullable<DistrictGrid['bed']>, g: number, stageM: number, headM: number): number {
  const floor = bed.floorM[g];
  return bed.conductanceM2PerDay[g] * (stageM - (headM > floor ? headM : floor));
}

function checkSettings(s: typeof DEFAULTS): void {
  if (!(s.headToleranceM > 0)) throw new Error(`Unexpected headToleranceM value: ${s.headToleranceM}.`);
  if (!(Number.isInteger(s.maxPicardIterations) && s.maxPicardIterations >= 1)) throw new Error(`Unexpected maxPicardIterations value: ${s.maxPicardIterations}.`);
  if (!(s.linearTolerance > 0 && s.linearTolerance < 1)) throw new Error(`Unexpected linearTolerance value: ${s.linearTolerance}.`);
  if (!(Number.isInteger(s.maxLinearIterations) && s.maxLinearIterations >= 1)) throw new Error(`Unexpected maxLinearIterations value: ${s.maxLinearIterations}.`);
  if (!(s.dryThicknessM > 0)) throw new Error(`Unexpected dryThicknessM value: ${s.dryThicknessM}.`);
}

function checkGrid(grid: DistrictGrid): void {
  const { columns, rows, cellM } = grid;
  if (!(Number.isInteger(columns) && columns >= 1)) throw new Error(`Unexpected columns value: ${columns}.`);
  if (!(Number.isInteger(rows) && rows >= 1)) throw new Error(`Unexpected rows value: ${rows}.`);
  if (!(cellM > 0 && Number.isFinite(cellM))) throw new Error(`Unexpected cellM value: ${cellM}.`);
  const n = columns * rows;
  for (const name of ['cellKind', 'kMPerDay', 'rechargeMPerDay', 'baseM', 'fixedHeadM'] as const) {
    const length = grid[name]?.length;
    if (length !== n) throw new Error(`Unexpected ${name} length: ${length} (columns * rows = ${n}).`);
  }
  const { cellKind, kMPerDay, rechargeMPerDay, baseM, fixedHeadM } = grid;
  const where = (g: number) => `at cell ${g} (row ${Math.floor(g / columns)}, column ${g % columns})`;
  if (grid.bed) {
    for (const name of ['conductanceM2PerDay', 'floorM'] as const) {
      const length = grid.bed[name]?.length;
      if (length !== n) throw new Error(`Unexpected bed.${name} length: ${length} (columns * rows = ${n}).`);
    }
  }
  if (grid.fixedFaceScale) {
    for (const name of ['east', 'north'] as const) {
      const scale = grid.fixedFaceScale[name];
      if (scale?.length !== n) throw new Error(`Unexpected fixedFaceScale.${name} length: ${scale?.length} (columns * rows = ${n}).`);
      for (let g = 0; g < n; g++) if (!(scale[g] > 0 && Number.isFinite(scale[g]))) throw new Error(`Unexpected fixedFaceScale.${name} value: ${scale[g]} ${where(g)}.`);
    }
  }
  for (let g = 0; g < n; g++) {
    const kind = cellKind[g];
    if (kind > CELL_BED) throw new Error(`Unexpected cellKind value: ${kind} ${where(g)}.`);
    if (kind === CELL_OUTSIDE) continue;
    if (!(kMPerDay[g] > 0 && Number.isFinite(kMPerDay[g]))) throw new Error(`Unexpected kMPerDay value: ${kMPerDay[g]} ${where(g)}.`);
    if (!Number.isFinite(rechargeMPerDay[g])) throw new Error(`Unexpected rechargeMPerDay value: ${rechargeMPerDay[g]} ${where(g)}.`);
    if (!Number.isFinite(baseM[g])) throw new Error(`Unexpected baseM value: ${baseM[g]} ${where(g)}.`);
    if (kind >= CELL_FIXED && !Number.isFinite(fixedHeadM[g])) throw new Error(`Unexpected fixedHeadM value: ${fixedHeadM[g]} ${where(g)}.`);
    if (kind === CELL_BED) {
      if (!grid.bed) throw new Error(`Unexpected bed value: undefined with a bed cell ${where(g)}.`);
      const c = grid.bed.conductanceM2PerDay[g], floor = grid.bed.floorM[g];
      if (!(c > 0 && Number.isFinite(c))) throw new Error(`Unexpected bed.conductanceM2PerDay value: ${c} ${where(g)}.`);
      if (Number.isNaN(floor) || floor === Infinity) throw new Error(`Unexpected bed.floorM value: ${floor} ${where(g)}.`);
    }
  }
}

// A group of free cells with no fixed cell beside it has no steady state unless its recharge sums
// to 0, and then its level is arbitrary: refuse it rather than solve a singular system.
function checkEveryFreeGroupMeetsAFixedCell(grid: DistrictGrid): void {
  const { columns, rows, cellKind } = grid;
  const n = columns * rows;
  const seen = new Uint8Array(n);
  const stack = new Int32Array(n);
  for (let start = 0; start < n; start++) {
    if (cellKind[start] !== CELL_FREE || seen[start]) continue;
    let top = 0, size = 0, meetsFixed = false;
    stack[top++] = start;
    seen[start] = 1;
    while (top > 0) {
      const g = stack[--top];
      size++;
      for (let side = 0; side < 4; side++) {
        const gj = cellNeighbour(g, side, columns, n);
        if (gj < 0) continue;
        const kind = cellKind[gj];
        // a bed's exchange falls as the head rises: it gives a steady state as a fixed head does
        if (kind === CELL_FIXED || kind === CELL_BED) meetsFixed = true;
        else if (kind === CELL_FREE && !seen[gj]) {
          seen[gj] = 1;
          stack[top++] = gj;
        }
      }
    }
    if (!meetsFixed) {
      throw new Error(
        `The ${size} free cell(s) connected to cell ${start} (row ${Math.floor(start / columns)}, column ${start % columns}) ` +
          'touch no fixed cell: their steady water table has no unique solution. Burn a line into them or mark them outside.',
      );
    }
  }
}

/** The cell beside cell g on a side (0 west, 1 east, 2 south, 3 north), or -1 past the grid's edge. */
export function cellNeighbour(g: number, side: number, columns: number, cells: number): number {
  const col = g % columns;
  if (side === 0) return col === 0 ? -1 : g - 1;
  if (side === 1) return col + 1 === columns ? -1 : g + 1;
  if (side === 2) return g < columns ? -1 : g - columns;
  return g + columns >= cells ? -1 : g + columns;
}

/** A grid of the given size with every cell outside the aquifer and every figure 0, to be filled in. */
export function emptyDistrictGrid(columns: number, rows: number, cellM: number): DistrictGrid {
  const n = columns * rows;
  return {
    columns,
    rows,
    cellM,
    cellKind: new Uint8Array(n),
    kMPerDay: new Float64Array(n),
    rechargeMPerDay: new Float64Array(n),
    baseM: new Float64Array(n),
    fixedHeadM: new Float64Array(n),
  };
}
