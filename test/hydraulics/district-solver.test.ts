// The district solve against closed forms of Dupuit-Forchheimer flow, an exact zones-in-series
// solution, a grid-convergence reference, and its own water balance recomputed here from the heads.
//
// Lines sit on cell centres: a fixed cell's centre is where the line is, so a strip between two
// fixed columns is (columns apart) * cellM long. A fixed cell's outer half lies beyond the strip,
// and its recharge, N cellM / 2 per metre of line, joins the line from outside the strip [derived].
import { describe, expect, it } from 'vitest';
import {
  CELL_FIXED,
  CELL_FREE,
  CELL_OUTSIDE,
  solveDistrict,
  type DistrictGrid,
  emptyDistrictGrid,
  type DistrictSolution,
} from '../../src/hydraulics/district-solver.js';
import { seededRandom } from '../../bench/network.js';

const emptyGrid = emptyDistrictGrid;

interface StripSpec {
  lengthM: number;
  cellM: number;
  rows: number;
  stageLeftM: number;
  stageRightM: number;
  rechargeMPerDay: number;
  /** K and base at distance x from the left line. */
  kAt: (xM: number) => number;
  baseAt?: (xM: number) => number;
}

/** A strip between two lines burned into the first and last columns. */
function stripGrid(s: StripSpec): DistrictGrid {
  const columns = Math.round(s.lengthM / s.cellM) + 1;
  const grid = emptyGrid(columns, s.rows, s.cellM);
  for (let row = 0; row < s.rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const x = col * s.cellM;
      grid.cellKind[g] = col === 0 || col === columns - 1 ? CELL_FIXED : CELL_FREE;
      grid.fixedHeadM[g] = col === 0 ? s.stageLeftM : s.stageRightM;
      grid.kMPerDay[g] = s.kAt(x);
      grid.rechargeMPerDay[g] = s.rechargeMPerDay;
      grid.baseM[g] = s.baseAt ? s.baseAt(x) : 0;
    }
  }
  return grid;
}

/** Loss per metre of the line in `column` (m^2/d), summed over the strip's rows. */
function lossPerMetre(grid: DistrictGrid, solution: DistrictSolution, column: number): number {
  let sum = 0, rows = 0;
  solution.fixedCells.forEach((g, k) => {
    if (g % grid.columns === column) {
      sum += solution.exchangeM3PerDay[k];
      rows++;
    }
  });
  return sum / (rows * grid.cellM);
}

function expectRelative(got: number, want: number, tol: number, what: string): void {
  expect(Number.isFinite(got), `${what}: got ${got}`).toBe(true);
  const rel = Math.abs(got - want) / Math.abs(want);
  expect(rel, `${what}: got ${got}, want ${want} (relative tolerance ${tol})`).toBeLessThanOrEqual(tol);
}

function expectConverged(solution: DistrictSolution): void {
  expect(solution.status).toBe('converged');
  expect(solution.balanceRelative).toBeLessThanOrEqual(1e-6);
}

describe('two parallel fully penetrating canals', () => {
  // Dupuit-Forchheimer between two lines at x = 0 and x = L on a horizontal base (C.W. Fetter,
  // Applied Hydrogeology, 4th ed. 2001, the section on the Dupuit assumptions; J. Bear (1972),
  // Dynamics of Fluids in Porous Media, chapter 8) [from memory]:
  //   h(x)^2 = h0^2 - (h0^2 - hL^2) x / L + (N / K) x (L - x)
  //   q(x)   = K (h0^2 - hL^2) / (2L) - N (L/2 - x)                       (flow towards +x)
  const K = 5, h0 = 20, hL = 18, L = 1000, cellM = 10, rows = 3;

  it('without recharge: q = K (h0^2 - hL^2) / (2L), the same at both lines', () => {
    const grid = stripGrid({ lengthM: L, cellM, rows, stageLeftM: h0, stageRightM: hL, rechargeMPerDay: 0, kAt: () => K });
    const solution = solveDistrict(grid);
    expectConverged(solution);
    const q = (K * (h0 * h0 - hL * hL)) / (2 * L);
    expectRelative(lossPerMetre(grid, solution, 0), q, 0.01, 'loss of the left canal (m^2/d)');
    expectRelative(-lossPerMetre(grid, solution, grid.columns - 1), q, 0.01, 'gain of the right canal (m^2/d)');
    const mid = (grid.columns - 1) / 2;
    expectRelative(solution.headM[mid], Math.sqrt((h0 * h0 + hL * hL) / 2), 0.001, 'head half way (m)');
  });

  it('with recharge: both losses and the peak within 1%', () => {
    const N = 1e-3;
    const grid = stripGrid({ lengthM: L, cellM, rows, stageLeftM: h0, stageRightM: hL, rechargeMPerDay: N, kAt: () => K });
    const solution = solveDistrict(grid);
    expectConverged(solution);
    const q0 = (K * (h0 * h0 - hL * hL)) / (2 * L) - (N * L) / 2;
    const qL = (K * (h0 * h0 - hL * hL)) / (2 * L) + (N * L) / 2;
    const outerHalf = (N * cellM) / 2;
    expect(q0).toBeLessThan(0); // both canals gain: a divide lies between them
    expectRelative(lossPerMetre(grid, solution, 0) + outerHalf, q0, 0.01, 'loss of the left canal (m^2/d)');
    expectRelative(lossPerMetre(grid, solution, grid.columns - 1) + outerHalf, -qL, 0.01, 'loss of the right canal (m^2/d)');

    // the peak where q = 0: x* = L/2 - K (h0^2 - hL^2) / (2 N L) [derived]
    const xPeak = L / 2 - (K * (h0 * h0 - hL * hL)) / (2 * N * L);
    const hPeak = Math.sqrt(h0 * h0 - ((h0 * h0 - hL * hL) * xPeak) / L + (N / K) * xPeak * (L - xPeak));
    let best = -Infinity, bestColumn = -1;
    for (let col = 0; col < grid.columns; col++) {
      if (solution.headM[grid.columns + col] > best) {
        best = solution.headM[grid.columns + col];
        bestColumn = col;
      }
    }
    expectRelative(best, hPeak, 0.01, 'peak water table (m)');
    expect(Math.abs(bestColumn * cellM - xPeak)).toBeLessThanOrEqual(cellM);
    // every cell centre against the closed form
    for (let col = 0; col < grid.columns; col++) {
      const x = col * cellM;
      const want = Math.sqrt(h0 * h0 - ((h0 * h0 - hL * hL) * x) / L + (N / K) * x * (L - x));
      expectRelative(solution.headM[2 * grid.columns + col], want, 1e-6, `head at x = ${x} m`);
    }
  });
});

describe('radial flow between two circular lines (Dupuit-Thiem)', () => {
  // Q = pi K (h1^2 - h2^2) / ln(r2 / r1), h1 at r1 and h2 at r2 (Fetter 2001, the chapter on flow
  // to wells; Bear 1972, chapter 8) [from memory]. The circles are staircases of cells: a cell is
  // fixed at h1 when its centre lies within r1 and at h2 when it lies at or beyond r2 (one ring of
  // cells). The staircase's error shrinks with the cell (2.1%, 1.4%, 0.8% at 10, 5, 2.5 m when
  // written), so the test refines the grid rather than correcting the radius.
  const K = 10, h1 = 20, h2 = 15, r1 = 50, r2 = 500;
  const thiem = (Math.PI * K * (h1 * h1 - h2 * h2)) / Math.log(r2 / r1);

  function radialLoss(cellM: number): { lossM3PerDay: number; solution: DistrictSolution } {
    const half = Math.ceil((r2 + 2 * cellM) / cellM);
    const columns = 2 * half + 1;
    const grid = emptyGrid(columns, columns, cellM);
    for (let row = 0; row < columns; row++) {
      for (let col = 0; col < columns; col++) {
        const g = row * columns + col;
        const r = Math.hypot(col - half, row - half) * cellM;
        grid.kMPerDay[g] = K;
        if (r <= r1) {
          grid.cellKind[g] = CELL_FIXED;
          grid.fixedHeadM[g] = h1;
        } else if (r < r2) grid.cellKind[g] = CELL_FREE;
        else if (r < r2 + 1.5 * cellM) {
          grid.cellKind[g] = CELL_FIXED;
          grid.fixedHeadM[g] = h2;
        } else grid.cellKind[g] = CELL_OUTSIDE;
      }
    }
    const solution = solveDistrict(grid);
    let lossM3PerDay = 0;
    solution.fixedCells.forEach((g, k) => {
      if (grid.fixedHeadM[g] === h1) lossM3PerDay += solution.exchangeM3PerDay[k];
    });
    return { lossM3PerDay, solution };
  }

  it('the inner line loses Q within 2% as the cell shrinks', () => {
    const errors: number[] = [];
    for (const cellM of [10, 5, 2.5]) {
      const { lossM3PerDay, solution } = radialLoss(cellM);
      expectConverged(solution);
      errors.push(Math.abs(lossM3PerDay - thiem) / thiem);
    }
    expect(errors[2], `relative errors ${errors.join(', ')}`).toBeLessThanOrEqual(0.02);
    expect(errors[2], `relative errors ${errors.join(', ')}`).toBeLessThan(errors[0]);
  });
});

describe('parallel drains with uniform recharge (ellipse equation)', () => {
  // Drains on an impermeable base, spacing L, water in the drains D above the base, recharge N:
  // the height midway H satisfies H^2 - D^2 = N L^2 / (4K) (the Donnan / ellipse equation; H.P.
  // Ritzema (ed.), Drainage Principles and Applications, ILRI Publication 16, 2nd ed. 1994, the
  // chapter on subsurface flow to drains) [from memory]. Each drain takes N L / 2 per metre from
  // each side (mass balance of the half spacing [derived]).
  it('mid-spacing height within 2% and each drain takes N L / 2', () => {
    const K = 1, D = 2, L = 200, N = 5e-3, cellM = 2;
    const grid = stripGrid({ lengthM: L, cellM, rows: 3, stageLeftM: D, stageRightM: D, rechargeMPerDay: N, kAt: () => K });
    const solution = solveDistrict(grid);
    expectConverged(solution);
    const H = Math.sqrt(D * D + (N * L * L) / (4 * K));
    expectRelative(solution.headM[grid.columns + (grid.columns - 1) / 2], H, 0.02, 'height midway (m)');
    const outerHalf = (N * cellM) / 2;
    expectRelative(lossPerMetre(grid, solution, 0) + outerHalf, (-N * L) / 2, 0.02, 'gain of the left drain per metre');
    expectRelative(lossPerMetre(grid, solution, grid.columns - 1) + outerHalf, (-N * L) / 2, 0.02, 'gain of the right drain per metre');
  });
});

/**
 * The exact 1D solution of zones in series between u(0) = h0^2 and u(L) = hL^2: in each zone
 * u'' = -2N/K, with u and the flow -(K/2) u' continuous at the zone edges [derived]. Returns u(x).
 */
function zonesInSeries(edgesM: number[], kMPerDay: number[], N: number, h0: number, hL: number): (x: number) => number {
  const zones = kMPerDay.length;
  const l = kMPerDay.map((_, j) => edgesM[j + 1] - edgesM[j]);
  const c = kMPerDay.map((k, j) => k / (2 * l[j]));
  // u at every edge: ends given; interior edge e: (c_{e-1} + c_e) U_e - c_{e-1} U_{e-1} - c_e U_{e+1} = N (l_{e-1} + l_e) / 2
  const U = new Array<number>(zones + 1).fill(0);
  U[0] = h0 * h0;
  U[zones] = hL * hL;
  const m = zones - 1;
  const diag = new Array<number>(m), rhs = new Array<number>(m);
  for (let e = 1; e <= m; e++) {
    diag[e - 1] = c[e - 1] + c[e];
    rhs[e - 1] = (N * (l[e - 1] + l[e])) / 2 + (e === 1 ? c[0] * U[0] : 0) + (e === m ? c[m] * U[zones] : 0);
  }
  // Thomas algorithm on the symmetric tridiagonal system with off-diagonals -c_e
  for (let e = 1; e < m; e++) {
    const f = -c[e] / diag[e - 1];
    diag[e] -= f * -c[e];
    rhs[e] -= f * rhs[e - 1];
  }
  for (let e = m; e >= 1; e--) U[e] = (rhs[e - 1] + (e < m ? c[e] * U[e + 1] : 0)) / diag[e - 1];
  return (x: number) => {
    let j = 0;
    while (j < zones - 1 && x > edgesM[j + 1]) j++;
    const t = x - edgesM[j];
    return U[j] + ((U[j + 1] - U[j]) * t) / l[j] + (N / kMPerDay[j]) * t * (l[j] - t);
  };
}

describe('zones in series', () => {
  it('K jumps of 100x and 25x along the flow match the exact 1D solution in u', () => {
    // zone edges on cell faces ((k + 1/2) cellM), so each cell lies in one zone
    const cellM = 5, L = 1000, h0 = 20, hL = 16, N = 8e-4;
    const edgesM = [0, 302.5, 502.5, L];
    const kMPerDay = [20, 0.2, 5];
    const zoneAt = (x: number) => (x < edgesM[1] ? 0 : x < edgesM[2] ? 1 : 2);
    const grid = stripGrid({ lengthM: L, cellM, rows: 2, stageLeftM: h0, stageRightM: hL, rechargeMPerDay: N, kAt: (x) => kMPerDay[zoneAt(x)] });
    const solution = solveDistrict(grid);
    expectConverged(solution);
    const u = zonesInSeries(edgesM, kMPerDay, N, h0, hL);
    for (let col = 0; col < grid.columns; col++) {
      const x = col * cellM;
      expectRelative(solution.headM[col], Math.sqrt(u(x)), 1e-3, `head at x = ${x} m`);
    }
    // q(0) = -(K/2) u'(0), by a central difference of the exact u [derived]
    const dx = 1e-3;
    const q0 = (-kMPerDay[0] / 2) * ((u(dx) - u(0)) / dx) - (N * dx) / 2;
    const qL = (-kMPerDay[2] / 2) * ((u(L) - u(L - dx)) / dx) + (N * dx) / 2;
    const outerHalf = (N * cellM) / 2;
    expectRelative(lossPerMetre(grid, solution, 0) + outerHalf, q0, 0.01, 'loss of the left line per metre');
    expectRelative(lossPerMetre(grid, solution, grid.columns - 1) + outerHalf, -qL, 0.01, 'loss of the right line per metre');
  });
});

describe('different bases (Picard on the face thickness)', () => {
  // A 1D column whose base steps up 6 m at x = 400 m: no closed form, so the figure (the left
  // line's loss per metre, its outer half's recharge added back) is converged by halving the cell.
  const L = 1000, K = 5, N = 5e-4;
  const figure = (cellM: number) => {
    const grid = stripGrid({
      lengthM: L, cellM, rows: 1, stageLeftM: 22, stageRightM: 20, rechargeMPerDay: N,
      kAt: () => K, baseAt: (x) => (x < 400 ? 0 : 6),
    });
    const solution = solveDistrict(grid);
    expectConverged(solution);
    expect(solution.picardIterations).toBeGreaterThan(0);
    return lossPerMetre(grid, solution, 0) + (N * cellM) / 2;
  };

  it('converges, and halving the cell converges the loss at order 1 to 2', () => {
    const cells = [20, 10, 5, 2.5, 1.25, 0.625];
    const values = cells.map(figure);
    const changes = values.slice(1).map((v, k) => Math.abs(v - values[k]));
    const orders = changes.slice(1).map((d, k) => Math.log2(changes[k] / d));
    const report = `losses ${values.join(', ')}; orders ${orders.join(', ')}`;
    expect(changes[changes.length - 1] / Math.abs(values[values.length - 1]), report).toBeLessThan(1e-3);
    const lastOrder = orders[orders.length - 1];
    expect(lastOrder, report).toBeGreaterThan(0.7);
    expect(lastOrder, report).toBeLessThan(2.5);
  });
});

/** A seeded 2D district: an irregular outline with holes, K zones, mixed recharge, uneven base. */
function maskedDistrict(columns: number, rows: number, seed: number, unevenBase: boolean): DistrictGrid {
  const rnd = seededRandom(seed);
  const grid = emptyGrid(columns, rows, 25);
  const holes = Array.from({ length: 4 }, () => ({ x: 0.25 + 0.5 * rnd(), y: 0.25 + 0.5 * rnd(), r: 0.03 + 0.04 * rnd() }));
  const zoneK = [0.5, 50, 5, 1, 20];
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      const x = (col + 0.5) / columns, y = (row + 0.5) / rows;
      // an L-shaped outline: the upper-right quarter is outside
      const inside = !(x > 0.55 && y > 0.55) && !holes.some((h) => Math.hypot(x - h.x, y - h.y) < h.r);
      if (!inside) continue;
      grid.cellKind[g] = CELL_FREE;
      grid.kMPerDay[g] = zoneK[(Math.floor(x * 3) + 2 * Math.floor(y * 3)) % zoneK.length];
      grid.rechargeMPerDay[g] = x < 0.3 ? -2e-4 : 6e-4;
      grid.baseM[g] = unevenBase ? 3 * x - 2 * y + (y > 0.7 ? 1.5 : 0) : 0;
      // a canal along one row and a drain up one column
      if (row === Math.floor(rows * 0.3)) {
        grid.cellKind[g] = CELL_FIXED;
        grid.fixedHeadM[g] = 24 - 2 * x;
      } else if (col === Math.floor(columns * 0.8)) {
        grid.cellKind[g] = CELL_FIXED;
        grid.fixedHeadM[g] = 17;
      }
    }
  }
  return grid;
}

/**
 * Outflow of every active cell recomputed here from the heads: K_face hbar (H_i - H_j) with the
 * harmonic mean K and the mean saturated thickness [derived].
 */
function recomputeOutflows(grid: DistrictGrid, headM: Float64Array): { out: Float64Array; gross: Float64Array } {
  const { columns, rows, cellKind, kMPerDay, baseM } = grid;
  const out = new Float64Array(columns * rows), gross = new Float64Array(columns * rows);
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < columns; col++) {
      const g = row * columns + col;
      if (cellKind[g] === CELL_OUTSIDE) continue;
      for (const [dc, dr] of [[1, 0], [0, 1]]) {
        if (col + dc >= columns || row + dr >= rows) continue;
        const j = g + dc + dr * columns;
        if (cellKind[j] === CELL_OUTSIDE) continue;
        const kFace = (2 * kMPerDay[g] * kMPerDay[j]) / (kMPerDay[g] + kMPerDay[j]);
        const hbar = (headM[g] - baseM[g] + headM[j] - baseM[j]) / 2;
        const q = kFace * hbar * (headM[g] - headM[j]);
        out[g] += q;
        out[j] -= q;
        gross[g] += Math.abs(q);
        gross[j] += Math.abs(q);
      }
    }
  }
  return { out, gross };
}

describe('water balance', () => {
  for (const unevenBase of [false, true]) {
    it(`per cell and over the grid to 1e-6, recomputed from the heads (${unevenBase ? 'uneven' : 'equal'} bases)`, () => {
      const grid = maskedDistrict(150, 120, 7, unevenBase);
      const solution = solveDistrict(grid);
      expectConverged(solution);
      expect(solution.dryCellCount).toBe(0);
      expect(solution.picardIterations > 0).toBe(unevenBase);
      const areaM2 = grid.cellM * grid.cellM;
      const { out, gross } = recomputeOutflows(grid, solution.headM);
      let worst = 0, recharge = 0;
      for (let g = 0; g < out.length; g++) {
        if (grid.cellKind[g] === CELL_OUTSIDE) {
          expect(Number.isNaN(solution.headM[g])).toBe(true);
          continue;
        }
        const n = grid.rechargeMPerDay[g] * areaM2;
        recharge += n;
        if (grid.cellKind[g] === CELL_FREE) worst = Math.max(worst, Math.abs(n - out[g]) / (gross[g] + Math.abs(n)));
      }
      expect(worst, 'largest relative residual of a free cell').toBeLessThanOrEqual(1e-6);
      // the solver's exchanges are the fixed cells' outflows less their own recharge
      let sum = 0, scale = 0;
      solution.fixedCells.forEach((g, k) => {
        const want = out[g] - grid.rechargeMPerDay[g] * areaM2;
        expect(Math.abs(solution.exchangeM3PerDay[k] - want)).toBeLessThanOrEqual(1e-6 * (gross[g] + 1e-12));
        sum += solution.exchangeM3PerDay[k];
        scale += Math.abs(solution.exchangeM3PerDay[k]);
      });
      expect(Math.abs(recharge - solution.totalRechargeM3PerDay)).toBeLessThanOrEqual(1e-9 * scale);
      expect(Math.abs(sum + recharge) / scale).toBeLessThanOrEqual(1e-6);
    });
  }

  it('reruns are byte-identical', () => {
    const grid = maskedDistrict(130, 110, 3, true);
    const a = solveDistrict(grid), b = solveDistrict(grid);
    expect(Buffer.from(a.headM.buffer).equals(Buffer.from(b.headM.buffer))).toBe(true);
    expect(Buffer.from(a.exchangeM3PerDay.buffer).equals(Buffer.from(b.exchangeM3PerDay.buffer))).toBe(true);
    expect([a.linearIterations, a.picardIterations, a.balanceResidualM3PerDay]).toEqual([b.linearIterations, b.picardIterations, b.balanceResidualM3PerDay]);
  });
});

describe('masked domains', () => {
  it('an L-shaped district with holes gives the same water table when the grid is turned a quarter', () => {
    const grid = maskedDistrict(90, 70, 11, true);
    // cell (col, row) of the turned grid is cell (row, columns - 1 - col) of the original
    const turned = emptyGrid(grid.rows, grid.columns, grid.cellM);
    for (let row = 0; row < turned.rows; row++) {
      for (let col = 0; col < turned.columns; col++) {
        const g = col * grid.columns + (grid.columns - 1 - row);
        const t = row * turned.columns + col;
        turned.cellKind[t] = grid.cellKind[g];
        turned.kMPerDay[t] = grid.kMPerDay[g];
        turned.rechargeMPerDay[t] = grid.rechargeMPerDay[g];
        turned.baseM[t] = grid.baseM[g];
        turned.fixedHeadM[t] = grid.fixedHeadM[g];
      }
    }
    const a = solveDistrict(grid), b = solveDistrict(turned);
    expectConverged(a);
    expectConverged(b);
    let largest = 0, holes = 0;
    for (let row = 0; row < turned.rows; row++) {
      for (let col = 0; col < turned.columns; col++) {
        const g = col * grid.columns + (grid.columns - 1 - row);
        const t = row * turned.columns + col;
        if (grid.cellKind[g] === CELL_OUTSIDE) {
          expect(Number.isNaN(b.headM[t])).toBe(true);
          holes++;
        } else largest = Math.max(largest, Math.abs(a.headM[g] - b.headM[t]));
      }
    }
    expect(holes).toBeGreaterThan(0);
    expect(largest, 'largest difference in head (m)').toBeLessThanOrEqual(1e-5);
    expect(Math.abs(a.totalRechargeM3PerDay - b.totalRechargeM3PerDay)).toBeLessThanOrEqual(1e-9 * Math.abs(a.totalRechargeM3PerDay));
  });

  it('outside cells around a strip carry no water: the strip still matches its closed form', () => {
    // the strip of the canal test, with ragged outside cells above and below it and a hole
    // separated from the strip by outside cells (no flow may cross an outside cell)
    const K = 5, h0 = 20, hL = 18, L = 1000, cellM = 10, N = 1e-3;
    const columns = L / cellM + 1, rows = 7;
    const grid = emptyGrid(columns, rows, cellM);
    for (let row = 0; row < rows; row++) {
      for (let col = 0; col < columns; col++) {
        const g = row * columns + col;
        grid.kMPerDay[g] = K;
        grid.rechargeMPerDay[g] = N;
        if (row === 3) {
          grid.cellKind[g] = col === 0 || col === columns - 1 ? CELL_FIXED : CELL_FREE;
          grid.fixedHeadM[g] = col === 0 ? h0 : hL;
        } else if (row === 5 && col > 10 && col < 30) {
          // an island joined to a fixed cell of its own, far lower than the strip
          grid.cellKind[g] = col === 11 ? CELL_FIXED : CELL_FREE;
          grid.fixedHeadM[g] = 2;
        }
      }
    }
    const solution = solveDistrict(grid);
    expectConverged(solution);
    for (let col = 0; col < columns; col++) {
      const x = col * cellM;
      const want = Math.sqrt(h0 * h0 - ((h0 * h0 - hL * hL) * x) / L + (N / K) * x * (L - x));
      expectRelative(solution.headM[3 * columns + col], want, 1e-6, `head at x = ${x} m`);
    }
  });

  it('a group of free cells touching no fixed cell is refused, naming a cell', () => {
    const grid = stripGrid({ lengthM: 100, cellM: 10, rows: 5, stageLeftM: 10, stageRightM: 10, rechargeMPerDay: 0, kAt: () => 1 });
    // wall off columns 4-6 of every row: the cells between the walls touch no line
    for (let row = 0; row < 5; row++) {
      grid.cellKind[row * grid.columns + 3] = CELL_OUTSIDE;
      grid.cellKind[row * grid.columns + 7] = CELL_OUTSIDE;
    }
    expect(() => solveDistrict(grid)).toThrow(/15 free cell\(s\) connected to cell 4 \(row 0, column 4\).*no unique solution/);
  });

  it('malformed inputs are refused with the bad value', () => {
    const good = () => stripGrid({ lengthM: 100, cellM: 10, rows: 2, stageLeftM: 10, stageRightM: 9, rechargeMPerDay: 0, kAt: () => 1 });
    expect(() => solveDistrict({ ...good(), cellM: 0 })).toThrow('Unexpected cellM value: 0.');
    expect(() => solveDistrict({ ...good(), baseM: new Float64Array(3) })).toThrow('Unexpected baseM length: 3 (columns * rows = 22).');
    const badK = good();
    badK.kMPerDay[5] = -2;
    expect(() => solveDistrict(badK)).toThrow('Unexpected kMPerDay value: -2 at cell 5 (row 0, column 5).');
    const badKind = good();
    badKind.cellKind[12] = 7;
    expect(() => solveDistrict(badKind)).toThrow('Unexpected cellKind value: 7 at cell 12 (row 1, column 1).');
  });
});

describe('drying and hard contrasts', () => {
  it('strong abstraction dries cells: they are counted, the solve still returns', () => {
    // equal bases: u = h^2 = h0^2 + (N / K) x (L - x) is exact on the grid (the canal test), so
    // the dry cells are those where that u falls to the dry thickness squared [derived]
    const L = 1000, cellM = 10, h0 = 3, N = -1e-4, K = 1, dryThicknessM = 1e-3;
    let expected = 0;
    for (let col = 1; col < L / cellM; col++) {
      const x = col * cellM;
      if (h0 * h0 + (N / K) * x * (L - x) <= dryThicknessM * dryThicknessM) expected++;
    }
    expect(expected).toBeGreaterThan(10);
    for (const unevenBase of [false, true]) {
      const grid = stripGrid({
        lengthM: L, cellM, rows: 2, stageLeftM: h0, stageRightM: h0, rechargeMPerDay: N,
        kAt: () => K, baseAt: unevenBase ? (x) => 0.2 * Math.sin(x / 300) : undefined,
      });
      const solution = solveDistrict(grid, { dryThicknessM });
      const what = `${unevenBase ? 'uneven' : 'equal'} bases`;
      if (unevenBase) expect(solution.dryCellCount, what).toBeGreaterThan(0);
      else expect(solution.dryCellCount, what).toBe(2 * expected);
      expect(['converged', 'picard-not-converged']).toContain(solution.status);
      for (const h of solution.headM) expect(Number.isFinite(h)).toBe(true);
    }
  });

  it('K blocks of 1 and 100 m/d converge in a bounded number of iterations as the grid grows', () => {
    const iterations: number[] = [];
    for (const n of [128, 512]) {
      const grid = emptyGrid(n, n, 10);
      for (let row = 0; row < n; row++) {
        for (let col = 0; col < n; col++) {
          const g = row * n + col;
          const block = (Math.floor((col * 8) / n) + Math.floor((row * 8) / n)) & 1;
          grid.kMPerDay[g] = block ? 100 : 1;
          grid.rechargeMPerDay[g] = 5e-4;
          const edge = col === 0 || col === n - 1;
          grid.cellKind[g] = edge ? CELL_FIXED : CELL_FREE;
          grid.fixedHeadM[g] = col === 0 ? 30 : 25;
        }
      }
      const solution = solveDistrict(grid);
      expectConverged(solution);
      iterations.push(solution.linearIterations);
    }
    expect(iterations[1], `iterations ${iterations.join(', ')}`).toBeLessThanOrEqual(40);
    expect(iterations[1], `iterations ${iterations.join(', ')}`).toBeLessThanOrEqual(iterations[0] + 12);
  });
});
