// The district solve in tiles, for runs split over N processes: tile I of N solves the district's
// grid over a window (its band of whole columns, or rows, plus a margin on either side) and keeps
// the heads of its band; districtSolve stitches the N bands and derives every figure from them.
//
// A window's cut edges are no edges of the aquifer: they are held at the heads of the whole
// district solved at twice the cell (a quarter of the cells), read bilinearly between that grid's
// cell centres. That is the solve the coarse check needs anyway, so a tile keeps its band of it and
// the stitched coarse check is exactly the whole one. Its error at the cut (6 mm on average over the
// demo, larger beside lines, where a line holds the water table anyway) dies out inward over the
// margin. The held heads are then corrected, twice: each cut cell's held head is moved by the window's
// fine head less the held (coarse) head halfway across the margin in its row (or column), and the
// window solved again. The coarse heads' error is smooth where no line holds the water table, which
// is where it did harm: on bench/district-tiles.bench.ts's 200-line district in 8 tiles a drain
// losing 97 m3/d was 17.6% off without the correction, 5.8% with one and within 2% with two, every
// line then within 2% or 5 m3/d (the worst 23 m3/d on a large line), at about 30% more time per
// window. A solve at 4 times the cell was tried first and is cheaper, but its heads lie about 2 cm
// low over the whole demo, a smooth error the margin does not wear down: one drain's loss stayed
// 2% off with margins of 500 to 2000 m, where the held heads at twice the cell give 0.2% at 1000 m
// (bench/district-tiles.bench.ts and test/screening/district-tiles.test.ts measure it). Holding the
// flow across the cut instead of the level (the face's flow under the held heads, as recharge of
// the cell inside) was tried too and was worse: beside a line the held heads' gradient is far off.
// The price: every tile solves a quarter of the whole grid besides its window, so a tile never
// takes less than about a fifth of the whole solve's time, however many tiles.
import { gridOver, zonesExtent, type Grid } from '../geometry/grid.js';
import { solveDistrict } from '../hydraulics/district-solver.js';
import type { ScreenSettings } from '../shared/settings.js';
import { bandCells, chooseCell, DISTRICT_TILE_KIND, districtSetup, tileBand, type DistrictInputs, type DistrictTilePiece, type HeldEdge, type TileBand } from './district.js';

export type { DistrictTilePiece } from './district.js';

/** Times a tile re-solves its window with the held heads corrected (see districtTilePiece). */
const EDGE_CORRECTIONS = 2;

/** Width of the margin a tile solves beyond each side of its band (m). */
export const DISTRICT_TILE_MARGIN_M = 1000;

type Arrays = DistrictTilePiece['arrays'];
type Header = DistrictTilePiece['header'];

/**
 * Solves tile `index` (1-based) of `count` of the district solve, at the cell districtSolve would
 * use, and the whole district at twice it (the held heads, and the coarse check's heads unless
 * `coarseCheck` is false). `marginM` (default DISTRICT_TILE_MARGIN_M) sets the margin. Pure: no
 * I/O. With count 1, the piece holds exactly the heads of a whole solve.
 *
 *   const pieces = [1, 2, 3].map((index) => districtTilePiece(inputs, settings, { index, count: 3 }));
 *   districtSolve(inputs, settings, { pieces });   // the district's figures, stitched
 */
export function districtTilePiece(
  inputs: DistrictInputs,
  settings: ScreenSettings,
  tile: { index: number; count: number },
  options: { coarseCheck?: boolean; marginM?: number; correctEdges?: boolean } = {},
): DistrictTilePiece {
  const marginM = options.marginM ?? DISTRICT_TILE_MARGIN_M;
  if (!(marginM >= 0 && Number.isFinite(marginM))) throw new Error(`Unexpected marginM value: ${marginM}.`);
  const extent = zonesExtent(inputs.zonePolygons);
  const { cellM } = chooseCell(extent, settings);
  const whole = gridOver(extent, cellM);
  const band = tileBand(whole, tile.index, tile.count);
  const coarseCheck = options.coarseCheck !== false;
  // the whole district at twice the cell: every tile solves the same, so its bands stitch to exactly one whole solve
  const held = tile.count > 1 || coarseCheck ? solveWhole(inputs, 2 * cellM) : null;
  const header: Header = { kind: DISTRICT_TILE_KIND, tileIndex: tile.index, tileCount: tile.count, requestedCellM: settings.districtCellM, marginM, coarseCheck };

  const length = band.axis === 'columns' ? whole.columns : whole.rows;
  // at least one cell: the outermost cell of a cut side leaves the solve or is held, never one of the band
  const marginCells = Math.max(1, Math.ceil(marginM / cellM));
  const start = Math.max(0, band.start - marginCells), end = Math.min(length, band.end + marginCells);
  const window: Grid =
    band.axis === 'columns'
      ? { originX: whole.originX + start * cellM, originY: whole.originY, columns: end - start, rows: whole.rows, cells: (end - start) * whole.rows, cellM }
      : { originX: whole.originX, originY: whole.originY + start * cellM, columns: whole.columns, rows: end - start, cells: whole.columns * (end - start), cellM };
  const edge = tile.count > 1 && held !== null ? heldEdge(window, band.axis, start > 0, end < length, held) : null;
  let solution = solveDistrict(districtSetup(inputs, window, edge).districtGrid);
  if (edge !== null && held !== null && options.correctEdges !== false) {
    // once more, with the held heads moved by what the window's own solve says the coarse heads
    // miss, read halfway across the margin (the coarse heads' error is smooth where no line holds
    // the water table, and the first solve's own edge error has died out there by half)
    let corrected = edge;
    for (let pass = 0; pass < EDGE_CORRECTIONS; pass++) {
      corrected = correctedEdge(window, band.axis, corrected, held, solution.headM, Math.max(1, Math.floor(marginCells / 2)), edge);
      solution = solveDistrict(districtSetup(inputs, window, corrected).districtGrid);
    }
  }
  const arrays: Arrays = {};
  keepBand('fine', whole, band, window, { axis: band.axis, start: band.start - start, end: band.end - start }, solution, header, arrays);
  Object.assign(header, { marginCells, windowStart: start, windowEnd: end, windowCells: window.cells, heldCellM: tile.count > 1 ? 2 * cellM : null });
  if (held !== null) {
    const coarseBand = tileBand(held.grid, tile.index, tile.count);
    if (coarseCheck) keepBand('coarse', held.grid, coarseBand, held.grid, coarseBand, held, header, arrays);
    header.heldStatus = held.status;
  }
  return { header, arrays };
}

interface HeldHeads {
  grid: Grid;
  headM: Float64Array;
  squaredThicknessM2: Float64Array | null;
  status: string;
  linearIterations: number;
  picardIterations: number;
  bedIterations: number;
}

function solveWhole(inputs: DistrictInputs, cellM: number): HeldHeads {
  const setup = districtSetup(inputs, gridOver(zonesExtent(inputs.zonePolygons), cellM));
  return { grid: setup.grid, ...solveDistrict(setup.districtGrid) };
}

/**
 * The held head at (x, y): bilinear between the four nearest cell centres of the held grid, over
 * those in the aquifer; else the nearest such centre within two cells; else NaN (the cell is then
 * left free, and out of the solve if nothing else reaches it).
 */
function heldHeadAt(held: HeldHeads, x: number, y: number): number {
  const { grid, headM } = held;
  const fx = (x - grid.originX) / grid.cellM - 0.5, fy = (y - grid.originY) / grid.cellM - 0.5;
  const c0 = Math.floor(fx), r0 = Math.floor(fy), tx = fx - c0, ty = fy - r0;
  let sum = 0, weight = 0;
  for (let dr = 0; dr < 2; dr++) {
    const r = r0 + dr;
    if (r < 0 || r >= grid.rows) continue;
    for (let dc = 0; dc < 2; dc++) {
      const c = c0 + dc;
      if (c < 0 || c >= grid.columns) continue;
      const h = headM[r * grid.columns + c];
      if (Number.isNaN(h)) continue;
      const w = (dc === 1 ? tx : 1 - tx) * (dr === 1 ? ty : 1 - ty);
      sum += w * h;
      weight += w;
    }
  }
  if (weight > 0) return sum / weight;
  let nearest = NaN, best = Infinity;
  for (let r = r0 - 2; r <= r0 + 3; r++) {
    if (r < 0 || r >= grid.rows) continue;
    for (let c = c0 - 2; c <= c0 + 3; c++) {
      if (c < 0 || c >= grid.columns) continue;
      const h = headM[r * grid.columns + c];
      const d = Math.hypot(c - fx, r - fy);
      if (!Number.isNaN(h) && d < best) { best = d; nearest = h; }
    }
  }
  return nearest;
}

/**
 * Writes the heads of `band` of grid `whole` (and u, when solved in u) into `arrays`, from a
 * solution over `solved` (the whole grid, or a window of it, where the band is `inBand`), and the
 * grid, band and run into `header`, under names prefixed for the coarse grid.
 */
function keepBand(
  which: 'fine' | 'coarse',
  whole: Grid,
  band: TileBand,
  solved: Grid,
  inBand: TileBand,
  solution: Omit<HeldHeads, 'grid'>,
  header: Header,
  arrays: Arrays,
): void {
  const cells = bandCells(solved, inBand);
  const key = (name: string) => (which === 'fine' ? name : `coarse${name[0].toUpperCase()}${name.slice(1)}`);
  const headM = new Float64Array(cells.count);
  for (let k = 0; k < cells.count; k++) headM[k] = solution.headM[cells.cell(k)];
  arrays[key('headM')] = headM;
  if (solution.squaredThicknessM2 !== null) {
    const u = new Float64Array(cells.count);
    for (let k = 0; k < cells.count; k++) u[k] = solution.squaredThicknessM2[cells.cell(k)];
    arrays[key('squaredThicknessM2')] = u;
  }
  Object.assign(header, {
    [key('cellM')]: whole.cellM,
    [key('originXM')]: whole.originX,
    [key('originYM')]: whole.originY,
    [key('columns')]: whole.columns,
    [key('rows')]: whole.rows,
    [key('bandAxis')]: band.axis,
    [key('bandStart')]: band.start,
    [key('bandEnd')]: band.end,
    [key('status')]: solution.status,
    [key('linearIterations')]: solution.linearIterations,
    [key('picardIterations')]: solution.picardIterations,
    [key('bedIterations')]: solution.bedIterations,
  });
}

/** The cells of the window's cut edges (the first and last column, or row, where cut) and their held heads; null when none is cut. */
function heldEdge(window: Grid, axis: TileBand['axis'], cutBefore: boolean, cutAfter: boolean, held: HeldHeads): HeldEdge | null {
  const { columns, rows, originX, originY, cellM } = window;
  const across = axis === 'columns' ? rows : columns;
  const lines = [...(cutBefore ? [0] : []), ...(cutAfter ? [(axis === 'columns' ? columns : rows) - 1] : [])];
  if (lines.length === 0) return null;
  const cells = new Uint32Array(lines.length * across);
  let n = 0;
  for (const at of lines) for (let k = 0; k < across; k++) cells[n++] = axis === 'columns' ? k * columns + at : at * columns + k;
  cells.sort();
  const headM = new Float64Array(cells.length);
  for (let k = 0; k < cells.length; k++) {
    const g = cells[k];
    headM[k] = heldHeadAt(held, originX + ((g % columns) + 0.5) * cellM, originY + (Math.floor(g / columns) + 0.5) * cellM);
  }
  return { cells, headM };
}

/** The held edge moved by the window's fine heads less the held (coarse) heads, `inward` cells in from each cut. */
function correctedEdge(window: Grid, axis: TileBand['axis'], edge: HeldEdge, held: HeldHeads, fineM: Float64Array, inward: number, first: HeldEdge): HeldEdge {
  const { columns, rows, originX, originY, cellM } = window;
  // the shift is taken from the coarse heads each pass, not added onto the last pass's
  const headM = first.headM.slice();
  for (let k = 0; k < edge.cells.length; k++) {
    const g = edge.cells[k];
    const c = g % columns, r = Math.floor(g / columns);
    let ic = c, ir = r;
    if (axis === 'columns') ic = c === 0 ? Math.min(columns - 1, inward) : Math.max(0, c - inward);
    else ir = r === 0 ? Math.min(rows - 1, inward) : Math.max(0, r - inward);
    const fine = fineM[ir * columns + ic];
    const coarse = heldHeadAt(held, originX + (ic + 0.5) * cellM, originY + (ir + 0.5) * cellM);
    const shift = fine - coarse;
    if (Number.isFinite(shift) && Number.isFinite(headM[k])) headM[k] += shift;
  }
  return { cells: edge.cells, headM };
}
