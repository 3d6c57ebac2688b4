import type { ZonePolygons } from './zones.js';

/**
 * A regular grid of square cells for the district solve, in the work CRS (metres). Cell index =
 * row * columns + column; row 0 is the southernmost, column 0 the westernmost. A cell holds the
 * half-open square [west, east) x [south, north), so a point on a shared edge belongs to the cell
 * to its north or east.
 */
export interface Grid {
  /** x of the west edge of column 0 (m) */
  originX: number;
  /** y of the south edge of row 0 (m) */
  originY: number;
  columns: number;
  rows: number;
  /** columns * rows */
  cells: number;
  /** side of a cell (m) */
  cellM: number;
}

/** [minX, minY, maxX, maxY] in metres. */
export type ExtentM = readonly [number, number, number, number];

/** Most cells a grid may have, so that every cell index fits an Int32Array. */
export const MAX_GRID_CELLS = 2 ** 31 - 1;

export interface GridSize {
  columns: number;
  rows: number;
  /** columns * rows, as a plain number: may exceed MAX_GRID_CELLS or be Infinity */
  cells: number;
}

function checkCellM(cellM: number): void {
  if (!(cellM > 0) || !Number.isFinite(cellM)) throw new Error(`Unexpected cellM value: ${cellM}.`);
}

function checkMargin(marginCells: number): void {
  if (!Number.isInteger(marginCells) || marginCells < 0) throw new Error(`Unexpected marginCells value: ${marginCells}.`);
}

function checkExtent(e: ExtentM): void {
  if (e.length !== 4 || !e.every(Number.isFinite) || e[0] > e[2] || e[1] > e[3]) throw new Error(`Unexpected extent: [${e.join(', ')}].`);
}

/**
 * Cells snapped to multiples of cellM on each axis, so grids of one cell size over different
 * extents line up, and shapes drawn on that lattice fill whole cells. Always at least one.
 */
function axis(min: number, max: number, cellM: number, marginCells: number): { first: number; count: number } {
  let first = Math.floor(min / cellM);
  const last = Math.ceil(max / cellM);
  if (!Number.isFinite(first) || !Number.isFinite(last)) return { first, count: Infinity };
  // a quotient rounded up by one ulp could leave min a hair outside the first cell
  if (first * cellM > min) first--;
  let count = Math.max(1, last - first);
  if ((first + count) * cellM < max) count++;
  return { first: first - marginCells, count: count + 2 * marginCells };
}

/**
 * How many cells a grid over `extent` would have, without allocating anything: for budget checks
 * before gridOver. Huge counts come back as numbers (possibly Infinity), never as an error.
 * Example: gridSize([0, 0, 1e6, 1e6], 0.01).cells === 1e16
 */
export function gridSize(extent: ExtentM, cellM: number, marginCells = 0): GridSize {
  checkCellM(cellM);
  checkMargin(marginCells);
  checkExtent(extent);
  const x = axis(extent[0], extent[2], cellM, marginCells);
  const y = axis(extent[1], extent[3], cellM, marginCells);
  return { columns: x.count, rows: y.count, cells: x.count * y.count };
}

/** Bounding box of the zones' outer rings; throws when there are none. */
export function zonesExtent(polygons: ZonePolygons): ExtentM {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const rings of polygons.rings) {
    const r = rings[0];
    for (let i = 0; i < r.length; i += 2) {
      if (r[i] < minX) minX = r[i];
      if (r[i] > maxX) maxX = r[i];
      if (r[i + 1] < minY) minY = r[i + 1];
      if (r[i + 1] > maxY) maxY = r[i + 1];
    }
  }
  if (!(minX <= maxX)) throw new Error(`Cannot lay a grid over ${polygons.count} zone polygons: no vertices.`);
  return [minX, minY, maxX, maxY];
}

/**
 * A grid covering an extent or the zones' outer rings, with marginCells extra cells on every
 * side (default 0). Throws when cellM is not a positive finite number or the grid would have more
 * than MAX_GRID_CELLS cells; call gridSize first to check a memory budget.
 * Example: gridOver([0, 0, 1000, 500], 100) -> { originX: 0, originY: 0, columns: 10, rows: 5, cells: 50, cellM: 100 }
 */
export function gridOver(area: ExtentM | ZonePolygons, cellM: number, marginCells = 0): Grid {
  checkCellM(cellM);
  const extent = 'rings' in area ? zonesExtent(area) : area;
  const size = gridSize(extent, cellM, marginCells);
  if (!(size.cells <= MAX_GRID_CELLS)) throw new Error(`A grid of ${size.columns} x ${size.rows} = ${size.cells} cells of ${cellM} m exceeds the limit of ${MAX_GRID_CELLS} cells.`);
  const { first: firstColumn } = axis(extent[0], extent[2], cellM, marginCells);
  const { first: firstRow } = axis(extent[1], extent[3], cellM, marginCells);
  return { originX: firstColumn * cellM, originY: firstRow * cellM, columns: size.columns, rows: size.rows, cells: size.cells, cellM };
}

/** Index of the cell holding point (x, y), or -1 outside the grid. */
export function cellAt(grid: Grid, x: number, y: number): number {
  const c = Math.floor((x - grid.originX) / grid.cellM);
  const r = Math.floor((y - grid.originY) / grid.cellM);
  return c >= 0 && c < grid.columns && r >= 0 && r < grid.rows ? r * grid.columns + c : -1;
}
