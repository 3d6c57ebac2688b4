// From work-CRS metres to SVG path data at the drawn scale: y flipped (north up), vertices that
// add nothing at that scale dropped, coordinates in tenths of a pixel. Relative moves
// are taken between rounded points, so rounding never adds up along a long line.

/** Metres to drawing units: x grows east, y grows down (south). */
export interface MapView {
  minX: number;
  maxY: number;
  pxPerM: number;
  padPx: number;
  widthPx: number;
  heightPx: number;
}

/**
 * A view that fits the box [minX, minY, maxX, maxY] (m) into widthPx, with padPx all round and a
 * band of bandPx below the data (for the scale bar and north arrow).
 */
export function fitView(bounds: [number, number, number, number], widthPx: number, padPx: number, maxHeightPx: number, bandPx = 0): MapView {
  const [minX, minY, maxX, maxY] = bounds;
  const spanX = Math.max(maxX - minX, 1), spanY = Math.max(maxY - minY, 1);
  const pxPerM = Math.min((widthPx - 2 * padPx) / spanX, (maxHeightPx - 2 * padPx - bandPx) / spanY);
  return {
    minX,
    maxY,
    pxPerM,
    padPx,
    widthPx,
    heightPx: Math.ceil(spanY * pxPerM + 2 * padPx + bandPx),
  };
}

/** Tenths of a pixel, as integers. */
export function tenthX(view: MapView, x: number): number {
  return Math.round(((x - view.minX) * view.pxPerM + view.padPx) * 10);
}

export function tenthY(view: MapView, y: number): number {
  return Math.round(((view.maxY - y) * view.pxPerM + view.padPx) * 10);
}

function tenths(t: number): string {
  return String(t / 10);
}

/** Squared distance from (px, py) to the segment (ax, ay)-(bx, by). */
function segmentDistance2(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax, dy = by - ay;
  const length2 = dx * dx + dy * dy;
  let t = length2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / length2 : 0;
  t = t < 0 ? 0 : t > 1 ? 1 : t;
  const ex = ax + t * dx - px, ey = ay + t * dy - py;
  return ex * ex + ey * ey;
}

/**
 * Marks the vertices that keep a polyline within `tolerance` of itself: Ramer (1972),
 * Douglas and Peucker (1973) [from memory], with a stack instead of recursion.
 */
export function simplifyMarks(xs: ArrayLike<number>, ys: ArrayLike<number>, tolerance: number): Uint8Array {
  const keep = new Uint8Array(xs.length);
  keep[0] = keep[xs.length - 1] = 1;
  const stack = [0, xs.length - 1];
  const tolerance2 = tolerance * tolerance;
  while (stack.length > 0) {
    const last = stack.pop() as number, first = stack.pop() as number;
    let worst = -1, worst2 = tolerance2;
    for (let i = first + 1; i < last; i++) {
      const d2 = segmentDistance2(xs[i], ys[i], xs[first], ys[first], xs[last], ys[last]);
      if (d2 > worst2) { worst2 = d2; worst = i; }
    }
    if (worst > 0) {
      keep[worst] = 1;
      stack.push(first, worst, worst, last);
    }
  }
  return keep;
}

/**
 * Path data for an interleaved [x0, y0, x1, y1, ...] run of metres, from vertex `from` to `to`
 * (exclusive), simplified for drawing: vertices closer than minStepPx (in x and in y) to the last
 * one kept are dropped, then those within minStepPx / 2 of the simplified line. Closed rings end in
 * "z" and keep at least three vertices, so every strip is drawn.
 * Example: with 1 px per m, pathData(view, [0, 0, 0.3, 0, 5, 0], 1, false) is "M<x> <y>l5 0".
 */
export function pathData(view: MapView, coords: ArrayLike<number>, minStepPx: number, closed: boolean, from = 0, to = coords.length / 2): string {
  if (to - from < 2) return '';
  const minStep = minStepPx * 10;
  const xs: number[] = [], ys: number[] = [];
  // a closed ring repeats its first vertex last; it is closed by "z" instead
  const end = closed && coords[2 * from] === coords[2 * (to - 1)] && coords[2 * from + 1] === coords[2 * (to - 1) + 1] ? to - 1 : to;
  for (let i = from; i < end; i++) {
    const x = tenthX(view, coords[2 * i]), y = tenthY(view, coords[2 * i + 1]);
    const near = xs.length > 0 && Math.abs(x - xs[xs.length - 1]) < minStep && Math.abs(y - ys[ys.length - 1]) < minStep;
    if (near && !(i === end - 1 && !closed)) continue;
    // an open line ends where it ends: its last vertex replaces a near one kept before it
    if (near && xs.length > 1) { xs.pop(); ys.pop(); }
    xs.push(x);
    ys.push(y);
  }
  if (closed) { xs.push(xs[0]); ys.push(ys[0]); }
  const keep = simplifyMarks(xs, ys, minStep / 2);
  const keptX: number[] = [], keptY: number[] = [];
  for (let i = 0; i < xs.length - (closed ? 1 : 0); i++) {
    if (keep[i]) { keptX.push(xs[i]); keptY.push(ys[i]); }
  }
  if (closed && keptX.length < 3) {
    // a ring smaller than the step: keep three of its own vertices spread round it
    keptX.length = 0;
    keptY.length = 0;
    const n = end - from;
    for (const k of [0, Math.floor(n / 3), Math.floor((2 * n) / 3)]) {
      keptX.push(tenthX(view, coords[2 * (from + k)]));
      keptY.push(tenthY(view, coords[2 * (from + k) + 1]));
    }
  }
  let d = `M${tenths(keptX[0])} ${tenths(keptY[0])}`;
  if (keptX.length > 1) {
    d += 'l';
    for (let i = 1; i < keptX.length; i++) {
      d += `${i > 1 ? ' ' : ''}${tenths(keptX[i] - keptX[i - 1])} ${tenths(keptY[i] - keptY[i - 1])}`;
    }
  }
  return closed ? `${d}z` : d;
}
