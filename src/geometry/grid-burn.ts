import type { Grid } from './grid.js';
import { type LineGeometry, asLineTable, type LineTable } from './lines.js';

export interface BurnedLines {
  /** line index of each cell, -1 where no line passes */
  line: Int32Array;
  /** chainage (m) on that line of its point nearest the cell centre, among its points in the cell; NaN where no line passes */
  chainageM: Float64Array;
  /** length (m) of that line inside the cell; 0 where no line passes */
  lengthM: Float64Array;
  /** the burned cells, ascending */
  cells: Uint32Array;
  /** cells passed by more than one line; each went to the line passing nearest its centre */
  sharedCells: number;
  /** length of line (m) outside the grid, all lines together */
  outsideM: number;
}

/**
 * Passages of lines through cells, in the order they are found (by line, then chainage), in
 * typed arrays grown on demand. A passage is a stretch of one line inside one cell.
 */
class Passages {
  count = 0;
  cell: Int32Array = new Int32Array(4096);
  line: Int32Array = new Int32Array(4096);
  lengthM: Float64Array = new Float64Array(4096);
  distM: Float64Array = new Float64Array(4096);
  chainageM: Float64Array = new Float64Array(4096);

  add(cell: number, line: number, lengthM: number, distM: number, chainageM: number): void {
    const k = this.count - 1;
    // a vertex inside a cell splits one passage in two: join them again
    if (k >= 0 && this.cell[k] === cell && this.line[k] === line) {
      this.lengthM[k] += lengthM;
      if (distM < this.distM[k]) {
        this.distM[k] = distM;
        this.chainageM[k] = chainageM;
      }
      return;
    }
    if (this.count === this.cell.length) this.grow();
    const n = this.count++;
    this.cell[n] = cell;
    this.line[n] = line;
    this.lengthM[n] = lengthM;
    this.distM[n] = distM;
    this.chainageM[n] = chainageM;
  }

  private grow(): void {
    const size = this.cell.length * 2;
    const grow32 = (a: Int32Array): Int32Array => {
      const b = new Int32Array(size);
      b.set(a);
      return b;
    };
    const grow64 = (a: Float64Array): Float64Array => {
      const b = new Float64Array(size);
      b.set(a);
      return b;
    };
    this.cell = grow32(this.cell);
    this.line = grow32(this.line);
    this.lengthM = grow64(this.lengthM);
    this.distM = grow64(this.distM);
    this.chainageM = grow64(this.chainageM);
  }

  /**
   * Passage indices ordered by cell, then by the order found (so by line, then chainage): a
   * stable radix sort on the cell index, 16 bits at a time, costs passages + 2^16 per pass.
   */
  orderByCell(): Uint32Array {
    const n = this.count;
    const cell = this.cell;
    let order = new Uint32Array(n);
    let next = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    const counts = new Uint32Array(65537);
    for (let shift = 0; shift < 32; shift += 16) {
      counts.fill(0);
      for (let i = 0; i < n; i++) counts[((cell[i] >>> shift) & 0xffff) + 1]++;
      for (let b = 1; b <= 65536; b++) counts[b] += counts[b - 1];
      for (let i = 0; i < n; i++) {
        const k = order[i];
        next[counts[(cell[k] >>> shift) & 0xffff]++] = k;
      }
      [order, next] = [next, order];
    }
    return order;
  }
}

// the [tIn, tOut] of a segment inside the grid, narrowed by clip() one grid edge at a time
const range = new Float64Array(2);

/** Liang-Barsky: keeps the part of the segment where p * t <= q. */
function clip(p: number, q: number): void {
  if (p === 0) {
    if (q < 0) range[1] = -1;
  } else if (p < 0) range[0] = Math.max(range[0], q / p);
  else range[1] = Math.min(range[1], q / p);
}

/**
 * Burns lines into the grid: every cell a line passes through with some length (an exact
 * segment-by-cell traversal, so a diagonal skips no cell) gets the line's index, the chainage of
 * its point nearest the cell centre and its length inside the cell. Chainage runs on across a
 * line's parts, as in buildLineTable. Cells are half-open squares (see Grid): a line touching a
 * cell only at a corner has no length there and does not burn it, nor does one passing less than
 * a millionth of the cell through it (rounding); a line running exactly along
 * a row edge burns the row to its north. A cell passed by several lines goes to the line passing
 * nearest its centre (ties: lower line index) and holds that line's length only.
 * Example: burnLines(grid, [{ id: 'c1', parts: [Float64Array.from([0, 5, 100, 5])] }]).line
 */
export function burnLines(grid: Grid, lines: LineGeometry[] | LineTable): BurnedLines {
  const table = asLineTable(lines);
  const { originX, originY, cellM, columns, rows } = grid;
  const passages = new Passages();
  let outsideM = 0;

  for (let l = 0; l < table.lineCount; l++) {
    for (let part = table.linePartStart[l]; part < table.linePartStart[l + 1]; part++) {
      for (let v = table.partVertexStart[part]; v + 1 < table.partVertexStart[part + 1]; v++) {
        const segM = table.chainageM[v + 1] - table.chainageM[v];
        if (!(segM > 0)) continue;
        // grid units: cell widths from the origin, so cell (c, r) is [c, c + 1) x [r, r + 1)
        const u0 = (table.x[v] - originX) / cellM, v0 = (table.y[v] - originY) / cellM;
        const du = (table.x[v + 1] - originX) / cellM - u0, dv = (table.y[v + 1] - originY) / cellM - v0;

        // clip to the grid (Liang-Barsky), so a segment far outside costs nothing
        range[0] = 0;
        range[1] = 1;
        clip(-du, u0);
        clip(du, columns - u0);
        clip(-dv, v0);
        clip(dv, rows - v0);
        const tIn = range[0], tOut = range[1];
        if (!(tOut > tIn)) {
          outsideM += segM;
          continue;
        }
        outsideM += segM * (tIn + (1 - tOut));

        // walk the crossings of column and row edges in order of t; between two, one cell
        const stepU = du > 0 ? 1 : -1, stepV = dv > 0 ? 1 : -1;
        const uIn = u0 + tIn * du, vIn = v0 + tIn * dv;
        let edgeU = du > 0 ? Math.floor(uIn) + 1 : Math.ceil(uIn) - 1;
        let edgeV = dv > 0 ? Math.floor(vIn) + 1 : Math.ceil(vIn) - 1;
        const length2 = du * du + dv * dv;
        let tA = tIn;
        for (;;) {
          const tU = du !== 0 ? (edgeU - u0) / du : Infinity;
          const tV = dv !== 0 ? (edgeV - v0) / dv : Infinity;
          const tB = Math.min(tU, tV, tOut);
          if (tB > tA) {
            const tMid = (tA + tB) / 2;
            const c = Math.floor(u0 + tMid * du), r = Math.floor(v0 + tMid * dv);
            if (c < 0 || c >= columns || r < 0 || r >= rows) outsideM += (tB - tA) * segM;
            else {
              // the point of this stretch nearest the cell centre
              let t = ((c + 0.5 - u0) * du + (r + 0.5 - v0) * dv) / length2;
              t = t < tA ? tA : t > tB ? tB : t;
              const distM = Math.hypot(u0 + t * du - c - 0.5, v0 + t * dv - r - 0.5) * cellM;
              passages.add(r * columns + c, l, (tB - tA) * segM, distM, table.chainageM[v] + t * segM);
            }
          }
          if (tB >= tOut) break;
          if (tU === tB) edgeU += stepU;
          if (tV === tB) edgeV += stepV;
          tA = tB;
        }
      }
    }
  }
  return gather(grid, passages, outsideM);
}

/**
 * Length of line in a cell, as a fraction of the cell, below which the line only grazes it: a line
 * along a cell edge lands a few 1e-10 m on either side after projecting to lon/lat and back.
 */
const SLIVER = 1e-6;

/** One line per cell from the passages: sum each line's passages, keep its nearest point, pick the nearest line. */
function gather(grid: Grid, p: Passages, outsideM: number): BurnedLines {
  const line = new Int32Array(grid.cells).fill(-1);
  const chainageM = new Float64Array(grid.cells).fill(NaN);
  const lengthM = new Float64Array(grid.cells);
  const order = p.orderByCell();
  const n = p.count, pCell = p.cell, pLine = p.line, pLength = p.lengthM, pDist = p.distM, pChainage = p.chainageM;
  const cells = new Uint32Array(n);
  let cellCount = 0, sharedCells = 0;
  let k = 0;
  while (k < n) {
    const cell = pCell[order[k]];
    let bestLine = -1, bestDist = Infinity, bestChainage = NaN, bestLength = 0, lineCount = 0;
    while (k < n && pCell[order[k]] === cell) {
      // passages of one line in this cell, in chainage order: ties keep the lower chainage
      const l = pLine[order[k]];
      let length = 0, dist = Infinity, chainage = NaN;
      for (; k < n && pCell[order[k]] === cell && pLine[order[k]] === l; k++) {
        const i = order[k];
        length += pLength[i];
        if (pDist[i] < dist) {
          dist = pDist[i];
          chainage = pChainage[i];
        }
      }
      // a line that only grazes the cell (an edge or corner missed by rounding of the projection) does not burn it
      if (length < SLIVER * grid.cellM) continue;
      lineCount++;
      // lines come in index order, so strict < gives ties to the lower index
      if (dist < bestDist) {
        bestLine = l;
        bestDist = dist;
        bestChainage = chainage;
        bestLength = length;
      }
    }
    if (lineCount === 0) continue;
    if (lineCount > 1) sharedCells++;
    line[cell] = bestLine;
    chainageM[cell] = bestChainage;
    lengthM[cell] = bestLength;
    cells[cellCount++] = cell;
  }
  return { line, chainageM, lengthM, cells: cells.slice(0, cellCount), sharedCells, outsideM };
}
