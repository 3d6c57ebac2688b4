// Rectangular aquifer zones over a synthetic network, plain or densified, for the zones bench and tests.
import type { LineGeometry } from '../src/geometry/index.js';

/** An axis-aligned box in metres: x0, y0, x1, y1. */
export type Box = [number, number, number, number];

/** A k x k grid of rectangles covering the lines and a 1 km margin, for zones that transects cross. */
export function zoneGridOver(lines: LineGeometry[], k: number): Box[] {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const l of lines) {
    for (const p of l.parts) {
      for (let i = 0; i < p.length; i += 2) {
        minX = Math.min(minX, p[i]); maxX = Math.max(maxX, p[i]);
        minY = Math.min(minY, p[i + 1]); maxY = Math.max(maxY, p[i + 1]);
      }
    }
  }
  minX -= 1000; minY -= 1000; maxX += 1000; maxY += 1000;
  // cut lines at round metres, so densified edges keep their corners exactly
  const xs = Array.from({ length: k + 1 }, (_, i) => Math.round(minX + ((maxX - minX) * i) / k));
  const ys = Array.from({ length: k + 1 }, (_, i) => Math.round(minY + ((maxY - minY) * i) / k));
  const boxes: Box[] = [];
  for (let j = 0; j < k; j++) for (let i = 0; i < k; i++) boxes.push([xs[i], ys[j], xs[i + 1], ys[j + 1]]);
  return boxes;
}

/**
 * The rectangle as an open counter-clockwise ring of `vertices` vertices (a multiple of 4): each
 * side split evenly. Points added on a straight side leave the shape as it was.
 */
export function densifiedRect([x0, y0, x1, y1]: Box, vertices: number): Float64Array {
  if (!Number.isInteger(vertices / 4) || vertices < 4) throw new Error(`Unexpected vertices value: ${vertices}.`);
  const perSide = vertices / 4;
  const corners = [x0, y0, x1, y0, x1, y1, x0, y1];
  const out = new Float64Array(vertices * 2);
  let k = 0;
  for (let s = 0; s < 4; s++) {
    const ax = corners[2 * s], ay = corners[2 * s + 1], bx = corners[(2 * s + 2) % 8], by = corners[(2 * s + 3) % 8];
    for (let i = 0; i < perSide; i++) {
      const t = i / perSide;
      // a side is horizontal or vertical, so one coordinate stays exactly the corner's
      out[k++] = ax === bx ? ax : ax + (bx - ax) * t;
      out[k++] = ay === by ? ay : ay + (by - ay) * t;
    }
  }
  return out;
}

/**
 * A closed ring through four corners (counter-clockwise) with `vertices` vertices, each side split
 * evenly from its lower-left end, so that neighbours sharing a side share its vertices to the last bit,
 * as zones digitised from one map do.
 */
export function densifiedRing(corners: readonly (readonly number[])[], vertices: number): number[][] {
  const perSide = vertices / 4, ring: number[][] = [];
  for (let s = 0; s < 4; s++) {
    const a = corners[s], b = corners[(s + 1) % 4];
    const forward = a[0] < b[0] || (a[0] === b[0] && a[1] < b[1]);
    const [lo, hi] = forward ? [a, b] : [b, a];
    for (let i = 0; i < perSide; i++) {
      const t = (forward ? i : perSide - i) / perSide;
      ring.push([lo[0] + (hi[0] - lo[0]) * t, lo[1] + (hi[1] - lo[1]) * t]);
    }
  }
  ring.push(ring[0]);
  return ring;
}
