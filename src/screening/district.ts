// The district solve joined to a screening: zones and lines (already in metres) to a grid, the 2D
// steady Dupuit-Forchheimer solve over it, and back to figures a planner reads: each line's net
// loss (both sides, ends and junctions), the water balance, the water-table and depth rasters, the
// area in each risk class, and the district's figures inside every strip. The same solve at twice
// the cell gives each line's numerical uncertainty. Geometry and hydraulics meet only here.
import { burnLines, type BurnedLines } from '../geometry/grid-burn.js';
import { fillZones, polygonCells } from '../geometry/grid-fill.js';
import { gridOver, gridSize, zonesExtent, type Grid } from '../geometry/grid.js';
import type { LineTable } from '../geometry/lines.js';
import type { ZonePolygons } from '../geometry/zones.js';
import type { GroundSampler } from '../geometry/dem.js';
import {
  CELL_BED,
  CELL_FIXED,
  CELL_FREE,
  CELL_OUTSIDE,
  cellNeighbour,
  districtFlows,
  solveBase,
  solveDistrict,
  type DistrictFlows,
  type DistrictGrid,
  type DistrictSolveStatus,
} from '../hydraulics/district-solver.js';
import { UsageError } from '../shared/errors.js';
import { RISK_CLASSES, riskClass, type RiskClass, type ScreenSettings } from '../shared/settings.js';
import { bedAt, stageAtChainage, type LineRecord, type ZoneRecord } from './district-inputs.js';
import { lineFaceScales } from './line-faces.js';

/**
 * Bytes the district solve holds per cell of its grid: the solver's arrays (about 110, measured by
 * bench/district-solver.bench.ts), the grid's inputs (33), zones and burned lines (24), the
 * heads and rasters (16) and masks (6), and the solve at twice the cell (a quarter as many), rounded up.
 * Measured on the demo: `doab screen` peaks 175 MB above a strips-only run at 1.0 million cells
 * (20 m) and 638 MB above it at 4.1 million (10 m), 155 to 170 bytes a cell with every output written.
 */
export const DISTRICT_BYTES_PER_CELL = 250;
/** The cell is doubled at most this many times to fit the memory budget; beyond it the run is refused. */
export const MAX_CELL_DOUBLINGS = 3;

export interface DistrictInputs {
  lines: LineRecord[];
  zones: ZoneRecord[];
  lineTable: LineTable;
  lineLengthsM: Float64Array;
  zonePolygons: ZonePolygons;
  /** Strip rings in metres, for the district's figures inside each strip. */
  stripRings: Float64Array[];
  /** Each strip's lines a and b (indices into lines), in the order of stripRings. */
  stripLines: ReadonlyArray<readonly [number, number]>;
  /** Optional: ground from a DEM, at each cell's centre (the zone's ground where the DEM has none). */
  ground?: GroundSampler | null;
}

export interface DistrictStripFigures {
  /** Smallest depth inside the strip, banks left out (m); NaN when no cell counts. */
  minDepthM: number;
  /** Area inside the strip where the depth is less than the waterlogging depth (ha). */
  shallowAreaHa: number;
  risk: RiskClass | null;
  /**
   * What lines a and b send into the cells inside the strip polygon (m^3/d; positive when the line
   * loses water): the flows across their cells' sides into those cells, so a line's water that
   * leaves past the strip's ends or into another strip is not counted here. A line with a bed
   * counts the same flows: what its cells (the water table where it runs) send into the strip's
   * cells, not what its bed passes, which also feeds the other side and the flow along the line.
   */
  lossAM3PerDay: number;
  lossBM3PerDay: number;
  /** Positive losses of both lines into the strip (m^3/d), as the strip's own loss is counted. */
  lossM3PerDay: number;
}

export interface DistrictBalance {
  /** Recharge over the aquifer (m^3/d; negative for a net loss to evaporation or pumping). */
  rechargeM3PerDay: number;
  /** What losing lines give the aquifer, and gaining lines take from it (both >= 0, m^3/d). */
  lineLossM3PerDay: number;
  lineGainM3PerDay: number;
  /** What enters and leaves the aquifer across its outer edge where a zone holds an edge head (both >= 0, m^3/d); 0 where the edge is no-flow. */
  edgeInM3PerDay: number;
  edgeOutM3PerDay: number;
  /** recharge + loss - gain + edge in - edge out: 0 for an exact solve (m^3/d). */
  residualM3PerDay: number;
  /** |residual| over the largest of the terms. */
  residualRelative: number;
  /** Largest imbalance of one free cell: its recharge less what it sends to its neighbours (m^3/d). */
  largestCellResidualM3PerDay: number;
}

export interface DistrictResult {
  grid: Grid;
  /** The cell asked for, and the cell used (larger when the memory budget called for it), m. */
  requestedCellM: number;
  cellM: number;
  status: DistrictSolveStatus;
  linearIterations: number;
  picardIterations: number;
  /** Newton iterations on the lines' beds (0 when no line has a bed, or when Picard carries them). */
  bedIterations: number;
  /** Water table per cell (m; NaN outside the aquifer); row 0 is the southernmost. */
  waterTableM: Float64Array;
  /** Ground minus water table per cell (m; NaN outside). */
  depthM: Float64Array;
  /** CELL_OUTSIDE, CELL_FREE, CELL_FIXED or CELL_BED per cell. */
  cellKind: Uint8Array;
  /** Each line's net loss (m^3/d, positive when it loses); NaN for a line with no cell in the aquifer. */
  lineLossM3PerDay: Float64Array;
  /** The same at twice the cell; the difference is the figure's numerical uncertainty. */
  lineLossCoarseM3PerDay: Float64Array;
  coarseCellM: number;
  /** Number of cells each line holds. */
  lineCells: Uint32Array;
  balance: DistrictBalance;
  /** Area of each risk class, and of line and bank cells left out of the classes (ha). */
  areaByRiskHa: Record<RiskClass, number>;
  lineAndBankAreaHa: number;
  /** Area with the water table less than the waterlogging depth below ground (ha). */
  shallowAreaHa: number;
  strips: DistrictStripFigures[];
  dryCells: number;
  warnings: string[];
}

/** The cell the memory budget allows: the asked cell, doubled up to MAX_CELL_DOUBLINGS times; refuses beyond. */
export function chooseCell(extent: readonly [number, number, number, number], settings: ScreenSettings): { cellM: number; cells: number } {
  const budgetBytes = settings.districtMemoryMB * 1024 * 1024;
  let cellM = settings.districtCellM;
  for (let doubling = 0; doubling <= MAX_CELL_DOUBLINGS; doubling++, cellM *= 2) {
    const { cells } = gridSize(extent, cellM);
    if (cells * DISTRICT_BYTES_PER_CELL <= budgetBytes) return { cellM, cells };
  }
  const asked = gridSize(extent, settings.districtCellM);
  const neededMB = Math.ceil((asked.cells * DISTRICT_BYTES_PER_CELL) / 2 ** 20);
  const coarsest = settings.districtCellM * 2 ** MAX_CELL_DOUBLINGS;
  throw new UsageError(
    `districtMemoryMB: the district solve over ${formatCount(asked.cells)} cells of ${settings.districtCellM} m needs about ${neededMB} MB, ` +
      `more than the budget of ${settings.districtMemoryMB} MB even at a ${coarsest} m cell; raise --memory-mb, set a coarser --cell, or use --strips-only`,
    'districtMemoryMB',
  );
}

function formatCount(n: number): string {
  return Number.isFinite(n) ? String(Math.round(n)) : 'infinitely many';
}

/**
 * The district's grid over `grid` (the whole grid, or a tile's window of it) ready to solve, and
 * what the figures need of it besides the heads.
 */
export interface DistrictSetup {
  grid: Grid;
  districtGrid: DistrictGrid;
  groundM: Float64Array;
  burned: BurnedLines;
  /** Aquifer cells that no line reaches (no steady state): left out, area in m^2. */
  cutOffAreaM2: number;
  /** Line cells whose stage is at or below the base under them. */
  dryLineCells: number;
  /** Cells holding an edge head, per zone (index as in the zone list). */
  edgeCellsByZone: Uint32Array;
}

/**
 * Heads held on a window's cut edges: for each cell in `cells` (ascending indices of the window's
 * grid), the head in `headM` (NaN: none known, the cell is left as it is). A held cell joins the
 * lines in reaching the free cells, so a window cut from the aquifer leaves none out that the whole
 * grid reaches from beyond the cut. A line's own cell keeps its stage.
 */
export interface HeldEdge {
  cells: Uint32Array;
  headM: Float64Array;
}

interface GridSolve {
  grid: Grid;
  cellKind: Uint8Array;
  groundM: Float64Array;
  burned: BurnedLines;
  waterTableM: Float64Array;
  fixedCells: Uint32Array;
  exchangeM3PerDay: Float64Array;
  sideFlowM3PerDay: Float64Array;
  rechargeMPerDay: Float64Array;
  status: DistrictSolveStatus;
  linearIterations: number;
  picardIterations: number;
  bedIterations: number;
  totalRechargeM3PerDay: number;
  largestCellResidualM3PerDay: number;
  dryCells: number;
  cutOffAreaM2: number;
  dryLineCells: number;
  edgeCellsByZone: Uint32Array;
}

/**
 * Zones and lines onto the cells of `grid`, with a line's stage, bed and face scales in its cells
 * and a zone's edge head on the aquifer's outer edge; `held` fixes the cut edges of a window.
 */
export function districtSetup(inputs: DistrictInputs, grid: Grid, held: HeldEdge | null = null): DistrictSetup {
  const { lines, zones, lineTable, lineLengthsM, zonePolygons } = inputs;
  const { cellM } = grid;
  const zoneOf = fillZones(grid, zonePolygons).zone;
  const burned = burnLines(grid, lineTable);
  const n = grid.cells;
  const cellKind = new Uint8Array(n);
  const kMPerDay = new Float64Array(n), rechargeMPerDay = new Float64Array(n), baseM = new Float64Array(n), fixedHeadM = new Float64Array(n);
  const groundM = new Float64Array(n).fill(NaN);
  // a line's bed where it resists: its conductance over the cell and its underside
  const bedConductance = new Float64Array(n), bedFloorM = new Float64Array(n);
  let bedCells = 0;
  // the zones' figures in typed arrays, so the loop over cells touches no object
  const zoneK = Float64Array.from(zones, (z) => z.kMPerDay), zoneRecharge = Float64Array.from(zones, (z) => z.rechargeMPerDay);
  const zoneBase = Float64Array.from(zones, (z) => z.baseM), zoneGround = Float64Array.from(zones, (z) => z.groundM);
  const zoneEdgeHead = Float64Array.from(zones, (z) => (z.edgeHeadM === null ? Number.NaN : z.edgeHeadM));
  const lineOf = burned.line;
  let dryLineCells = 0;
  const edgeCellsByZone = new Uint32Array(zones.length);
  for (let g = 0; g < n; g++) {
    const z = zoneOf[g];
    if (z < 0) continue;
    kMPerDay[g] = zoneK[z];
    rechargeMPerDay[g] = zoneRecharge[z];
    baseM[g] = zoneBase[z];
    groundM[g] = zoneGround[z];
    if (inputs.ground) {
      const sampled = inputs.ground.at(grid.originX + ((g % grid.columns) + 0.5) * cellM, grid.originY + (Math.floor(g / grid.columns) + 0.5) * cellM);
      if (Number.isFinite(sampled)) groundM[g] = sampled;
    }
    const l = lineOf[g];
    if (l >= 0) {
      const line = lines[l];
      fixedHeadM[g] = stageAtChainage(line, burned.chainageM[g], lineLengthsM[l]);
      if (fixedHeadM[g] <= zoneBase[z]) dryLineCells++;
      // the bed at the chainage of the cell (a lined range's where one covers it)
      const bed = bedAt(line, burned.chainageM[g]);
      if (bed.resistanceD > 0 && burned.lengthM[g] > 0) {
        // the whole wetted perimeter: the cell holds both sides of the line
        cellKind[g] = CELL_BED;
        bedConductance[g] = (bed.perimeterM * burned.lengthM[g]) / bed.resistanceD;
        bedFloorM[g] = Number.isNaN(line.waterDepthM) ? -Infinity : fixedHeadM[g] - line.waterDepthM;
        bedCells++;
      } else cellKind[g] = CELL_FIXED;
    } else if (!Number.isNaN(zoneEdgeHead[z]) && onOuterEdge(grid, zoneOf, g)) {
      // the zone's part of the aquifer's outer edge holds the head its attribute gives (a river, a regional water table)
      cellKind[g] = CELL_FIXED;
      fixedHeadM[g] = zoneEdgeHead[z];
      edgeCellsByZone[z]++;
    } else cellKind[g] = CELL_FREE;
  }
  // a held cell is held unless a line holds its stage there; a cut edge is no outer edge of the aquifer
  const holds = (k: number) => held !== null && !Number.isNaN(held.headM[k]) && cellKind[held.cells[k]] !== CELL_OUTSIDE && !(cellKind[held.cells[k]] === CELL_FIXED && lineOf[held.cells[k]] >= 0);
  const cutOff = leaveOutUnreached(grid, cellKind, held === null ? null : held.cells.filter((_, k) => holds(k)));
  // each line where it runs in its cells, not at their centres (the subgrid correction), before the held cells turn fixed
  const fixedFaceScale = lineFaceScales(grid, cellKind, burned, lineTable);
  for (let k = 0; held !== null && k < held.cells.length; k++) {
    if (!holds(k)) continue;
    cellKind[held.cells[k]] = CELL_FIXED;
    fixedHeadM[held.cells[k]] = held.headM[k];
  }
  const districtGrid: DistrictGrid = { columns: grid.columns, rows: grid.rows, cellM, cellKind, kMPerDay, rechargeMPerDay, baseM, fixedHeadM, fixedFaceScale };
  if (bedCells > 0) districtGrid.bed = { conductanceM2PerDay: bedConductance, floorM: bedFloorM };
  return { grid, districtGrid, groundM, burned, cutOffAreaM2: cutOff * cellM * cellM, dryLineCells, edgeCellsByZone };
}

/** A set-up grid and the state of its heads: the flows and what the figures read. */
function gridSolve(
  setup: DistrictSetup,
  waterTableM: Float64Array,
  flows: DistrictFlows,
  run: { status: DistrictSolveStatus; linearIterations: number; picardIterations: number; bedIterations: number },
): GridSolve {
  return {
    grid: setup.grid,
    cellKind: setup.districtGrid.cellKind,
    groundM: setup.groundM,
    burned: setup.burned,
    waterTableM,
    fixedCells: flows.fixedCells,
    exchangeM3PerDay: flows.exchangeM3PerDay,
    sideFlowM3PerDay: flows.sideFlowM3PerDay,
    rechargeMPerDay: setup.districtGrid.rechargeMPerDay,
    status: run.status,
    linearIterations: run.linearIterations,
    picardIterations: run.picardIterations,
    bedIterations: run.bedIterations,
    totalRechargeM3PerDay: flows.totalRechargeM3PerDay,
    largestCellResidualM3PerDay: flows.largestCellResidualM3PerDay,
    dryCells: flows.dryCellCount,
    cutOffAreaM2: setup.cutOffAreaM2,
    dryLineCells: setup.dryLineCells,
    edgeCellsByZone: setup.edgeCellsByZone,
  };
}

function solveAt(inputs: DistrictInputs, cellM: number): GridSolve {
  const setup = districtSetup(inputs, gridOver(zonesExtent(inputs.zonePolygons), cellM));
  const solution = solveDistrict(setup.districtGrid);
  return gridSolve(setup, solution.headM, solution, solution);
}

/** Whether an aquifer cell touches the aquifer's outer edge: a side on no zone, or on the grid's own edge. */
function onOuterEdge(grid: Grid, zoneOf: Int32Array, g: number): boolean {
  for (let side = 0; side < 4; side++) {
    const gj = cellNeighbour(g, side, grid.columns, grid.cells);
    if (gj < 0 || zoneOf[gj] < 0) return true;
  }
  return false;
}

/** Free cells joined to no line cell (nor to a held cell) have no steady water table: marks them outside; returns how many. */
function leaveOutUnreached(grid: Grid, cellKind: Uint8Array, heldCells: Uint32Array | null): number {
  const { columns, cells } = grid;
  const reached = new Uint8Array(cells);
  const stack = new Int32Array(cells);
  let top = 0;
  for (let g = 0; g < cells; g++) if (cellKind[g] === CELL_FIXED || cellKind[g] === CELL_BED) { reached[g] = 1; stack[top++] = g; }
  if (heldCells !== null) for (const g of heldCells) if (!reached[g]) { reached[g] = 1; stack[top++] = g; }
  while (top > 0) {
    const g = stack[--top];
    for (let side = 0; side < 4; side++) {
      const gj = cellNeighbour(g, side, columns, cells);
      if (gj < 0) continue;
      if (cellKind[gj] === CELL_FREE && !reached[gj]) { reached[gj] = 1; stack[top++] = gj; }
    }
  }
  let cutOff = 0;
  for (let g = 0; g < cells; g++) {
    if (cellKind[g] === CELL_FREE && !reached[g]) { cellKind[g] = CELL_OUTSIDE; cutOff++; }
  }
  return cutOff;
}

/** The side of a cell's neighbour that faces back to the cell (west <-> east, south <-> north). */
const OPPOSITE_SIDE = [1, 0, 3, 2];

/** Index of fixed cell g among the fixed cells (ascending); -1 when g is not one. */
function fixedIndex(fixedCells: Uint32Array, g: number): number {
  let lo = 0, hi = fixedCells.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >>> 1;
    const v = fixedCells[mid];
    if (v === g) return mid;
    if (v < g) lo = mid + 1;
    else hi = mid - 1;
  }
  return -1;
}

/** How many of cell g's sides face a free cell of strip s (at least 1 when called from one). */
function sidesInto(grid: Grid, cellKind: Uint8Array, stripMark: Int32Array, s: number, g: number): number {
  let count = 0;
  for (let side = 0; side < 4; side++) {
    const gj = cellNeighbour(g, side, grid.columns, grid.cells);
    if (gj >= 0 && cellKind[gj] === CELL_FREE && stripMark[gj] === s) count++;
  }
  return count;
}

function lineLosses(solve: GridSolve, lineCount: number): { loss: Float64Array; cells: Uint32Array } {
  const loss = new Float64Array(lineCount);
  const cells = new Uint32Array(lineCount);
  // fixed cells ascend, so every line's sum runs in one fixed order
  for (let k = 0; k < solve.fixedCells.length; k++) {
    const l = solve.burned.line[solve.fixedCells[k]];
    // a fixed cell of no line holds an edge head: its exchange is the edge's, not a line's
    if (l < 0) continue;
    loss[l] += solve.exchangeM3PerDay[k];
    cells[l]++;
  }
  for (let l = 0; l < lineCount; l++) if (cells[l] === 0) loss[l] = NaN;
  return { loss, cells };
}

/** Stage jumps where a line's end lies within a cell of another line's cells (a junction, a tail at a drain): larger than 5 cm. */
function junctionJumps(inputs: DistrictInputs, solve: GridSolve): { count: number; largestM: number; where: string } {
  const { lines, lineTable: table, lineLengthsM } = inputs;
  const { grid, burned, cellKind } = solve;
  const { columns, rows, cellM, originX, originY } = grid;
  let count = 0, largestM = 0, where = '';
  for (let l = 0; l < table.lineCount; l++) {
    for (let part = table.linePartStart[l]; part < table.linePartStart[l + 1]; part++) {
      for (const v of [table.partVertexStart[part], table.partVertexStart[part + 1] - 1]) {
        const c0 = Math.floor((table.x[v] - originX) / cellM), r0 = Math.floor((table.y[v] - originY) / cellM);
        const stageM = stageAtChainage(lines[l], table.chainageM[v], lineLengthsM[l]);
        let jump = 0, other = -1;
        for (let r = r0 - 1; r <= r0 + 1; r++) {
          for (let c = c0 - 1; c <= c0 + 1; c++) {
            if (r < 0 || r >= rows || c < 0 || c >= columns) continue;
            const g = r * columns + c;
            const m = burned.line[g];
            if (m < 0 || m === l || (cellKind[g] !== CELL_FIXED && cellKind[g] !== CELL_BED)) continue;
            const d = Math.abs(stageAtChainage(lines[m], burned.chainageM[g], lineLengthsM[m]) - stageM);
            if (d > jump) { jump = d; other = m; }
          }
        }
        if (jump > JUNCTION_JUMP_M) {
          count++;
          if (jump > largestM) { largestM = jump; where = `${lines[l].id} at ${lines[other].id}`; }
        }
      }
    }
  }
  return { count, largestM, where };
}

/** A stage difference where lines meet that is more than rounding (m). */
const JUNCTION_JUMP_M = 0.05;

/**
 * Cells a bank covers: within bankWidthM of a line, taken as within bankWidthM + half a cell
 * diagonal of a line cell's centre (the line passes somewhere in that cell). Line cells included.
 */
function bankMask(grid: Grid, cellKind: Uint8Array, bankWidthM: number): Uint8Array {
  const { columns, rows, cellM } = grid;
  const mask = new Uint8Array(grid.cells);
  const reachM = bankWidthM + (cellM * Math.SQRT2) / 2;
  const r = Math.floor(reachM / cellM);
  for (let g = 0; g < grid.cells; g++) {
    if (cellKind[g] !== CELL_FIXED && cellKind[g] !== CELL_BED) continue;
    mask[g] = 1;
    if (bankWidthM === 0) continue;
    const row = Math.floor(g / columns), col = g % columns;
    for (let dr = -r; dr <= r; dr++) {
      const rr = row + dr;
      if (rr < 0 || rr >= rows) continue;
      for (let dc = -r; dc <= r; dc++) {
        const cc = col + dc;
        if (cc < 0 || cc >= columns) continue;
        if (Math.hypot(dr, dc) * cellM <= reachM) mask[rr * columns + cc] = 1;
      }
    }
  }
  return mask;
}

/**
 * One tile's share of the district solve (made by districtTilePiece in district-tiles.ts): plain
 * figures and typed arrays, so that a tile file holds it bit for bit.
 */
export interface DistrictTilePiece {
  header: Record<string, number | string | boolean | null>;
  arrays: Record<string, Float64Array | Float32Array | Int32Array | Uint32Array | Uint8Array>;
}

/** What a district tile piece says it is, in its header's `kind`. */
export const DISTRICT_TILE_KIND = 'doab district tile 1';

/** A band of whole columns (or rows) of a grid: [start, end). */
export interface TileBand {
  axis: 'columns' | 'rows';
  start: number;
  end: number;
}

/**
 * Tile `index` (1-based) of `count`: a band of whole columns of the grid, or of rows when it has
 * more rows than columns, the bands as near equal in width as whole cells allow.
 * Example: tileBand({ columns: 10, rows: 4 }, 2, 3) -> { axis: 'columns', start: 3, end: 6 }
 */
export function tileBand(grid: { columns: number; rows: number }, index: number, count: number): TileBand {
  const axis = grid.columns >= grid.rows ? 'columns' : 'rows';
  const length = axis === 'columns' ? grid.columns : grid.rows;
  if (!(Number.isInteger(count) && count >= 1 && count <= length)) throw new Error(`Unexpected tile count: ${count} (the district grid is ${length} ${axis} wide: 1 to ${length} tiles).`);
  if (!(Number.isInteger(index) && index >= 1 && index <= count)) throw new Error(`Unexpected tile index: ${index} of ${count}.`);
  return { axis, start: Math.floor(((index - 1) * length) / count), end: Math.floor((index * length) / count) };
}

/** Cells of a band, and the grid cell of its k-th cell (bands list their cells row by row). */
export function bandCells(grid: { columns: number; rows: number }, band: TileBand): { count: number; cell: (k: number) => number } {
  const width = band.end - band.start;
  if (band.axis === 'rows') return { count: width * grid.columns, cell: (k) => band.start * grid.columns + k };
  return { count: width * grid.rows, cell: (k) => Math.floor(k / width) * grid.columns + band.start + (k % width) };
}

/** The header keys of a piece's grid at the cell (`fine`) or at twice it (`coarse`). */
const pieceKey = (which: 'fine' | 'coarse', name: string) => (which === 'fine' ? name : `coarse${name[0].toUpperCase()}${name.slice(1)}`);

/**
 * The heads of the whole grid put together from the pieces' bands, and their flows, as a solve
 * would give them. Throws, naming the tile, on pieces that do not make up this grid.
 */
function stitchAt(inputs: DistrictInputs, cellM: number, pieces: readonly DistrictTilePiece[], which: 'fine' | 'coarse'): GridSolve {
  const grid = gridOver(zonesExtent(inputs.zonePolygons), cellM);
  const setup = districtSetup(inputs, grid);
  const { cellKind, fixedHeadM } = setup.districtGrid;
  const { equalBases } = solveBase(setup.districtGrid);
  const headM = new Float64Array(grid.cells).fill(NaN);
  const u = equalBases ? new Float64Array(grid.cells) : null;
  const key = (name: string) => pieceKey(which, name);
  const run = { status: 'converged' as DistrictSolveStatus, linearIterations: 0, picardIterations: 0, bedIterations: 0 };
  for (const piece of pieces) {
    const { header, arrays } = piece;
    const name = `district tile ${header.tileIndex} of ${header.tileCount}`;
    const band = tileBand(grid, Number(header.tileIndex), pieces.length);
    const expected: Record<string, number | string> = {
      [key('cellM')]: cellM,
      [key('originXM')]: grid.originX,
      [key('originYM')]: grid.originY,
      [key('columns')]: grid.columns,
      [key('rows')]: grid.rows,
      [key('bandAxis')]: band.axis,
      [key('bandStart')]: band.start,
      [key('bandEnd')]: band.end,
    };
    for (const [field, value] of Object.entries(expected)) {
      if (header[field] !== value) throw new Error(`${name} does not fit this district: its ${field} is ${header[field]}, the district's ${value} (a tile of another district, or of other settings).`);
    }
    const cells = bandCells(grid, band);
    const bandHeadM = arrays[key('headM')], bandU = arrays[key('squaredThicknessM2')];
    if (!(bandHeadM instanceof Float64Array) || bandHeadM.length !== cells.count) throw new Error(`${name} holds no ${key('headM')} of ${cells.count} values for its band.`);
    if (u !== null && (!(bandU instanceof Float64Array) || bandU.length !== cells.count)) throw new Error(`${name} holds no ${key('squaredThicknessM2')} of ${cells.count} values for its band.`);
    for (let k = 0; k < cells.count; k++) {
      const g = cells.cell(k);
      const kind = cellKind[g];
      if (kind === CELL_OUTSIDE) continue;
      if (kind === CELL_FIXED) { headM[g] = fixedHeadM[g]; continue; }
      if (Number.isNaN(bandHeadM[k])) throw new Error(`${name} has no head at cell ${g} (row ${Math.floor(g / grid.columns)}, column ${g % grid.columns}), where the district's grid is in the aquifer.`);
      headM[g] = bandHeadM[k];
      if (u !== null) u[g] = (bandU as Float64Array)[k];
    }
    const status = header[key('status')] as DistrictSolveStatus;
    if (run.status === 'converged' && status !== 'converged') run.status = status;
    run.linearIterations += Number(header[key('linearIterations')]);
    run.picardIterations = Math.max(run.picardIterations, Number(header[key('picardIterations')]));
    run.bedIterations = Math.max(run.bedIterations, Number(header[key('bedIterations')]));
  }
  return gridSolve(setup, headM, districtFlows(setup.districtGrid, u, headM), run);
}

/** Refuses pieces that are not the N tiles of one split, each once; returns N. */
function checkPieces(pieces: readonly DistrictTilePiece[], coarseCheck: boolean): number {
  const count = pieces.length;
  if (count === 0) throw new Error('No district tile pieces to stitch.');
  const seen = new Set<number>();
  for (const { header } of pieces) {
    const name = `district tile ${header.tileIndex} of ${header.tileCount}`;
    if (header.kind !== DISTRICT_TILE_KIND) throw new Error(`${name} is not a district tile piece (kind ${header.kind}, want ${DISTRICT_TILE_KIND}).`);
    if (header.tileCount !== count) throw new Error(`${name} is one of ${header.tileCount} tiles, but ${count} pieces were given.`);
    const index = header.tileIndex;
    if (!(typeof index === 'number' && Number.isInteger(index) && index >= 1 && index <= count)) throw new Error(`${name} has an index outside 1 to ${count}.`);
    if (seen.has(index)) throw new Error(`${name} is given twice.`);
    seen.add(index);
    if (coarseCheck && header.coarseCheck !== true) throw new Error(`${name} was solved without the coarse check (the solve at twice the cell), which this run asks for.`);
  }
  return count;
}

/**
 * Solves the district at the cell the settings and memory budget allow, and at twice that cell;
 * throws a UsageError naming districtMemoryMB before allocating a grid that would not fit. Given
 * `pieces` (every tile of one split, made by districtTilePiece, in any order), stitches their heads
 * instead of solving, and derives every figure from them as from a solve.
 */
export function districtSolve(
  inputs: DistrictInputs,
  settings: ScreenSettings,
  options: { coarseCheck?: boolean; pieces?: readonly DistrictTilePiece[] } = {},
): DistrictResult {
  const extent = zonesExtent(inputs.zonePolygons);
  const { cellM } = chooseCell(extent, settings);
  const warnings: string[] = [];
  if (cellM !== settings.districtCellM) {
    warnings.push(
      `district solve at a ${cellM} m cell, coarser than the ${settings.districtCellM} m asked (districtCellM): ` +
        `the grid at ${settings.districtCellM} m would need more than the ${settings.districtMemoryMB} MB of districtMemoryMB`,
    );
  }
  // the same solve at twice the cell, for each line's numerical uncertainty (left out by scenario
  // runs that compare solves at one cell, such as a lining plan's)
  const coarseCheck = options.coarseCheck !== false;
  if (options.pieces === undefined) {
    const fine = solveAt(inputs, cellM);
    const coarse = coarseCheck ? solveAt(inputs, 2 * cellM) : null;
    return districtFigures(inputs, settings, cellM, fine, coarse, warnings);
  }
  const count = checkPieces(options.pieces, coarseCheck);
  const fine = stitchAt(inputs, cellM, options.pieces, 'fine');
  const coarse = coarseCheck ? stitchAt(inputs, 2 * cellM, options.pieces, 'coarse') : null;
  const result = districtFigures(inputs, settings, cellM, fine, coarse, warnings);
  if (count > 1) {
    result.warnings.push(tilesWarning(options.pieces, result));
    const unsettled = options.pieces.filter((piece) => piece.header.heldStatus !== 'converged').map((piece) => piece.header.tileIndex);
    if (unsettled.length > 0) result.warnings.push(`the heads held on the cut edges of district tile${unsettled.length === 1 ? '' : 's'} ${unsettled.join(', ')} did not converge: the stitched figures are not reliable`);
  }
  return result;
}

/** What the stitch of N tiles did, and how far its figures may be from one whole solve. */
function tilesWarning(pieces: readonly DistrictTilePiece[], result: DistrictResult): string {
  const { header } = pieces[0];
  return (
    `district solve in ${pieces.length} tiles (bands of ${header.bandAxis}), each solved over its band and a margin of ${header.marginM} m ` +
    `(${header.marginCells} cells) with its cut edges held at the heads of the whole district solved at a ${header.heldCellM} m cell, moved twice by what the window's own solve finds halfway across the margin, then stitched: ` +
    `on every district tested (the demo, a generated district and a 200-line bench district, in 2 to 8 tiles) each line's loss came within ${(100 * DISTRICT_TILE_LOSS_TOLERANCE).toFixed(0)}% or ${DISTRICT_TILE_LOSS_FLOOR_M3_PER_DAY} m3/d and the water table within ` +
    `${DISTRICT_TILE_HEAD_TOLERANCE_M} m of one whole solve; that is a measured tolerance, not a proven bound: check a line that matters against a run in one piece; the stitched heads balance to ${result.balance.residualM3PerDay.toPrecision(3)} m3/d ` +
    `(${(100 * result.balance.residualRelative).toPrecision(2)}% of the largest term), largest cell imbalance ${result.balance.largestCellResidualM3PerDay.toPrecision(3)} m3/d`
  );
}

/**
 * How near the stitched figures of a district solved in tiles come to one whole solve, as
 * test/screening/district-tiles.test.ts holds them to (the demo at a 40 m cell and a generated
 * district at 20 m, each in 2, 3 and 7 tiles): a line's loss within this fraction of it, or within
 * the floor (m^3/d) for a line that loses little; every water table within the head tolerance (m).
 * Measured on the demo: 0.2% and 4 mm at its 20 m cell, 1.8% and 15 mm at 40 m (the held heads are
 * then an 80 m cell's); the water table differs most far from any line, where nothing but the
 * held edge sets it (47 mm on bench/district-tiles.bench.ts's district, its losses within 0.3%).
 */
export const DISTRICT_TILE_LOSS_TOLERANCE = 0.02;
export const DISTRICT_TILE_LOSS_FLOOR_M3_PER_DAY = 5;
export const DISTRICT_TILE_HEAD_TOLERANCE_M = 0.1;

/** Every figure of a district result from the heads at the cell (`fine`) and at twice it (`coarse`). */
function districtFigures(inputs: DistrictInputs, settings: ScreenSettings, cellM: number, fine: GridSolve, coarse: GridSolve | null, warnings: string[]): DistrictResult {
  const lineCount = inputs.lines.length;
  const { loss, cells: lineCells } = lineLosses(fine, lineCount);
  const lineLossCoarseM3PerDay = coarse ? lineLosses(coarse, lineCount).loss : new Float64Array(lineCount).fill(NaN);

  const { grid, cellKind, groundM, waterTableM } = fine;
  const areaHa = (cellM * cellM) / 10_000;
  const depthM = new Float64Array(grid.cells).fill(NaN);
  for (let g = 0; g < grid.cells; g++) if (cellKind[g] !== CELL_OUTSIDE) depthM[g] = groundM[g] - waterTableM[g];
  // outside cells left out of the solve (cut off from every line) have no water table
  for (let g = 0; g < grid.cells; g++) if (cellKind[g] === CELL_OUTSIDE) waterTableM[g] = NaN;

  const banks = bankMask(grid, cellKind, settings.bankWidthM);
  const areaByRiskHa = Object.fromEntries(RISK_CLASSES.map((risk) => [risk, 0])) as Record<RiskClass, number>;
  let lineAndBankAreaHa = 0, shallowAreaHa = 0, noGroundAreaHa = 0;
  for (let g = 0; g < grid.cells; g++) {
    if (cellKind[g] === CELL_OUTSIDE) continue;
    if (banks[g]) { lineAndBankAreaHa += areaHa; continue; }
    // no ground known there (no DEM data, a zone without ground_m): no depth, no class
    if (Number.isNaN(depthM[g])) { noGroundAreaHa += areaHa; continue; }
    areaByRiskHa[riskClass(depthM[g], settings.risk)] += areaHa;
    if (depthM[g] < settings.risk.waterloggedDepthM) shallowAreaHa += areaHa;
  }

  const stripCells = polygonCells(grid, inputs.stripRings.map((ring) => [ring]));
  const lineOfCell = fine.burned.line;
  const cellAreaM2 = cellM * cellM;
  // which strip a cell was last found in, so a line cell's sides into the current strip can be counted
  const stripMark = new Int32Array(grid.cells).fill(-1);
  const strips: DistrictStripFigures[] = inputs.stripRings.map((_, s) => {
    const [lineA, lineB] = inputs.stripLines[s];
    let minDepthM = Infinity, shallow = 0, lossA = 0, lossB = 0;
    for (let k = stripCells.start[s]; k < stripCells.start[s + 1]; k++) stripMark[stripCells.cell[k]] = s;
    for (let k = stripCells.start[s]; k < stripCells.start[s + 1]; k++) {
      const g = stripCells.cell[k];
      if (cellKind[g] !== CELL_FREE) continue;
      // water that line a's or b's cells send into this cell of the strip
      for (let side = 0; side < 4; side++) {
        const gj = cellNeighbour(g, side, grid.columns, grid.cells);
        if (gj < 0 || (cellKind[gj] !== CELL_FIXED && cellKind[gj] !== CELL_BED)) continue;
        const l = lineOfCell[gj];
        if (l !== lineA && l !== lineB) continue;
        // the face lies half a cell from the line: the recharge on the half of the line cell between
        // the line and the strip reaches the line, shared among the faces into the strip [derived]
        const flow =
          fine.sideFlowM3PerDay[4 * fixedIndex(fine.fixedCells, gj) + OPPOSITE_SIDE[side]] -
          (0.5 * fine.rechargeMPerDay[gj] * cellAreaM2) / sidesInto(grid, cellKind, stripMark, s, gj);
        if (l === lineA) lossA += flow;
        else lossB += flow;
      }
      if (banks[g]) continue;
      if (depthM[g] < minDepthM) minDepthM = depthM[g];
      if (depthM[g] < settings.risk.waterloggedDepthM) shallow += areaHa;
    }
    const counted = Number.isFinite(minDepthM);
    return {
      minDepthM: counted ? minDepthM : NaN,
      shallowAreaHa: shallow,
      risk: counted ? riskClass(minDepthM, settings.risk) : null,
      lossAM3PerDay: lossA,
      lossBM3PerDay: lossB,
      lossM3PerDay: Math.max(lossA, 0) + Math.max(lossB, 0),
    };
  });

  let lossSum = 0, gainSum = 0, edgeIn = 0, edgeOut = 0;
  for (let k = 0; k < fine.exchangeM3PerDay.length; k++) {
    const e = fine.exchangeM3PerDay[k];
    if (fine.burned.line[fine.fixedCells[k]] < 0) {
      if (e > 0) edgeIn += e;
      else edgeOut -= e;
    } else if (e > 0) lossSum += e;
    else gainSum -= e;
  }
  const residual = fine.totalRechargeM3PerDay + lossSum - gainSum + edgeIn - edgeOut;
  const largest = Math.max(Math.abs(fine.totalRechargeM3PerDay), lossSum, gainSum, edgeIn, edgeOut);
  const balance: DistrictBalance = {
    rechargeM3PerDay: fine.totalRechargeM3PerDay,
    lineLossM3PerDay: lossSum,
    lineGainM3PerDay: gainSum,
    edgeInM3PerDay: edgeIn,
    edgeOutM3PerDay: edgeOut,
    residualM3PerDay: residual,
    residualRelative: largest > 0 ? Math.abs(residual) / largest : 0,
    largestCellResidualM3PerDay: fine.largestCellResidualM3PerDay,
  };

  if (fine.status !== 'converged') warnings.push(`district solve did not converge (${fine.status}): its figures are not reliable`);
  if (coarse && coarse.status !== 'converged') warnings.push(`district solve at twice the cell did not converge (${coarse.status}): the uncertainty of line losses is not reliable`);
  if (balance.residualRelative > 1e-6) warnings.push(`district water balance does not close: residual ${balance.residualM3PerDay.toPrecision(3)} m3/d`);
  if (fine.cutOffAreaM2 > 0) {
    warnings.push(`${(fine.cutOffAreaM2 / 10_000).toFixed(1)} ha of aquifer reach no line and were left out of the district solve (no steady water table without a line)`);
  }
  if (areaByRiskHa.ponded > 0) {
    warnings.push(
      `${areaByRiskHa.ponded.toFixed(1)} ha where the district solve puts the water table at or above ground: ` +
        'water that would seep out at the surface is not modelled, so the water table there and the gains of lines nearby are overestimated',
    );
  }
  if (noGroundAreaHa > 0) warnings.push(`${noGroundAreaHa.toFixed(1)} ha of aquifer have no ground (no DEM data and no ground_m): no depth or risk class there`);
  if (fine.dryCells > 0) warnings.push(`${fine.dryCells} cells of the district solve are dry (the water table down to the base): Dupuit-Forchheimer does not describe them`);
  // an edge head on a zone that nowhere meets the aquifer's outer edge holds nothing: say so, never ignore it silently
  const unheld = inputs.zones.filter((zone, z) => zone.edgeHeadM !== null && fine.edgeCellsByZone[z] === 0).map((zone) => zone.id);
  if (unheld.length > 0) {
    warnings.push(`${unheld.length === 1 ? '1 zone gives an edge head but meets' : `${unheld.length} zones give an edge head but meet`} the aquifer's outer edge nowhere (${unheld.slice(0, 5).join(', ')}${unheld.length > 5 ? ', ...' : ''}): the head is not used`);
  }
  if (fine.dryLineCells > 0) warnings.push(`${fine.dryLineCells} line cells have a stage at or below the aquifer base: they hold a dry line`);
  const missing = inputs.lines.filter((_, l) => lineCells[l] === 0).map((line) => line.id);
  if (missing.length > 0) {
    warnings.push(`${missing.length} line${missing.length === 1 ? '' : 's'} hold no cell of the district grid inside the aquifer (${missing.slice(0, 5).join(', ')}${missing.length > 5 ? ', ...' : ''}): their figures come from the strips`);
  }
  const jumps = junctionJumps(inputs, fine);
  if (jumps.count > 0) {
    warnings.push(
      `${jumps.count} line end${jumps.count === 1 ? '' : 's'} meet another line at a different stage (up to ${jumps.largestM.toFixed(2)} m, ${jumps.where}): ` +
        'the district solve takes lines as no wider than a cell, so the water they exchange there grows as the cell shrinks; ' +
        "those lines' figures depend on the cell more than others (coarse_cell_diff_m3_d in canals.geojson)",
    );
  }
  if (fine.burned.sharedCells > 0) warnings.push(`${fine.burned.sharedCells} district cells are passed by more than one line (junctions, close lines): each went to the nearest line`);

  return {
    grid,
    requestedCellM: settings.districtCellM,
    cellM,
    status: fine.status,
    linearIterations: fine.linearIterations,
    picardIterations: fine.picardIterations,
    bedIterations: fine.bedIterations,
    waterTableM,
    depthM,
    cellKind,
    lineLossM3PerDay: loss,
    lineLossCoarseM3PerDay,
    coarseCellM: 2 * cellM,
    lineCells,
    balance,
    areaByRiskHa,
    lineAndBankAreaHa,
    shallowAreaHa,
    strips,
    dryCells: fine.dryCells,
    warnings,
  };
}
