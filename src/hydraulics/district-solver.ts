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
// Every linear solve is conjugate gradients with a multigrid preconditioner (multigrid.ts). All
// sums run in one fixed order, so a rerun gives the same bits.
import { MultigridConjugateGradient, type MultigridOptions } from './multigrid.js';

export const CELL_OUTSIDE = 0;
export const CELL_FREE = 1;
export const CELL_FIXED = 2;

export interface DistrictGrid {
  columns: number;
  rows: number;
  /** Side of a square cell (m). Cell index = row * columns + column. */
  cellM: number;
  /** CELL_OUTSIDE (no flow), CELL_FREE (head unknown) or CELL_FIXED (a line burned into the cell). */
  cellKind: Uint8Array;
  kMPerDay: Float64Array;
  rechargeMPerDay: Float64Array;
  baseM: Float64Array;
  /** Stage of the line in the cell (m); read only where cellKind is CELL_FIXED. */
  fixedHeadM: Float64Array;
  /**
   * Optional: a multiplier (> 0) of the face east of each cell (to cell + 1) and north of it (to
   * cell + columns), read only where the face joins a fixed cell and a free one; 1 when absent.
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

export type DistrictSolveStatus = 'converged' | 'picard-not-converged' | 'linear-not-converged';

export interface DistrictSolution {
  status: DistrictSolveStatus;
  /** Water table per cell (m): the stage in fixed cells, NaN outside. */
  headM: Float64Array;
  /** The fixed cells' indices, ascending. */
  fixedCells: Uint32Array;
  /**
   * Per fixed cell, the water it gives the aquifer (m^3/d; positive when the line loses water):
   * its flows into active neighbours less the recharge falling on the cell, which joins the line.
   */
  exchangeM3PerDay: Float64Array;
  /**
   * Per fixed cell, what it sends across each of its four sides (m^3/d; negative when water comes
   * in): index 4k + side, sides in the order west, east, previous row, next row (cellNeighbour's).
   * The exchange is their sum less the recharge on the cell.
   */
  sideFlowM3PerDay: Float64Array;
  /** Recharge over every active cell (m^3/d). */
  totalRechargeM3PerDay: number;
  /** sum of exchanges + total recharge (m^3/d): 0 for an exact solve. */
  balanceResidualM3PerDay: number;
  /** |balance residual| over the larger of the water entering and leaving the aquifer. */
  balanceRelative: number;
  /** Largest |N cellM^2 - outflows| over the free cells (m^3/d), from the final heads. */
  largestCellResidualM3PerDay: number;
  /** Conjugate gradient iterations summed over all linear solves. */
  linearIterations: number;
  linearSolves: number;
  /** Picard iterations after the first u-solve (0 when every base is equal). */
  picardIterations: number;
  /** Largest change in head over the last Picard iteration (m; 0 when every base is equal). */
  lastHeadChangeM: number;
  dryCellCount: number;
  freeCellCount: number;
  /** Bytes the linear solver held in typed arrays. */
  solverBytes: number;
}

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
  const { columns, rows, cellKind, baseM } = grid;
  const cellCount = columns * rows;
  const solver = new MultigridConjugateGradient(columns, rows, options.multigrid);

  let freeCellCount = 0, activeCellCount = 0, baseSum = 0, firstBase = NaN, equalBases = true;
  for (let g = 0; g < cellCount; g++) {
    if (cellKind[g] === CELL_OUTSIDE) continue;
    if (cellKind[g] === CELL_FREE) freeCellCount++;
    activeCellCount++;
    baseSum += baseM[g];
    if (activeCellCount === 1) firstBase = baseM[g];
    else if (baseM[g] !== firstBase) equalBases = false;
  }
  const referenceBaseM = equalBases ? firstBase : baseSum / activeCellCount;

  // u-solve: exact with equal bases, and the first iterate otherwise
  const headM = new Float64Array(cellCount);
  assemble(grid, solver, referenceBaseM, 0, null);
  solver.prepare();
  let tolerance = equalBases ? settings.linearTolerance : Math.max(settings.linearTolerance, LOOSEST_PICARD_TOLERANCE);
  let report = solver.solve(tolerance, settings.maxLinearIterations);
  let linearIterations = report.iterations, linearSolves = 1;
  readHeadsFromU(grid, solver.x, referenceBaseM, headM);
  let status: DistrictSolveStatus = report.converged ? 'converged' : 'linear-not-converged';

  let picardIterations = 0, lastHeadChangeM = 0;
  if (!equalBases && report.converged) {
    status = 'picard-not-converged';
    while (picardIterations < settings.maxPicardIterations) {
      picardIterations++;
      tolerance = Math.max(settings.linearTolerance, tolerance * PICARD_TOLERANCE_STEP);
      assemble(grid, solver, NaN, settings.dryThicknessM, headM);
      solver.prepare();
      report = solver.solve(tolerance, settings.maxLinearIterations);
      linearIterations += report.iterations;
      linearSolves++;
      lastHeadChangeM = readHeads(grid, solver.x, headM);
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

  const result = balance(grid, equalBases ? solver.x : null, referenceBaseM, headM, settings.dryThicknessM);
  return {
    status,
    headM,
    ...result,
    linearIterations,
    linearSolves,
    picardIterations,
    lastHeadChangeM,
    freeCellCount,
    solverBytes: solver.bytes,
  };
}

/**
 * Fills the solver's operator, right-hand side and first guess. `headM` null: the u-system over
 * `referenceBaseM`; otherwise the H-system with the face thickness of `headM`, floored at `floorM`.
 */
function assemble(
  grid: DistrictGrid,
  solver: MultigridConjugateGradient,
  referenceBaseM: number,
  floorM: number,
  headM: Float64Array | null,
): void {
  const { columns, rows, cellM, cellKind, kMPerDay, rechargeMPerDay, baseM, fixedHeadM, fixedFaceScale } = grid;
  const { eastT, northT, diag } = solver.fine;
  const rhs = solver.rhs, x = solver.x;
  const areaM2 = cellM * cellM;
  const w = columns + 2;
  eastT.fill(0);
  northT.fill(0);
  diag.fill(0);
  rhs.fill(0);
  x.fill(0);

  // the first guess in u: the mean over fixed cells, a level water table at the lines' mean stage
  let guessU = 0;
  if (headM === null) {
    let fixedCount = 0;
    for (let g = 0; g < cellKind.length; g++) {
      if (cellKind[g] !== CELL_FIXED) continue;
      guessU += fixedValue(fixedHeadM[g], referenceBaseM);
      fixedCount++;
    }
    guessU = fixedCount > 0 ? guessU / fixedCount : 0;
  }

  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const kind = cellKind[g];
      if (kind === CELL_OUTSIDE) continue;
      const p = (row + 1) * w + col + 1;
      if (kind === CELL_FREE) {
        rhs[p] += rechargeMPerDay[g] * areaM2;
        x[p] = headM === null ? guessU : headM[g];
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
          : faceCoefficientH(kMPerDay[g], kMPerDay[gj], headM[g] - baseM[g], headM[gj] - baseM[gj], floorM);
        if (fixedFaceScale && (kind === CELL_FIXED || kindJ === CELL_FIXED)) t *= side === 0 ? fixedFaceScale.east[g] : fixedFaceScale.north[g];
        if (kind === CELL_FREE && kindJ === CELL_FREE) {
          if (side === 0) eastT[p] = t;
          else northT[p] = t;
          diag[p] += t;
          diag[pj] += t;
        } else if (kind === CELL_FREE) {
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

function readHeadsFromU(grid: DistrictGrid, u: Float64Array, referenceBaseM: number, headM: Float64Array): void {
  const { columns, rows, cellKind, fixedHeadM } = grid;
  const w = columns + 2;
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const kind = cellKind[g];
      const value = u[(row + 1) * w + col + 1];
      headM[g] = kind === CELL_OUTSIDE ? NaN : kind === CELL_FIXED ? fixedHeadM[g] : referenceBaseM + Math.sqrt(value > 0 ? value : 0);
    }
  }
}

/** Copies the free cells' heads from the solver; returns the largest change. */
function readHeads(grid: DistrictGrid, x: Float64Array, headM: Float64Array): number {
  const { columns, rows, cellKind } = grid;
  const w = columns + 2;
  let change = 0;
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      if (cellKind[g] !== CELL_FREE) continue;
      const next = x[(row + 1) * w + col + 1];
      const d = Math.abs(next - headM[g]);
      if (d > change) change = d;
      headM[g] = next;
    }
  }
  return change;
}

/**
 * Flows from the final state: from u when `u` is given (equal bases: exactly the flows the linear
 * solve balanced), else from the heads with the face thickness of those same heads.
 */
function balance(grid: DistrictGrid, u: Float64Array | null, referenceBaseM: number, headM: Float64Array, dryThicknessM: number) {
  const { columns, rows, cellM, cellKind, kMPerDay, rechargeMPerDay, baseM, fixedHeadM, fixedFaceScale } = grid;
  const areaM2 = cellM * cellM;
  const w = columns + 2;
  let fixedCount = 0;
  for (let g = 0; g < cellKind.length; g++) if (cellKind[g] === CELL_FIXED) fixedCount++;
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
      const p = (row + 1) * w + col + 1;
      const valueI = u === null ? headM[g] : kind === CELL_FIXED ? fixedValue(fixedHeadM[g], referenceBaseM) : u[p];
      const rechargeM3PerDay = rechargeMPerDay[g] * areaM2;
      totalRechargeM3PerDay += rechargeM3PerDay;
      if (rechargeM3PerDay > 0) inflow += rechargeM3PerDay;
      else outflow -= rechargeM3PerDay;
      // the four neighbours in a fixed order: west, east, previous row, next row
      let out = 0;
      for (let side = 0; side < 4; side++) {
        let gj: number, pj: number, face: number;
        if (side === 0) {
          if (col === 0) continue;
          gj = g - 1; pj = p - 1; face = gj;
        } else if (side === 1) {
          if (col + 1 === columns) continue;
          gj = g + 1; pj = p + 1; face = g;
        } else if (side === 2) {
          if (row === 0) continue;
          gj = g - columns; pj = p - w; face = gj;
        } else {
          if (row + 1 === rows) continue;
          gj = g + columns; pj = p + w; face = g;
        }
        const kindJ = cellKind[gj];
        if (kindJ === CELL_OUTSIDE) continue;
        const scale = fixedFaceScale && (kind === CELL_FIXED || kindJ === CELL_FIXED) ? (side < 2 ? fixedFaceScale.east[face] : fixedFaceScale.north[face]) : 1;
        let flow: number;
        if (u === null) {
          const t = faceCoefficientH(kMPerDay[g], kMPerDay[gj], headM[g] - baseM[g], headM[gj] - baseM[gj], dryThicknessM);
          flow = scale * t * (valueI - headM[gj]);
        } else {
          const valueJ = kindJ === CELL_FIXED ? fixedValue(fixedHeadM[gj], referenceBaseM) : u[pj];
          flow = scale * faceCoefficientU(kMPerDay[g], kMPerDay[gj]) * (valueI - valueJ);
        }
        out += flow;
        if (kind === CELL_FIXED) sideFlowM3PerDay[4 * k + side] = flow;
      }
      if (kind === CELL_FIXED) {
        const exchange = out - rechargeM3PerDay;
        fixedCells[k] = g;
        exchangeM3PerDay[k++] = exchange;
        if (exchange > 0) inflow += exchange;
        else outflow -= exchange;
      } else {
        const residual = Math.abs(rechargeM3PerDay - out);
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
  if (grid.fixedFaceScale) {
    for (const name of ['east', 'north'] as const) {
      const scale = grid.fixedFaceScale[name];
      if (scale?.length !== n) throw new Error(`Unexpected fixedFaceScale.${name} length: ${scale?.length} (columns * rows = ${n}).`);
      for (let g = 0; g < n; g++) if (!(scale[g] > 0 && Number.isFinite(scale[g]))) throw new Error(`Unexpected fixedFaceScale.${name} value: ${scale[g]} ${where(g)}.`);
    }
  }
  for (let g = 0; g < n; g++) {
    const kind = cellKind[g];
    if (kind > CELL_FIXED) throw new Error(`Unexpected cellKind value: ${kind} ${where(g)}.`);
    if (kind === CELL_OUTSIDE) continue;
    if (!(kMPerDay[g] > 0 && Number.isFinite(kMPerDay[g]))) throw new Error(`Unexpected kMPerDay value: ${kMPerDay[g]} ${where(g)}.`);
    if (!Number.isFinite(rechargeMPerDay[g])) throw new Error(`Unexpected rechargeMPerDay value: ${rechargeMPerDay[g]} ${where(g)}.`);
    if (!Number.isFinite(baseM[g])) throw new Error(`Unexpected baseM value: ${baseM[g]} ${where(g)}.`);
    if (kind === CELL_FIXED && !Number.isFinite(fixedHeadM[g])) throw new Error(`Unexpected fixedHeadM value: ${fixedHeadM[g]} ${where(g)}.`);
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
        if (kind === CELL_FIXED) meetsFixed = true;
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
