import Flatbush from 'flatbush';

/**
 * Self-intersection and spike checks of a polygon's rings (positions as [x, y], each ring closed:
 * its last position repeats the first), by an index over the rings' segments: each segment's box is
 * searched against the others, so a ring of n vertices costs about n log n, not n^2. They give the
 * answers of turf's kinks (7.4) and of the spike test in its booleanValid, pair by pair with the
 * same arithmetic, so the same rings pass and the first crossing is the same point.
 */

/** Segments of all rings: the box search is widened by this share of the coordinates' size, for rounding. */
const SLACK = 1e-9;

interface Segments {
  /** ring and index (in its ring) of each segment, by global number */
  ring: Uint32Array;
  index: Uint32Array;
  tree: Flatbush;
}

function indexSegments(rings: number[][][]): Segments {
  let count = 0;
  for (const r of rings) count += Math.max(0, r.length - 1);
  const ring = new Uint32Array(count), index = new Uint32Array(count);
  const tree = new Flatbush(Math.max(1, count));
  let k = 0;
  rings.forEach((r, ri) => {
    for (let i = 0; i + 1 < r.length; i++, k++) {
      ring[k] = ri;
      index[k] = i;
      tree.add(Math.min(r[i][0], r[i + 1][0]), Math.min(r[i][1], r[i + 1][1]), Math.max(r[i][0], r[i + 1][0]), Math.max(r[i][1], r[i + 1][1]));
    }
  });
  if (count === 0) tree.add(Infinity, Infinity, Infinity, Infinity);
  tree.finish();
  return { ring, index, tree };
}

/** turf kinks' segment test, operand for operand: the crossing point, or null. */
function crossing(ax: number, ay: number, bx: number, by: number, cx: number, cy: number, dx: number, dy: number): [number, number] | null {
  const denominator = (dy - cy) * (bx - ax) - (dx - cx) * (by - ay);
  if (denominator === 0) return null;
  const a0 = ay - cy, b0 = ax - cx;
  const a = ((dx - cx) * a0 - (dy - cy) * b0) / denominator;
  const b = ((bx - ax) * a0 - (by - ay) * b0) / denominator;
  if (a >= 0 && a <= 1 && b >= 0 && b <= 1) return [ax + a * (bx - ax), ay + a * (by - ay)];
  return null;
}

/** Whether turf's kinks tests segment i of ring r1 against segment k of ring r2 (in that order). */
function kinksTests(rings: number[][][], r1: number, i: number, r2: number, k: number): boolean {
  if (k < i) return false;
  if (r1 !== r2) return true;
  const line = rings[r1];
  if (Math.abs(i - k) === 1) return false;
  const closed = line[0][0] === line[line.length - 1][0] && line[0][1] === line[line.length - 1][1];
  return !(i === 0 && k === line.length - 2 && closed);
}

/**
 * The first crossing turf's kinks would list for these rings (rings in the order of its loops,
 * then segments), or null when it lists none.
 * Example: firstKink([[[0, 0], [2, 2], [2, 0], [0, 2], [0, 0]]]) gives [1, 1]
 */
export function firstKink(rings: number[][][]): [number, number] | null {
  const { ring, index, tree } = indexSegments(rings);
  let best: [number, number, number, number] | null = null;
  let point: [number, number] | null = null;
  // the order of turf's loops: ring of the first segment, ring of the second, then their indices
  const earlier = (r1: number, r2: number, i: number, k: number): boolean =>
    best === null || r1 < best[0] || (r1 === best[0] && (r2 < best[1] || (r2 === best[1] && (i < best[2] || (i === best[2] && k < best[3])))));
  const tryPair = (r1: number, i: number, r2: number, k: number): void => {
    if (!kinksTests(rings, r1, i, r2, k) || !earlier(r1, r2, i, k)) return;
    const p = rings[r1][i], q = rings[r1][i + 1], s = rings[r2][k], t = rings[r2][k + 1];
    const hit = crossing(p[0], p[1], q[0], q[1], s[0], s[1], t[0], t[1]);
    if (hit === null) return;
    best = [r1, r2, i, k];
    point = hit;
  };
  for (let g = 0; g < ring.length; g++) {
    const r1 = ring[g], i = index[g];
    const p = rings[r1][i], q = rings[r1][i + 1];
    const slack = SLACK * (Math.abs(p[0]) + Math.abs(p[1]) + Math.abs(q[0]) + Math.abs(q[1])) + Number.MIN_VALUE;
    tree.search(Math.min(p[0], q[0]) - slack, Math.min(p[1], q[1]) - slack, Math.max(p[0], q[0]) + slack, Math.max(p[1], q[1]) + slack, (h) => {
      // each pair in each order turf tries it, as its arithmetic is not symmetric to the last bit
      tryPair(r1, i, ring[h], index[h]);
      return false;
    });
  }
  return point;
}

/** turf booleanPointOnLine's test of a point on one segment, end points included. */
function onSegment(x1: number, y1: number, x2: number, y2: number, x: number, y: number): boolean {
  const dxl = x2 - x1, dyl = y2 - y1;
  if ((x - x1) * dyl - (y - y1) * dxl !== 0) return false;
  if (Math.abs(dxl) === Math.abs(dyl) && Math.abs(dxl) === 0) return x === x1 && y === y1;
  if (Math.abs(dxl) >= Math.abs(dyl)) return dxl > 0 ? x1 <= x && x <= x2 : x2 <= x && x <= x1;
  return dyl > 0 ? y1 <= y && y <= y2 : y2 <= y && y <= y1;
}

/**
 * The spike test of turf's booleanValid on one closed ring: true when a vertex lies on a later
 * segment (all but the closing one), as where the ring doubles back on itself.
 * Example: ringHasSpike([[0, 0], [2, 0], [1, 0], [1, 1], [0, 0]]) is true
 */
export function ringHasSpike(ring: number[][]): boolean {
  const { tree } = indexSegments([ring]);
  for (let i = 0; i < ring.length - 1; i++) {
    const [x, y] = ring[i];
    const slack = SLACK * (Math.abs(x) + Math.abs(y)) + Number.MIN_VALUE;
    const hits = tree.search(x - slack, y - slack, x + slack, y + slack, (ii) =>
      ii >= i + 1 && ii < ring.length - 2 && onSegment(ring[ii][0], ring[ii][1], ring[ii + 1][0], ring[ii + 1][1], x, y),
    );
    if (hits.length > 0) return true;
  }
  return false;
}

/**
 * The points where a hole's segments meet the shell's (both orders of turf's segment test, each
 * point once), as turf's lineIntersect counts them in booleanValid: more than one makes the polygon
 * invalid. Example: holeMeetsShell(shell, hole) gives 0 for a hole well inside its shell
 */
export function holeMeetsShell(shell: number[][], hole: number[][]): number {
  const { index, tree } = indexSegments([shell]);
  const points = new Set<string>();
  for (let k = 0; k + 1 < hole.length; k++) {
    const [cx, cy] = hole[k], [dx, dy] = hole[k + 1];
    const slack = SLACK * (Math.abs(cx) + Math.abs(cy) + Math.abs(dx) + Math.abs(dy)) + Number.MIN_VALUE;
    tree.search(Math.min(cx, dx) - slack, Math.min(cy, dy) - slack, Math.max(cx, dx) + slack, Math.max(cy, dy) + slack, (h) => {
      const i = index[h];
      const [ax, ay] = shell[i], [bx, by] = shell[i + 1];
      const hit = crossing(ax, ay, bx, by, cx, cy, dx, dy) ?? crossing(cx, cy, dx, dy, ax, ay, bx, by);
      if (hit !== null) points.add(hit.join(','));
      return false;
    });
  }
  return points.size;
}
