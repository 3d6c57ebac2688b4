import type Flatbush from 'flatbush';
import { boxIndex } from './box-index.js';

/**
 * Aquifer zone polygons in metres. A MultiPolygon zone gives several polygons with the same zone
 * index. rings[p] is polygon p's outer ring then its holes, interleaved x,y; closing the ring
 * (repeating the first vertex) is optional.
 */
export interface ZonePolygons {
  /** number of polygons */
  count: number;
  /** zone index of each polygon */
  zone: Uint32Array;
  rings: Float64Array[][];
}

export interface ZoneIndex {
  polygons: ZonePolygons;
  /** each edge as x0,y0,x1,y1 */
  edges: Float64Array;
  edgeTree: Flatbush;
  polygonTree: Flatbush;
}

/** Pieces of a transect in order from its start; zone -1 marks a piece outside every zone. */
export interface TransectCut {
  count: number;
  zone: Int32Array;
  lengthM: Float64Array;
  /** length outside every zone */
  uncoveredM: number;
  /** length inside more than one zone (given to the lowest zone index) */
  overlapM: number;
}

/** Builds ZonePolygons from one entry per polygon. */
export function zonePolygons(list: { zone: number; rings: Float64Array[] }[]): ZonePolygons {
  const zone = new Uint32Array(list.length);
  list.forEach((p, i) => {
    if (!Number.isInteger(p.zone) || p.zone < 0) throw new Error(`Unexpected zone index: ${p.zone}.`);
    if (p.rings.length === 0 || p.rings[0].length < 6) throw new Error(`Zone ${p.zone} has a polygon without an outer ring of 3 vertices.`);
    for (const r of p.rings) {
      if (r.length % 2 !== 0) throw new Error(`Zone ${p.zone} has a ring with an odd number of coordinates: ${r.length}.`);
      for (let i = 0; i < r.length; i++) if (!Number.isFinite(r[i])) throw new Error(`Zone ${p.zone} has a non-finite coordinate: ${r[i]}.`);
    }
    zone[i] = p.zone;
  });
  return { count: list.length, zone, rings: list.map((p) => p.rings) };
}

/** Indexes every polygon edge and every polygon's bbox for cutTransect. */
export function buildZoneIndex(polygons: ZonePolygons): ZoneIndex {
  let edgeCount = 0;
  for (const rings of polygons.rings) for (const r of rings) edgeCount += r.length / 2;
  const edges = new Float64Array(edgeCount * 4);
  let e = 0;
  for (const rings of polygons.rings) {
    for (const r of rings) {
      const n = r.length / 2;
      for (let i = 0; i < n; i++) {
        const j = (i + 1) % n;
        // the closing duplicate of a closed ring gives a zero-length edge, which crosses nothing
        if (r[2 * i] === r[2 * j] && r[2 * i + 1] === r[2 * j + 1]) continue;
        edges[4 * e] = r[2 * i];
        edges[4 * e + 1] = r[2 * i + 1];
        edges[4 * e + 2] = r[2 * j];
        edges[4 * e + 3] = r[2 * j + 1];
        e++;
      }
    }
  }
  const edgeTree = boxIndex(e, (i, add) => {
    const o = i * 4;
    add(Math.min(edges[o], edges[o + 2]), Math.min(edges[o + 1], edges[o + 3]), Math.max(edges[o], edges[o + 2]), Math.max(edges[o + 1], edges[o + 3]));
  });
  const polygonTree = boxIndex(polygons.count, (p, add) => {
    const r = polygons.rings[p][0];
    let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    for (let i = 0; i < r.length; i += 2) {
      minX = Math.min(minX, r[i]);
      maxX = Math.max(maxX, r[i]);
      minY = Math.min(minY, r[i + 1]);
      maxY = Math.max(maxY, r[i + 1]);
    }
    add(minX, minY, maxX, maxY);
  });
  return { polygons, edges: edges.subarray(0, e * 4), edgeTree, polygonTree };
}

/** Even-odd over all rings, so holes need no special case. */
function insidePolygon(rings: Float64Array[], x: number, y: number): boolean {
  let inside = false;
  for (const r of rings) {
    const n = r.length / 2;
    for (let i = 0, j = n - 1; i < n; j = i++) {
      const xi = r[2 * i], yi = r[2 * i + 1], xj = r[2 * j], yj = r[2 * j + 1];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
    }
  }
  return inside;
}

// crossing parameters, grown on demand and reused so that cutting many transects allocates little
let params = new Float64Array(64);

/**
 * Cuts the segment (x0,y0)-(x1,y1) into ordered pieces by zone. Where polygons of different zones
 * overlap, the lowest zone index wins and the length is added to overlapM.
 * Example: cutTransect(buildZoneIndex(zonePolygons([{ zone: 0, rings: [square] }])), 0, 0, 10, 0)
 */
export function cutTransect(index: ZoneIndex, x0: number, y0: number, x1: number, y1: number): TransectCut {
  const dx = x1 - x0, dy = y1 - y0;
  const totalM = Math.hypot(dx, dy);
  const { edges } = index;
  let n = 0;
  const push = (t: number): void => {
    if (n === params.length) {
      const grown = new Float64Array(n * 2);
      grown.set(params);
      params = grown;
    }
    params[n++] = t;
  };
  push(0);
  push(1);
  const minX = Math.min(x0, x1), minY = Math.min(y0, y1), maxX = Math.max(x0, x1), maxY = Math.max(y0, y1);
  index.edgeTree.search(minX, minY, maxX, maxY, (i) => {
    const o = i * 4;
    const ex = edges[o + 2] - edges[o], ey = edges[o + 3] - edges[o + 1];
    const qx = edges[o] - x0, qy = edges[o + 1] - y0;
    const denom = dx * ey - dy * ex;
    if (Math.abs(denom) <= 1e-12 * totalM * Math.hypot(ex, ey)) {
      // collinear edge: its ends split the segment where it runs along a boundary
      if (Math.abs(qx * dy - qy * dx) <= 1e-9 * totalM * totalM && totalM > 0) {
        push((qx * dx + qy * dy) / (totalM * totalM));
        push(((qx + ex) * dx + (qy + ey) * dy) / (totalM * totalM));
      }
      return false;
    }
    const t = (qx * ey - qy * ex) / denom;
    const u = (qx * dy - qy * dx) / denom;
    if (t > 0 && t < 1 && u >= 0 && u <= 1) push(t);
    return false;
  });
  const ts = params.subarray(0, n).sort();
  const candidates = index.polygonTree.search(minX, minY, maxX, maxY);

  const zone = new Int32Array(n);
  const lengthM = new Float64Array(n);
  let count = 0, uncoveredM = 0, overlapM = 0;
  for (let i = 0; i + 1 < n; i++) {
    const a = Math.max(0, ts[i]), b = Math.min(1, ts[i + 1]);
    if (!(b > a)) continue;
    const len = (b - a) * totalM;
    const mx = x0 + ((a + b) / 2) * dx, my = y0 + ((a + b) / 2) * dy;
    let best = -1, mixed = false;
    for (const p of candidates) {
      if (!insidePolygon(index.polygons.rings[p], mx, my)) continue;
      const z = index.polygons.zone[p];
      if (best >= 0 && z !== best) mixed = true;
      if (best < 0 || z < best) best = z;
    }
    if (best < 0) uncoveredM += len;
    if (mixed) overlapM += len;
    if (count > 0 && zone[count - 1] === best) lengthM[count - 1] += len;
    else {
      zone[count] = best;
      lengthM[count] = len;
      count++;
    }
  }
  return { count, zone: zone.slice(0, count), lengthM: lengthM.slice(0, count), uncoveredM, overlapM };
}
