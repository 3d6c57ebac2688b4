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
  /** each edge as x0,y0,x1,y1, in the ring's order */
  edges: Float64Array;
  /** the polygon each edge belongs to */
  edgePolygon: Uint32Array;
  edgeTree: Flatbush;
  /** the edges that are not horizontal, listed by the horizontal bands of y they reach, for the inside test */
  bands: EdgeBands;
  polygonTree: Flatbush;
}

/**
 * Band b holds y from y0 + b * height; bandEdge[bandStart[b]] .. bandEdge[bandStart[b + 1] - 1]
 * are the edges whose y range meets it. A horizontal line meets only the edges of its band, so
 * the inside test costs the edges near that line, not the vertices of the polygon.
 */
export interface EdgeBands {
  y0: number;
  height: number;
  count: number;
  bandStart: Uint32Array;
  bandEdge: Uint32Array;
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
  const edgePolygon = new Uint32Array(edgeCount);
  let e = 0;
  for (let p = 0; p < polygons.count; p++) {
    for (const r of polygons.rings[p]) {
      const n = r.length / 2;
      for (let i = 0; i < n; i++) {
        const j = (i + 1) % n;
        // the closing duplicate of a closed ring gives a zero-length edge, which crosses nothing
        if (r[2 * i] === r[2 * j] && r[2 * i + 1] === r[2 * j + 1]) continue;
        edges[4 * e] = r[2 * i];
        edges[4 * e + 1] = r[2 * i + 1];
        edges[4 * e + 2] = r[2 * j];
        edges[4 * e + 3] = r[2 * j + 1];
        edgePolygon[e] = p;
        e++;
      }
    }
  }
  const edgeTree = boxIndex(e, (i, add) => {
    const o = i * 4;
    add(Math.min(edges[o], edges[o + 2]), Math.min(edges[o + 1], edges[o + 3]), Math.max(edges[o], edges[o + 2]), Math.max(edges[o + 1], edges[o + 3]));
  });
  // candidates by the outer ring's bbox alone
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
  return { polygons, edges: edges.subarray(0, e * 4), edgePolygon: edgePolygon.subarray(0, e), edgeTree, polygonTree, bands: edgeBands(edges, e) };
}

// crossing parameters, grown on demand and reused so that cutting many transects allocates little
let params = new Float64Array(64);

function bandOf(bands: EdgeBands, y: number): number {
  // monotone in y, so an edge listed from the band of its lowest y to that of its highest is met
  return Math.min(bands.count - 1, Math.max(0, Math.floor((y - bands.y0) / bands.height)));
}

/** Bands of about two edges each, fewer where long edges would be listed in too many. */
function edgeBands(edges: Float64Array, edgeCount: number): EdgeBands {
  let y0 = Infinity, y1 = -Infinity, sloped = 0;
  for (let e = 0; e < edgeCount; e++) {
    const a = edges[4 * e + 1], b = edges[4 * e + 3];
    // a horizontal edge never changes the inside test's parity
    if (a === b) continue;
    sloped++;
    y0 = Math.min(y0, a, b);
    y1 = Math.max(y1, a, b);
  }
  let count = sloped > 0 && y1 > y0 ? Math.min(1 << 20, Math.max(1, sloped >> 1)) : 1;
  for (;;) {
    const bands: EdgeBands = { y0: sloped > 0 ? y0 : 0, height: sloped > 0 && y1 > y0 ? (y1 - y0) / count : 1, count, bandStart: new Uint32Array(count + 1), bandEdge: new Uint32Array(0) };
    let total = 0;
    for (let e = 0; e < edgeCount; e++) {
      const a = edges[4 * e + 1], b = edges[4 * e + 3];
      if (a === b) continue;
      const b0 = bandOf(bands, Math.min(a, b)), b1 = bandOf(bands, Math.max(a, b));
      total += b1 - b0 + 1;
      bands.bandStart[b0 + 1]++;
      if (b1 + 2 <= count) bands.bandStart[b1 + 2]--;
    }
    if (total > 8 * sloped + 2 * count && count > 1) {
      count >>= 1;
      continue;
    }
    // difference array -> edges per band -> offset of each band's first edge
    for (let b = 1; b <= count; b++) bands.bandStart[b] += bands.bandStart[b - 1];
    for (let b = 1; b <= count; b++) bands.bandStart[b] += bands.bandStart[b - 1];
    bands.bandEdge = new Uint32Array(total);
    const cursor = bands.bandStart.slice(0, count);
    for (let e = 0; e < edgeCount; e++) {
      const a = edges[4 * e + 1], b = edges[4 * e + 3];
      if (a === b) continue;
      for (let k = bandOf(bands, Math.min(a, b)), end = bandOf(bands, Math.max(a, b)); k <= end; k++) bands.bandEdge[cursor[k]++] = e;
    }
    return bands;
  }
}

// per polygon, the parity of the ray's crossings, and the stamp of the last cut that made it a candidate
let parity = new Uint8Array(64);
let stamp = new Uint32Array(64);
let currentStamp = 0;

/**
 * Even-odd over all rings of the candidate polygons at once (holes need no special case), by a ray
 * towards +x against the edges of the point's band. An edge counts exactly as in the plain scan
 * over a ring's vertices (same test, same operands in the same order), so a point on the rounding
 * edge of a boundary lands on the same side.
 */
function castRay(index: ZoneIndex, x: number, y: number): void {
  const { edges, edgePolygon, bands } = index;
  const band = bandOf(bands, y);
  for (let k = bands.bandStart[band], end = bands.bandStart[band + 1]; k < end; k++) {
    const e = bands.bandEdge[k];
    const p = edgePolygon[e];
    if (stamp[p] !== currentStamp) continue;
    const o = 4 * e;
    // the plain scan takes vertex i and the one before it, j: this edge runs from j to i
    const xj = edges[o], yj = edges[o + 1], xi = edges[o + 2], yi = edges[o + 3];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) parity[p] ^= 1;
  }
}

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
  if (parity.length < index.polygons.count) {
    parity = new Uint8Array(index.polygons.count * 2);
    stamp = new Uint32Array(index.polygons.count * 2);
    currentStamp = 0;
  }
  // a new stamp marks this cut's candidates; wrapping round, every old stamp is cleared first
  if (++currentStamp === 0xffffffff) {
    stamp.fill(0);
    currentStamp = 1;
  }
  for (const p of candidates) stamp[p] = currentStamp;

  const zone = new Int32Array(n);
  const lengthM = new Float64Array(n);
  let count = 0, uncoveredM = 0, overlapM = 0;
  for (let i = 0; i + 1 < n; i++) {
    const a = Math.max(0, ts[i]), b = Math.min(1, ts[i + 1]);
    if (!(b > a)) continue;
    const len = (b - a) * totalM;
    const mx = x0 + ((a + b) / 2) * dx, my = y0 + ((a + b) / 2) * dy;
    let best = -1, mixed = false;
    for (const p of candidates) parity[p] = 0;
    castRay(index, mx, my);
    for (const p of candidates) {
      if (parity[p] === 0) continue;
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
