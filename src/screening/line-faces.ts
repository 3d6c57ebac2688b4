// Where a line really runs inside the cells it is burned into, for the district solve's subgrid
// correction (see fixedFaceScale in hydraulics/district-solver.ts): for each face between a line
// cell (fixed, or bed) and a free cell, the distance d from the free cell's centre to the line along the axis
// through both centres, and the face's scale cellM / d.
import type { BurnedLines } from '../geometry/grid-burn.js';
import type { Grid } from '../geometry/grid.js';
import type { LineTable } from '../geometry/lines.js';
import { CELL_BED, CELL_FIXED, CELL_FREE } from '../hydraulics/district-solver.js';

/**
 * The distance is looked for up to MAX_REACH cells from the free cell's centre; a line that cuts
 * only a corner of its cell may cross the axis in the next cell. Nearer than MIN_REACH cells would
 * put the line inside the free cell itself, which the burn rules out; both bound the scale.
 */
const MAX_REACH = 2;
const MIN_REACH = 0.5;

/**
 * Face scales of the grid (1 where no correction applies). Walks every segment of every line in
 * pieces of at most half a cell and tests the faces of the line's own cells around each piece.
 */
export function lineFaceScales(grid: Grid, cellKind: Uint8Array, burned: BurnedLines, table: LineTable): { east: Float64Array; north: Float64Array } {
  const { columns, rows, cellM, originX, originY } = grid;
  // distance (in cells) found per face and direction: faces of a fixed cell seen from its free neighbour
  const east = new Float64Array(grid.cells).fill(Infinity);
  const north = new Float64Array(grid.cells).fill(Infinity);

  // the ray from the free cell's centre (cx, cy) along (dx, dy), in cells, against segment a-b; returns its length or Infinity
  const rayHit = (cx: number, cy: number, dx: number, dy: number, ax: number, ay: number, bx: number, by: number): number => {
    const ex = bx - ax, ey = by - ay;
    const denominator = dx * ey - dy * ex;
    if (denominator === 0) {
      // the segment runs along the ray: its nearer end ahead of the centre, if it lies on the ray
      if ((ax - cx) * dy - (ay - cy) * dx !== 0) return Infinity;
      const sa = (ax - cx) * dx + (ay - cy) * dy, sb = (bx - cx) * dx + (by - cy) * dy;
      const s = Math.min(sa >= 0 ? sa : Infinity, sb >= 0 ? sb : Infinity);
      return s;
    }
    const t = ((ax - cx) * dy - (ay - cy) * dx) / denominator;
    if (t < 0 || t > 1) return Infinity;
    const s = ((ax - cx) * ey - (ay - cy) * ex) / denominator;
    return s >= 0 ? s : Infinity;
  };

  for (let l = 0; l < table.lineCount; l++) {
    for (let part = table.linePartStart[l]; part < table.linePartStart[l + 1]; part++) {
      for (let v = table.partVertexStart[part]; v + 1 < table.partVertexStart[part + 1]; v++) {
        // the segment in grid units: cell (c, r) is [c, c + 1) x [r, r + 1), its centre (c + 0.5, r + 0.5)
        const ax = (table.x[v] - originX) / cellM, ay = (table.y[v] - originY) / cellM;
        const bx = (table.x[v + 1] - originX) / cellM, by = (table.y[v + 1] - originY) / cellM;
        const pieces = Math.max(1, Math.ceil(2 * Math.hypot(bx - ax, by - ay)));
        let lastC = NaN, lastR = NaN;
        for (let k = 0; k <= pieces; k++) {
          const c0 = Math.floor(ax + ((bx - ax) * k) / pieces), r0 = Math.floor(ay + ((by - ay) * k) / pieces);
          if (c0 === lastC && r0 === lastR) continue;
          lastC = c0;
          lastR = r0;
          for (let r = r0 - 1; r <= r0 + 1; r++) {
            if (r < 0 || r >= rows) continue;
            for (let c = c0 - 1; c <= c0 + 1; c++) {
              if (c < 0 || c >= columns) continue;
              const j = r * columns + c;
              // a bed cell's head is the water table where the line runs, so its faces take the same correction
              if ((cellKind[j] !== CELL_FIXED && cellKind[j] !== CELL_BED) || burned.line[j] !== l) continue;
              // the four free neighbours of the line cell j, each looking at j
              if (c > 0 && cellKind[j - 1] === CELL_FREE) {
                const d = rayHit(c - 0.5, r + 0.5, 1, 0, ax, ay, bx, by);
                if (d < east[j - 1]) east[j - 1] = d;
              }
              if (c + 1 < columns && cellKind[j + 1] === CELL_FREE) {
                const d = rayHit(c + 1.5, r + 0.5, -1, 0, ax, ay, bx, by);
                if (d < east[j]) east[j] = d;
              }
              if (r > 0 && cellKind[j - columns] === CELL_FREE) {
                const d = rayHit(c + 0.5, r - 0.5, 0, 1, ax, ay, bx, by);
                if (d < north[j - columns]) north[j - columns] = d;
              }
              if (r + 1 < rows && cellKind[j + columns] === CELL_FREE) {
                const d = rayHit(c + 0.5, r + 1.5, 0, -1, ax, ay, bx, by);
                if (d < north[j]) north[j] = d;
              }
            }
          }
        }
      }
    }
  }
  // distance -> scale: cellM / d, 1 where the line was not met within reach
  for (const scale of [east, north]) {
    for (let g = 0; g < scale.length; g++) {
      const d = scale[g];
      scale[g] = d <= MAX_REACH ? 1 / (d < MIN_REACH ? MIN_REACH : d) : 1;
    }
  }
  return { east, north };
}
