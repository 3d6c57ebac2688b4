import type { Grid } from './grid.js';
import type { ZonePolygons } from './zones.js';

/** Called with row and the columns [c0, c1) of cells whose centres lie inside. */
type SpanFn = (row: number, c0: number, c1: number) => void;

/**
 * Scanline fill: each edge adds its crossings with the rows' centre lines, the crossings of a row
 * are sorted, and pairs of them bound runs of cells (even-odd, so holes need no special case).
 * The cost is crossings + cells, whatever the number of polygons. Scratch arrays are grown on
 * demand and reused from one polygon to the next.
 */
class Scanner {
  // crossings per row (as a difference array, then as start offsets) for the polygon's rows
  private rowStart: Int32Array;
  private xs = new Float64Array(256);
  private u = new Float64Array(64);
  private v = new Float64Array(64);

  constructor(private readonly grid: Grid) {
    this.rowStart = new Int32Array(grid.rows + 2);
  }

  /** Rings in grid units (cell widths from the origin), all rings of a polygon one after another. */
  private load(rings: Float64Array[], label: string): { count: number; vMin: number; vMax: number } {
    const { originX, originY, cellM } = this.grid;
    let n = 0;
    for (const r of rings) {
      if (r.length % 2 !== 0) throw new Error(`${label} has a ring with an odd number of coordinates: ${r.length}.`);
      n += r.length / 2;
    }
    if (this.u.length < n) {
      this.u = new Float64Array(n * 2);
      this.v = new Float64Array(n * 2);
    }
    let vMin = Infinity, vMax = -Infinity, k = 0;
    for (const r of rings) {
      for (let i = 0; i < r.length; i += 2, k++) {
        if (!Number.isFinite(r[i]) || !Number.isFinite(r[i + 1])) throw new Error(`${label} has a non-finite coordinate: ${Number.isFinite(r[i]) ? r[i + 1] : r[i]}.`);
        const v = (r[i + 1] - originY) / cellM;
        this.u[k] = (r[i] - originX) / cellM;
        this.v[k] = v;
        if (v < vMin) vMin = v;
        if (v > vMax) vMax = v;
      }
    }
    return { count: n, vMin, vMax };
  }

  scan(rings: Float64Array[], label: string, span: SpanFn): void {
    const { rows, columns } = this.grid;
    const { vMin, vMax } = this.load(rings, label);
    // rows whose centre line v = row + 0.5 satisfies vMin <= v < vMax, the half-open rule of the
    // crossing test in zones.ts; every edge uses the same rule, so each ring crosses a row an even number of times
    const r0 = Math.max(0, Math.ceil(vMin - 0.5));
    const r1 = Math.min(rows, Math.ceil(vMax - 0.5));
    if (r1 <= r0) return;
    const starts = this.rowStart;
    starts.fill(0, 0, r1 - r0 + 2);
    const u = this.u, v = this.v;

    let total = 0;
    this.eachEdge(rings, (i, j) => {
      const lo = Math.min(v[i], v[j]), hi = Math.max(v[i], v[j]);
      const a = Math.max(r0, Math.ceil(lo - 0.5)), b = Math.min(r1, Math.ceil(hi - 0.5));
      if (b <= a) return;
      starts[a - r0 + 1]++;
      starts[b - r0 + 1]--;
      total += b - a;
    });
    // difference array -> crossings per row -> offset of each row's first crossing
    for (let k = 1; k <= r1 - r0; k++) starts[k] += starts[k - 1];
    let offset = 0;
    for (let k = 0; k <= r1 - r0; k++) {
      const c = starts[k];
      starts[k] = offset;
      offset += c;
    }
    if (this.xs.length < total) this.xs = new Float64Array(total * 2);
    const xs = this.xs;

    // starts[k + 1] serves as the write cursor of row k; once filled it is row k + 1's start
    this.eachEdge(rings, (i, j) => {
      const lo = Math.min(v[i], v[j]), hi = Math.max(v[i], v[j]);
      const a = Math.max(r0, Math.ceil(lo - 0.5)), b = Math.min(r1, Math.ceil(hi - 0.5));
      if (b <= a) return;
      const slope = (u[j] - u[i]) / (v[j] - v[i]);
      const uLo = Math.min(u[i], u[j]), uHi = Math.max(u[i], u[j]);
      for (let r = a; r < b; r++) {
        const x = u[i] + (r + 0.5 - v[i]) * slope;
        xs[starts[r - r0 + 1]++] = x < uLo ? uLo : x > uHi ? uHi : x;
      }
    });

    for (let r = r0; r < r1; r++) {
      const from = starts[r - r0], to = starts[r - r0 + 1];
      sortRange(xs, from, to);
      for (let k = from; k + 1 < to; k += 2) {
        // centre column + 0.5 inside [xs[k], xs[k + 1])
        const c0 = Math.max(0, Math.ceil(xs[k] - 0.5));
        const c1 = Math.min(columns, Math.ceil(xs[k + 1] - 0.5));
        if (c1 > c0) span(r, c0, c1);
      }
    }
  }

  private eachEdge(rings: Float64Array[], edge: (i: number, j: number) => void): void {
    let first = 0;
    for (const r of rings) {
      const n = r.length / 2;
      for (let k = 0; k < n; k++) edge(first + k, first + ((k + 1) % n));
      first += n;
    }
  }
}

/** Insertion sort for the few crossings of a typical row; the native sort for many. */
function sortRange(a: Float64Array, from: number, to: number): void {
  if (to - from > 32) {
    a.subarray(from, to).sort();
    return;
  }
  for (let i = from + 1; i < to; i++) {
    const x = a[i];
    let j = i - 1;
    while (j >= from && a[j] > x) {
      a[j + 1] = a[j];
      j--;
    }
    a[j + 1] = x;
  }
}

export interface ZoneCells {
  /** zone index of each cell (by its centre), -1 outside every zone */
  zone: Int32Array;
  /** cells whose centre lies inside polygons of more than one zone (given to the lowest zone index) */
  overlapCells: number;
}

/**
 * The zone of every cell, by the cell centre, with the rule of cutTransect: where zones overlap
 * the lowest zone index wins; polygons of one zone (a MultiPolygon) are simply its union.
 * Example: fillZones(gridOver(polygons, 50), polygons).zone[0]
 */
export function fillZones(grid: Grid, polygons: ZonePolygons): ZoneCells {
  const zone = new Int32Array(grid.cells).fill(-1);
  // allocated only when zones overlap, to count each shared cell once
  let mixed: Uint8Array | null = null;
  let overlapCells = 0;
  let z = 0;
  const { columns } = grid;
  const span: SpanFn = (row, c0, c1) => {
    for (let c = row * columns + c0, end = row * columns + c1; c < end; c++) {
      const current = zone[c];
      if (current < 0) zone[c] = z;
      else if (current !== z) {
        mixed ??= new Uint8Array(grid.cells);
        if (mixed[c] === 0) {
          mixed[c] = 1;
          overlapCells++;
        }
        if (z < current) zone[c] = z;
      }
    }
  };
  const scanner = new Scanner(grid);
  for (let p = 0; p < polygons.count; p++) {
    z = polygons.zone[p];
    scanner.scan(polygons.rings[p], `Zone ${z}`, span);
  }
  return { zone, overlapCells };
}

export interface PolygonCells {
  /** cells of polygon p are cell[start[p]] .. cell[start[p + 1] - 1]; length polygons + 1 */
  start: Uint32Array;
  /** cell indices, ascending within each polygon */
  cell: Uint32Array;
}

/**
 * The cells whose centres lie inside each polygon (rings: outer then holes, interleaved x,y,
 * closed or not), e.g. to sum a raster over each strip: sum += raster[cell[k]] * cellM^2.
 * Example: polygonCells(grid, strips.map((s) => [s.ringM]))
 */
export function polygonCells(grid: Grid, polygons: Float64Array[][]): PolygonCells {
  const start = new Uint32Array(polygons.length + 1);
  let cell = new Uint32Array(1024);
  let n = 0;
  const { columns } = grid;
  const span: SpanFn = (row, c0, c1) => {
    if (n + c1 - c0 > cell.length) {
      const grown = new Uint32Array(Math.max(cell.length * 2, n + c1 - c0));
      grown.set(cell.subarray(0, n));
      cell = grown;
    }
    for (let c = row * columns + c0, end = row * columns + c1; c < end; c++) cell[n++] = c;
  };
  const scanner = new Scanner(grid);
  polygons.forEach((rings, p) => {
    start[p] = n;
    scanner.scan(rings, `Polygon ${p}`, span);
  });
  start[polygons.length] = n;
  return { start, cell: cell.slice(0, n) };
}
