import Flatbush from 'flatbush';

/** Ring helpers on interleaved x,y arrays; a ring here is open (the first vertex is not repeated). */

/** Twice the signed area; positive for a counter-clockwise ring. */
export function signedArea2(ring: Float64Array): number {
  const n = ring.length / 2;
  let sum = 0;
  for (let i = 0, j = n - 1; i < n; j = i++) sum += ring[2 * j] * ring[2 * i + 1] - ring[2 * i] * ring[2 * j + 1];
  return sum;
}

/** Drops vertices equal to the one before, and a last vertex equal to the first. */
export function dropRepeats(ring: Float64Array): Float64Array {
  const out = new Float64Array(ring.length);
  let m = 0;
  for (let i = 0; i < ring.length; i += 2) {
    if (m > 0 && out[m - 2] === ring[i] && out[m - 1] === ring[i + 1]) continue;
    out[m++] = ring[i];
    out[m++] = ring[i + 1];
  }
  while (m >= 4 && out[m - 2] === out[0] && out[m - 1] === out[1]) m -= 2;
  return out.slice(0, m);
}

export function reverseRing(ring: Float64Array): Float64Array {
  const n = ring.length / 2;
  const out = new Float64Array(ring.length);
  for (let i = 0; i < n; i++) {
    out[2 * i] = ring[2 * (n - 1 - i)];
    out[2 * i + 1] = ring[2 * (n - 1 - i) + 1];
  }
  return out;
}

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
}

function onSegment(ax: number, ay: number, bx: number, by: number, px: number, py: number): boolean {
  return Math.min(ax, bx) <= px && px <= Math.max(ax, bx) && Math.min(ay, by) <= py && py <= Math.max(ay, by);
}

function segmentsTouch(r: Float64Array, i: number, j: number, n: number): boolean {
  const i2 = (i + 1) % n, j2 = (j + 1) % n;
  const ax = r[2 * i], ay = r[2 * i + 1], bx = r[2 * i2], by = r[2 * i2 + 1];
  const cx = r[2 * j], cy = r[2 * j + 1], dx = r[2 * j2], dy = r[2 * j2 + 1];
  const o1 = orient(ax, ay, bx, by, cx, cy), o2 = orient(ax, ay, bx, by, dx, dy);
  const o3 = orient(cx, cy, dx, dy, ax, ay), o4 = orient(cx, cy, dx, dy, bx, by);
  if (((o1 > 0 && o2 < 0) || (o1 < 0 && o2 > 0)) && ((o3 > 0 && o4 < 0) || (o3 < 0 && o4 > 0))) return true;
  return (
    (o1 === 0 && onSegment(ax, ay, bx, by, cx, cy)) ||
    (o2 === 0 && onSegment(ax, ay, bx, by, dx, dy)) ||
    (o3 === 0 && onSegment(cx, cy, dx, dy, ax, ay)) ||
    (o4 === 0 && onSegment(cx, cy, dx, dy, bx, by))
  );
}

/**
 * True when no two edges of the ring meet except neighbours at their shared vertex, and no
 * neighbours fold back over each other. Edges are indexed so a long ring costs n log n.
 */
export function ringIsSimple(r: Float64Array): boolean {
  const n = r.length / 2;
  if (n < 3) return false;
  const tree = new Flatbush(n);
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    tree.add(Math.min(r[2 * i], r[2 * j]), Math.min(r[2 * i + 1], r[2 * j + 1]), Math.max(r[2 * i], r[2 * j]), Math.max(r[2 * i + 1], r[2 * j + 1]));
  }
  tree.finish();
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    // a neighbour that doubles back along the same line makes a zero-width spike
    const k = (i + 2) % n;
    const cross = orient(r[2 * i], r[2 * i + 1], r[2 * j], r[2 * j + 1], r[2 * k], r[2 * k + 1]);
    const dot = (r[2 * j] - r[2 * i]) * (r[2 * k] - r[2 * j]) + (r[2 * j + 1] - r[2 * i + 1]) * (r[2 * k + 1] - r[2 * j + 1]);
    if (cross === 0 && dot < 0) return false;
    const hits = tree.search(
      Math.min(r[2 * i], r[2 * j]), Math.min(r[2 * i + 1], r[2 * j + 1]), Math.max(r[2 * i], r[2 * j]), Math.max(r[2 * i + 1], r[2 * j + 1]),
      (e) => e > i + 1 && !(i === 0 && e === n - 1) && segmentsTouch(r, i, e, n),
    );
    if (hits.length > 0) return false;
  }
  return signedArea2(r) !== 0;
}

/** Convex hull (Andrew's monotone chain), counter-clockwise, open. */
export function convexHull(points: Float64Array): Float64Array {
  const n = points.length / 2;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => points[2 * a] - points[2 * b] || points[2 * a + 1] - points[2 * b + 1]);
  const hull: number[] = [];
  const build = (seq: number[]): void => {
    const start = hull.length;
    for (const i of seq) {
      while (hull.length >= start + 2) {
        const a = hull[hull.length - 2], b = hull[hull.length - 1];
        if (orient(points[2 * a], points[2 * a + 1], points[2 * b], points[2 * b + 1], points[2 * i], points[2 * i + 1]) > 0) break;
        hull.pop();
      }
      hull.push(i);
    }
    hull.pop();
  };
  build(order);
  build(order.slice().reverse());
  const out = new Float64Array(hull.length * 2);
  hull.forEach((i, k) => {
    out[2 * k] = points[2 * i];
    out[2 * k + 1] = points[2 * i + 1];
  });
  return out;
}

/** Even-odd test of a point against rings of interleaved x, y (an outer ring and its holes). */
export function pointInRings(x: number, y: number, rings: readonly Float64Array[]): boolean {
  let inside = false;
  for (const ring of rings) {
    const n = ring.length / 2;
    for (let i = 0, j = n - 1; i < n; j = i++) {
      const xi = ring[2 * i], yi = ring[2 * i + 1], xj = ring[2 * j], yj = ring[2 * j + 1];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
    }
  }
  return inside;
}
