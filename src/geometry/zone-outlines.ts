import type Flatbush from 'flatbush';
import { boxIndex } from './box-index.js';

/**
 * A zone's rings in lon/lat with an index of their edges, so that a point test or a search near
 * another zone costs the edges near it, not the vertices of the whole outline. Rings are open and
 * turned so that the zone lies on the left of every edge: outer rings counter-clockwise, holes
 * clockwise (in lon/lat as a plane).
 */
export interface ZoneOutline {
  /** vertex i of all rings, one after the other */
  x: Float64Array;
  y: Float64Array;
  /** the vertex after i in its ring: edge i runs from i to next[i] */
  next: Uint32Array;
  /** the polygon (of the zone's MultiPolygon) of each vertex */
  polygon: Uint32Array;
  polygonCount: number;
  /** first vertex of each ring, and one past the last ring */
  ringStart: Uint32Array;
  /** edge i as item i */
  edgeTree: Flatbush;
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** The outline of one zone from its polygons in lon/lat (GeoJSON rings, closed or open). */
export function zoneOutline(polygons: number[][][][]): ZoneOutline {
  const rings: { ring: number[][]; polygon: number; hole: boolean }[] = [];
  polygons.forEach((p, polygon) => p.forEach((ring, r) => rings.push({ ring: openRing(ring), polygon, hole: r > 0 })));
  const count = rings.reduce((sum, r) => sum + r.ring.length, 0);
  const x = new Float64Array(count), y = new Float64Array(count);
  const next = new Uint32Array(count), polygon = new Uint32Array(count);
  const ringStart = new Uint32Array(rings.length + 1);
  let k = 0;
  rings.forEach((r, ri) => {
    const n = r.ring.length;
    ringStart[ri] = k;
    let area2 = 0;
    for (let i = 0, j = n - 1; i < n; j = i++) area2 += r.ring[j][0] * r.ring[i][1] - r.ring[i][0] * r.ring[j][1];
    // the zone on the left of every edge: outer rings counter-clockwise, holes clockwise
    const reverse = r.hole ? area2 > 0 : area2 < 0;
    for (let i = 0; i < n; i++) {
      const [px, py] = r.ring[reverse ? n - 1 - i : i];
      x[k + i] = px;
      y[k + i] = py;
      next[k + i] = k + ((i + 1) % n);
      polygon[k + i] = r.polygon;
    }
    k += n;
  });
  ringStart[rings.length] = k;
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i < count; i++) {
    minX = Math.min(minX, x[i]); maxX = Math.max(maxX, x[i]);
    minY = Math.min(minY, y[i]); maxY = Math.max(maxY, y[i]);
  }
  const edgeTree = boxIndex(count, (i, add) => {
    const j = next[i];
    add(Math.min(x[i], x[j]), Math.min(y[i], y[j]), Math.max(x[i], x[j]), Math.max(y[i], y[j]));
  });
  return { x, y, next, polygon, polygonCount: polygons.length, ringStart, edgeTree, minX, minY, maxX, maxY };
}

function openRing(ring: number[][]): number[][] {
  const out: number[][] = [];
  for (const p of ring) if (out.length === 0 || p[0] !== out[out.length - 1][0] || p[1] !== out[out.length - 1][1]) out.push(p);
  while (out.length > 1 && out[0][0] === out[out.length - 1][0] && out[0][1] === out[out.length - 1][1]) out.pop();
  return out;
}

// parity per polygon, reused between point tests
let parity = new Uint8Array(16);

/**
 * Whether the point lies in the zone, a point on its boundary included: the answer of turf's
 * booleanPointInPolygon (7.4, the crossing test of point-in-polygon-hao, whose ray runs towards -x),
 * over the edges that ray meets instead of every edge of the outline.
 * Example: pointInOutline(zoneOutline([[[[0, 0], [2, 0], [2, 2], [0, 2], [0, 0]]]]), 1, 1) is true
 */
export function pointInOutline(outline: ZoneOutline, px: number, py: number): boolean {
  const { x, y, next, polygon, minX, minY, maxX, maxY } = outline;
  if (px < minX || px > maxX || py < minY || py > maxY) return false;
  if (parity.length < outline.polygonCount) parity = new Uint8Array(outline.polygonCount * 2);
  parity.fill(0, 0, outline.polygonCount);
  let boundary = false;
  outline.edgeTree.search(minX, py, px, py, (i) => {
    if (boundary) return false;
    const j = next[i];
    const u1 = x[i] - px, v1 = y[i] - py, u2 = x[j] - px, v2 = y[j] - py;
    if (v1 === 0 && v2 === 0) {
      if ((u2 <= 0 && u1 >= 0) || (u1 <= 0 && u2 >= 0)) boundary = true;
    } else if ((v2 >= 0 && v1 <= 0) || (v2 <= 0 && v1 >= 0)) {
      // orient2d(u1, u2, v1, v2, 0, 0) in plain arithmetic
      const f = u2 * v1 - u1 * v2;
      if (f === 0) boundary = true;
      else if ((f > 0 && v2 > 0 && v1 <= 0) || (f < 0 && v2 <= 0 && v1 > 0)) parity[polygon[i]] ^= 1;
    }
    return false;
  });
  if (boundary) return true;
  for (let p = 0; p < outline.polygonCount; p++) if (parity[p] === 1) return true;
  return false;
}
