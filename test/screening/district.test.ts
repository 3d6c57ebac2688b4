// The district solve through the whole pipeline (lines and zones as GeoJSON in metres, checked,
// projected, gridded, solved, aggregated) against outside references: the Dupuit closed forms for
// two parallel lines, radial flow to a circle, drains under recharge, and for a branching district
// of our own the same district on a much finer grid.
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/shared/errors.js';
import { DEFAULT_SETTINGS } from '../../src/shared/settings.js';
import { BRANCHING_LINES, BRANCHING_ZONES } from './branching-district.js';
import { box, line, screenLocal } from './local-district.js';

const YEAR_DAYS = 365.25; // Julian year, as src/shared/units.ts [published]
const CELL = DEFAULT_SETTINGS.districtCellM;

function circle(id: string, properties: Record<string, unknown>, cx: number, cy: number, r: number, vertices = 720) {
  const points: number[][] = [];
  for (let i = 0; i <= vertices; i++) {
    const a = (2 * Math.PI * (i % vertices)) / vertices;
    points.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
  }
  return line(id, properties, points);
}

/** Index of a line's figures by id. */
function lossOf(result: ReturnType<typeof screenLocal>, id: string): number {
  const i = result.lines.findIndex((l) => l.id === id);
  expect(result.lineFigures[i].method).toBe('district');
  return result.lineFigures[i].netLossM3PerDay;
}

describe('district solve against the Dupuit closed forms', () => {
  // Two parallel, fully penetrating lines L = 400 m apart on cell centres (the grid snaps to
  // multiples of the cell; the layout's origin is a multiple of 20 m), 2000 m long, in an aquifer
  // that ends at their ends (no flow around them) and half a cell beyond each line.
  const L = 400, LENGTH = 2000, K = 10, BASE = 90, H1 = 15, H2 = 14;
  // the layout's northing origin (local-district.ts), to find a row of the grid
  const N0 = 3_265_000;
  const half = CELL / 2;
  const pair = (rechargeMmYr: number, stageA = BASE + H1, stageB = BASE + H2) =>
    screenLocal(
      [line('A', { kind: 'canal', stage_m: stageA }, [[0, half], [LENGTH, half]]), line('B', { kind: 'canal', stage_m: stageB }, [[0, half - L], [LENGTH, half - L]])],
      [box('Z', { k_m_d: K, base_m: BASE, ground_m: 120, recharge_mm_yr: rechargeMmYr }, [0, -L, LENGTH, CELL])],
    );

  // 1655.1 mm/yr puts the peak 120 m from A, on a cell centre: N = K (h1^2 - h2^2) / (2 L (L/2 - 120)) [derived]
  for (const rechargeMmYr of [0, 1655.1]) {
    it(`reproduces the loss and the peak of two parallel canals (recharge ${rechargeMmYr} mm/yr) within 1% at the default cell`, () => {
      const result = pair(rechargeMmYr);
      const N = rechargeMmYr / 1000 / YEAR_DAYS;
      // Dupuit-Forchheimer between two lines with recharge: h^2(x) = h1^2 + (h2^2 - h1^2) x / L + (N / K) x (L - x),
      // so line A loses q = K (h1^2 - h2^2) / (2L) - N L / 2 per metre (Bear (1972) section 8.2; Fetter,
      // Applied Hydrogeology [from memory]). The grid's aquifer runs half a cell past each line, whose recharge
      // drains straight to the line [derived].
      const qA = (K * (H1 ** 2 - H2 ** 2)) / (2 * L) - (N * L) / 2 - N * half;
      const qB = (K * (H2 ** 2 - H1 ** 2)) / (2 * L) - (N * L) / 2 - N * half;
      expect(lossOf(result, 'A') / (qA * LENGTH)).toBeGreaterThan(0.99);
      expect(lossOf(result, 'A') / (qA * LENGTH)).toBeLessThan(1.01);
      expect(lossOf(result, 'B') / (qB * LENGTH)).toBeGreaterThan(0.99);
      expect(lossOf(result, 'B') / (qB * LENGTH)).toBeLessThan(1.01);
      // the peak: where d(h^2)/dx = 0, or at line A without recharge [derived]
      const u = (x: number) => H1 ** 2 + ((H2 ** 2 - H1 ** 2) * x) / L + (N / K) * x * (L - x);
      const xPeak = N > 0 ? Math.min(L, Math.max(0, L / 2 + (K * (H2 ** 2 - H1 ** 2)) / (2 * N * L))) : 0;
      const peakM = BASE + Math.sqrt(u(xPeak));
      const district = result.district!;
      let gridPeak = -Infinity;
      for (let g = 0; g < district.grid.cells; g++) if (district.cellKind[g] === 1 && district.waterTableM[g] > gridPeak) gridPeak = district.waterTableM[g];
      if (N > 0) {
        // the rise of the peak above the higher stage, within 1%
        expect((gridPeak - (BASE + H1)) / (peakM - (BASE + H1))).toBeGreaterThan(0.99);
        expect((gridPeak - (BASE + H1)) / (peakM - (BASE + H1))).toBeLessThan(1.01);
      } else {
        // no recharge: the water table falls from A to B, highest next to A, one cell out
        expect(gridPeak).toBeCloseTo(BASE + Math.sqrt(u(CELL)), 6);
      }
      expect(district.balance.residualRelative).toBeLessThan(1e-6);
      // the strip between A and B: what the district solve has each line send into the strip polygon
      // is the strip's own figure, line by line, within 2% (the strip's figure is the closed form above)
      expect(result.strips.length).toBe(1);
      const strip = result.strips[0];
      const figures = strip.district!;
      expect(figures.lossAM3PerDay / strip.lossAM3PerDay).toBeGreaterThan(0.98);
      expect(figures.lossAM3PerDay / strip.lossAM3PerDay).toBeLessThan(1.02);
      expect(figures.lossBM3PerDay / strip.lossBM3PerDay).toBeGreaterThan(0.98);
      expect(figures.lossBM3PerDay / strip.lossBM3PerDay).toBeLessThan(1.02);
      expect(strip.flags).not.toContain('district-loss-differs');
    });
  }

  it('reproduces Dupuit-Thiem radial flow from a circular canal to a circular drain within 2%', () => {
    const R1 = 300, R2 = 1500, K_R = 5, HC = 20, HD = 12;
    const result = screenLocal(
      [circle('canal', { kind: 'canal', stage_m: BASE + HC }, 0, 0, R1), circle('drain', { kind: 'drain', stage_m: BASE + HD }, 0, 0, R2)],
      [box('Z', { k_m_d: K_R, base_m: BASE, ground_m: 125, recharge_mm_yr: 0 }, [-R2 - 3 * CELL, -R2 - 3 * CELL, R2 + 3 * CELL, R2 + 3 * CELL])],
    );
    // Q = pi K (h1^2 - h2^2) / ln(r2 / r1) (Dupuit-Thiem; Todd and Mays, Groundwater Hydrology, 3rd ed., section 4.2 [from memory])
    const q = (Math.PI * K_R * (HC ** 2 - HD ** 2)) / Math.log(R2 / R1);
    expect(lossOf(result, 'canal') / q).toBeGreaterThan(0.98);
    expect(lossOf(result, 'canal') / q).toBeLessThan(1.02);
    expect(-lossOf(result, 'drain') / q).toBeGreaterThan(0.98);
    expect(-lossOf(result, 'drain') / q).toBeLessThan(1.02);
  });

  it('reproduces the ellipse equation for the water table midway between drains under recharge within 2%', () => {
    const D = 10, K_D = 5, rechargeMmYr = 1000;
    const result = screenLocal(
      [line('D1', { kind: 'drain', stage_m: BASE + D }, [[0, half], [LENGTH, half]]), line('D2', { kind: 'drain', stage_m: BASE + D }, [[0, half - L], [LENGTH, half - L]])],
      [box('Z', { k_m_d: K_D, base_m: BASE, ground_m: 120, recharge_mm_yr: rechargeMmYr }, [0, -L, LENGTH, CELL])],
    );
    const N = rechargeMmYr / 1000 / YEAR_DAYS;
    // H^2 - D^2 = N L^2 / (4K), H and D above the impervious base (the ellipse equation of drain
    // spacing; Ritzema (ed.), Drainage Principles and Applications, ILRI Publication 16, 1994, chapter 21 [from memory])
    const riseM = Math.sqrt(D ** 2 + (N * L ** 2) / (4 * K_D)) - D;
    const district = result.district!;
    const { grid } = district;
    // the middle row, halfway between the drains, in the middle column
    const row = Math.floor((N0 + half - L / 2 - grid.originY) / CELL), col = Math.floor(grid.columns / 2);
    const midM = district.waterTableM[row * grid.columns + col];
    expect((midM - (BASE + D)) / riseM).toBeGreaterThan(0.98);
    expect((midM - (BASE + D)) / riseM).toBeLessThan(1.02);
    // and it is the highest water table: the divide is midway [derived]
    let highest = -Infinity;
    for (let g = 0; g < grid.cells; g++) if (district.cellKind[g] === 1) highest = Math.max(highest, district.waterTableM[g]);
    expect(highest).toBeCloseTo(midM, 9);
  });
});

describe('district solve on a branching district of our own', () => {
  // the same district at 40, 20 (the default), 10 and 5 m cells: the reference is the 5 m solve
  // extrapolated to a zero cell from 10 and 5 m, for a first-order method (Richardson extrapolation
  // [derived]); convergence is shown by the differences halving with the cell
  const cells = [40, 20, 10, 5];
  const runs = cells.map((cell) => screenLocal(BRANCHING_LINES, BRANCHING_ZONES, { districtCellM: cell }));
  const ids = runs[0].lines.map((l) => l.id);
  const losses = runs.map((run) => ids.map((id) => lossOf(run, id)));

  it('converges at about first order as the cell halves', () => {
    const change = (a: number, b: number) => losses[a].reduce((sum, loss, i) => sum + Math.abs(loss - losses[b][i]), 0);
    const order = Math.log2(change(1, 2) / change(2, 3));
    expect(order).toBeGreaterThan(0.7);
    expect(order).toBeLessThan(1.5);
    // each line's figure at twice the cell is carried with it, and is the 40 m solve's
    const at20 = runs[1];
    ids.forEach((_, i) => expect(at20.lineFigures[i].coarseDiffM3PerDay + losses[1][i]).toBeCloseTo(losses[0][i], 6));
  });

  it('gives per-line losses within 3% of the converged solution at the default cell', () => {
    expect(CELL).toBe(20);
    losses[1].forEach((loss, i) => {
      const reference = 2 * losses[3][i] - losses[2][i];
      expect(Math.abs(loss / reference - 1), ids[i]).toBeLessThan(0.03);
    });
  });

  it('closes its water balance, cell by cell and over the district, and shows where the strips alone are blind', () => {
    const result = runs[1];
    const balance = result.district!.balance;
    expect(balance.residualRelative).toBeLessThan(1e-6);
    // every free cell sends on what falls on it: 200 mm/yr on a 20 m cell is 0.219 m3/d, balanced to a millionth [derived]
    const cellRechargeM3PerDay = (0.2 / YEAR_DAYS) * CELL * CELL;
    expect(balance.largestCellResidualM3PerDay).toBeLessThan(1e-6 * cellRechargeM3PerDay);
    // the lines take in, net, what falls on the aquifer: no flow crosses its outer edge [derived]
    expect(result.totals.netM3PerDay / -result.district!.balance.rechargeM3PerDay).toBeCloseTo(1, 6);
    const figure = (id: string) => result.lineFigures[ids.indexOf(id)];
    // the 45 degree offtake faces no parallel line: the strips see none of its loss
    expect(figure('offtake-45').stripNetLossM3PerDay).toBeNaN();
    expect(figure('offtake-45').netLossM3PerDay).toBeGreaterThan(1000);
    // the square offtake's tail and junction: the strips see under a fifth of what it loses
    expect(figure('offtake-90').stripNetLossM3PerDay / figure('offtake-90').netLossM3PerDay).toBeLessThan(0.2);
    // over the canals, the strips' losses are less than half the district's
    const canals = ['main', 'offtake-90', 'offtake-45'];
    const strips = canals.reduce((sum, id) => sum + (figure(id).stripNetLossM3PerDay || 0), 0);
    const district = canals.reduce((sum, id) => sum + figure(id).netLossM3PerDay, 0);
    expect(strips / district).toBeLessThan(0.5);
    expect(result.totals.method).toBe('district');
  });
});

describe('district solve settings', () => {
  it('solves at a coarser cell when the grid would not fit the memory budget, and says so', () => {
    // 3400 x 2000 m at 20 m: 17,000 cells of 250 bytes, about 4 MB; 2 MB fits a 40 m cell
    const result = screenLocal(BRANCHING_LINES, BRANCHING_ZONES, { districtMemoryMB: 2 });
    expect(result.district!.cellM).toBe(40);
    expect(result.district!.requestedCellM).toBe(20);
    expect(result.warnings.join('\n')).toMatch(/district solve at a 40 m cell, coarser than the 20 m asked \(districtCellM\)/);
  });

  it('refuses, naming the setting and the figure, before allocating a grid that fits no budget', () => {
    // 1 cm cells over the 3400 x 2000 m district: 6.8e10 cells, and 8 cm cells still 1e9; nothing is allocated
    let error: unknown;
    try {
      screenLocal(BRANCHING_LINES, BRANCHING_ZONES, { districtCellM: 0.01 });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(UsageError);
    expect((error as UsageError).setting).toBe('districtMemoryMB');
    expect((error as Error).message).toMatch(/^districtMemoryMB: the district solve over 68\d{9} cells of 0\.01 m needs about \d+ MB, more than the budget of 2048 MB/);
  });

  it('is skipped with stripsOnly: every figure from the strips, and the run says so', () => {
    const result = screenLocal(BRANCHING_LINES, BRANCHING_ZONES, { stripsOnly: true });
    expect(result.district).toBeNull();
    expect(result.totals.method).toBe('strips');
    expect(result.lineFigures.every((figure) => figure.method === 'strips')).toBe(true);
    expect(result.strips.every((strip) => strip.district === null)).toBe(true);
    expect(result.warnings.join('\n')).toMatch(/district solve skipped \(stripsOnly\)/);
    // each figure says which share of its line's sides it covers: the solved sides only, here
    // short of the whole line for some (tails, junctions), so their figures do not compare as whole lines
    result.lineFigures.forEach((figure, i) => {
      const summary = result.lineSummaries[i];
      expect(figure.coversShare).toBeCloseTo(summary.solvedSidesM / (2 * summary.lengthM), 12);
    });
    expect(Math.min(...result.lineFigures.map((figure) => figure.coversShare))).toBeLessThan(0.9);
  });

  it('warns where a line meets another at a different stage', () => {
    const jumped = BRANCHING_LINES.map((feature) =>
      feature.properties.id === 'offtake-90' ? { ...feature, properties: { ...feature.properties, stage_start_m: 104.2 } } : feature,
    );
    const result = screenLocal(jumped, BRANCHING_ZONES);
    expect(result.warnings.join('\n')).toMatch(/1 line end meet another line at a different stage \(up to 0\.69 m, offtake-90 at main\)/);
    expect(screenLocal(BRANCHING_LINES, BRANCHING_ZONES).warnings.join('\n')).not.toMatch(/different stage/);
  });
});
