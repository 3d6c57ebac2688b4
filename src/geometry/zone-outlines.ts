/**
 * A zone's rings in lon/lat with an index of their edges, so that a point test or a search near
 * another zone costs the edges near it, not the vertices of the whole outline. Rings are open and
 * turned so that the zone lies on the left of every edge: outer rings counter-clockwise, holes
 * clockwise (in lon/lat as a plane).
 *
 * The index needs no sort: the edges of an outline come in ring order, one after the next, so runs
 * of NODE_SIZE edges already make small boxes. Runs of those make the next level up, to one root.
 * Building it is one pass over the vertices and a search allocates nothing.
 */
export interface ZoneOutline {
  /** vertex i of all rings, one after the other */
  x: Float64Array;
  y: Float64Array;
  /** the vertex after i in its ring: edge i runs from i to next[i] */
  next: Uint32Array;
  /** the polygon (of the zone's MultiPolygon) of each vertex; empty when the zone has one polygon */
  polygon: Uint32Array;
  polygonCount: number;
  /** first vertex of each ring, and one past the last ring */
  ringStart: Uint32Array;
  /** box of each node as minX, minY, maxX, maxY: level 0 holds runs of NODE_SIZE edges, level L + 1 runs of NODE_SIZE level-L nodes */
  nodeBox: Float64Array;
  /** first node of each level, the root's level last, and one past the root */
  levelStart: Uint32Array;
  /**
   * the edges by horizontal bands for the point test: band b holds y from minY + b * bandHeight and
   * lists bandEdge[bandStart[b]] .. bandEdge[bandStart[b + 1] - 1], every edge whose y range meets it
   */
  bandHeight: number;
  bandStart: Uint32Array;
  bandEdge: Uint32Array;
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** Edges (or nodes) per node of the index: edge i's run of edges is level-0 node floor(i / NODE_SIZE). */
export const NODE_SIZE = 16;

/** Edge numbers found by edgesNear; `ids` grows on demand, so keep one and reuse it. */
export interface EdgeList {
  ids: Uint32Array;
}

export function edgeList(): EdgeList {
  return { ids: new Uint32Array(64) };
}

/** The outline of one zone from its polygons in lon/lat (GeoJSON rings, closed or open). */
export function zoneOutline(polygons: number[][][][]): ZoneOutline {
  let count = 0, ringCount = 0;
  for (const rings of polygons) for (const ring of rings) { count += openLength(ring); ringCount++; }
  // fresh memory costs its first touch (page by page past malloc's threshold), so the outline holds little
  const x = new Float64Array(count), y = new Float64Array(count), next = new Uint32Array(count);
  const polygon = new Uint32Array(polygons.length > 1 ? count : 0);
  const ringStart = new Uint32Array(ringCount + 1);
  let k = 0, ri = 0;
  polygons.forEach((rings, p) => rings.forEach((ring, r) => {
    ringStart[ri++] = k;
    const n = openLength(ring);
    for (let i = 0, m = 0; m < n; i++) {
      if (m > 0 && ring[i][0] === x[k + m - 1] && ring[i][1] === y[k + m - 1]) continue;
      x[k + m] = ring[i][0];
      y[k + m] = ring[i][1];
      m++;
    }
    let area2 = 0;
    for (let i = 0, j = n - 1; i < n; j = i++) area2 += x[k + j] * y[k + i] - x[k + i] * y[k + j];
    // the zone on the left of every edge: outer rings counter-clockwise, holes clockwise
    if (r > 0 ? area2 > 0 : area2 < 0) {
      x.subarray(k, k + n).reverse();
      y.subarray(k, k + n).reverse();
    }
    for (let i = 0; i < n; i++) next[k + i] = i + 1 < n ? k + i + 1 : k;
    if (polygon.length > 0) polygon.fill(p, k, k + n);
    k += n;
  }));
  ringStart[ringCount] = k;
  const { nodeBox, levelStart } = edgeNodes(x, y, next);
  const root = 4 * levelStart[levelStart.length - 2];
  const minY = nodeBox[root + 1], maxY = nodeBox[root + 3];
  return {
    x, y, next, polygon, polygonCount: polygons.length, ringStart, nodeBox, levelStart, ...edgeBands(y, next, minY, maxY),
    minX: nodeBox[root], minY, maxX: nodeBox[root + 2], maxY,
  };
}

/** Vertices of the ring without repeated positions or the closing one (GeoJSON's, or any run of them). */
function openLength(ring: number[][]): number {
  let n = 0, lastX = Number.NaN, lastY = Number.NaN;
  for (const p of ring) {
    if (n > 0 && p[0] === lastX && p[1] === lastY) continue;
    lastX = p[0];
    lastY = p[1];
    n++;
  }
  // drop ending positions that repeat the first; the copy loop stops at n, so they are never copied
  for (let i = ring.length - 1; n > 1 && i > 0 && ring[i][0] === ring[0][0] && ring[i][1] === ring[0][1]; i--) {
    if (ring[i][0] !== ring[i - 1][0] || ring[i][1] !== ring[i - 1][1]) n--;
  }
  return n;
}

function bandOf(minY: number, height: number, count: number, y: number): number {
  // monotone in y, so an edge listed from the band of its lowest y to that of its highest is met
  return Math.min(count - 1, Math.floor((y - minY) / height));
}

/** Bands of about eight edges each, fewer where long edges would be listed in too many (as zones.ts bands them). */
function edgeBands(y: Float64Array, next: Uint32Array, minY: number, maxY: number): { bandHeight: number; bandStart: Uint32Array; bandEdge: Uint32Array } {
  const edgeCount = y.length;
  let count = maxY > minY ? Math.min(1 << 20, Math.max(1, edgeCount >> 3)) : 1;
  for (;;) {
    const height = maxY > minY ? (maxY - minY) / count : 1;
    const bandStart = new Uint32Array(count + 1);
    let total = 0;
    for (let i = 0; i < edgeCount; i++) {
      const a = y[i], b = y[next[i]];
      const b0 = bandOf(minY, height, count, Math.min(a, b)), b1 = bandOf(minY, height, count, Math.max(a, b));
      total += b1 - b0 + 1;
      bandStart[b0]++;
      bandStart[b1 + 1]--;
    }
    if (total > 8 * edgeCount + 2 * count && count > 1) {
      count >>= 1;
      continue;
    }
    // difference array -> edges per band -> one past each band's last edge, which the fill counts down to its first
    for (let b = 1; b < count; b++) bandStart[b] += bandStart[b - 1];
    for (let b = 1; b < count; b++) bandStart[b] += bandStart[b - 1];
    bandStart[count] = total;
    const bandEdge = new Uint32Array(total);
    for (let i = 0; i < edgeCount; i++) {
      const a = y[i], b = y[next[i]];
      for (let k = bandOf(minY, height, count, Math.min(a, b)), end = bandOf(minY, height, count, Math.max(a, b)); k <= end; k++) bandEdge[--bandStart[k]] = i;
    }
    return { bandHeight: height, bandStart, bandEdge };
  }
}

/** The index's node boxes, level by level; with no edges, one empty root that no search meets. */
function edgeNodes(x: Float64Array, y: Float64Array, next: Uint32Array): { nodeBox: Float64Array; levelStart: Uint32Array } {
  const sizes = [Math.max(1, Math.ceil(x.length / NODE_SIZE))];
  while (sizes[sizes.length - 1] > 1) sizes.push(Math.ceil(sizes[sizes.length - 1] / NODE_SIZE));
  const levelStart = new Uint32Array(sizes.length + 1);
  sizes.forEach((size, level) => { levelStart[level + 1] = levelStart[level] + size; });
  const nodeBox = new Float64Array(4 * levelStart[sizes.length]);
  for (let node = 0; node < sizes[0]; node++) {
    let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    for (let i = node * NODE_SIZE, end = Math.min(i + NODE_SIZE, x.length); i < end; i++) {
      const j = next[i];
      minX = Math.min(minX, x[i], x[j]); maxX = Math.max(maxX, x[i], x[j]);
      minY = Math.min(minY, y[i], y[j]); maxY = Math.max(maxY, y[i], y[j]);
    }
    nodeBox[4 * node] = minX; nodeBox[4 * node + 1] = minY; nodeBox[4 * node + 2] = maxX; nodeBox[4 * node + 3] = maxY;
  }
  for (let level = 1; level < sizes.length; level++) {
    for (let node = levelStart[level], child = levelStart[level - 1]; node < levelStart[level + 1]; node++) {
      let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
      for (const end = Math.min(child + NODE_SIZE, levelStart[level]); child < end; child++) {
        minX = Math.min(minX, nodeBox[4 * child]); minY = Math.min(minY, nodeBox[4 * child + 1]);
        maxX = Math.max(maxX, nodeBox[4 * child + 2]); maxY = Math.max(maxY, nodeBox[4 * child + 3]);
      }
      nodeBox[4 * node] = minX; nodeBox[4 * node + 1] = minY; nodeBox[4 * node + 2] = maxX; nodeBox[4 * node + 3] = maxY;
    }
  }
  return { nodeBox, levelStart };
}

// level and node of the nodes still to visit; NODE_SIZE per level is the most a search holds
let stack = new Int32Array(2 * NODE_SIZE * 8);

/**
 * The edges whose boxes meet the box (boundaries included), into `found.ids` from `start` on;
 * returns one past the last it wrote.
 * Example: edgesNear(zoneOutline(square), 0.5, -1, 0.5, 1, found) finds the square's bottom edge
 */
export function edgesNear(outline: ZoneOutline, minX: number, minY: number, maxX: number, maxY: number, found: EdgeList, start = 0): number {
  const { x, y, next, nodeBox, levelStart } = outline;
  const root = levelStart[levelStart.length - 2];
  if (nodeBox[4 * root] > maxX || nodeBox[4 * root + 1] > maxY || nodeBox[4 * root + 2] < minX || nodeBox[4 * root + 3] < minY) return start;
  if (stack.length < 2 * NODE_SIZE * levelStart.length) stack = new Int32Array(4 * NODE_SIZE * levelStart.length);
  let count = start, sp = 0;
  stack[sp++] = levelStart.length - 2;
  stack[sp++] = root;
  // a node is on the stack once its box met the search box
  while (sp > 0) {
    const node = stack[--sp], level = stack[--sp];
    const first = (node - levelStart[level]) * NODE_SIZE;
    if (level === 0) {
      for (let i = first, end = Math.min(first + NODE_SIZE, x.length); i < end; i++) {
        const j = next[i];
        if ((x[i] > maxX && x[j] > maxX) || (x[i] < minX && x[j] < minX) || (y[i] > maxY && y[j] > maxY) || (y[i] < minY && y[j] < minY)) continue;
        if (count === found.ids.length) {
          const grown = new Uint32Array(count * 2);
          grown.set(found.ids);
          found.ids = grown;
        }
        found.ids[count++] = i;
      }
    } else {
      for (let c = levelStart[level - 1] + first, end = Math.min(c + NODE_SIZE, levelStart[level]); c < end; c++) {
        const b = 4 * c;
        if (nodeBox[b] > maxX || nodeBox[b + 1] > maxY || nodeBox[b + 2] < minX || nodeBox[b + 3] < minY) continue;
        stack[sp++] = level - 1;
        stack[sp++] = c;
      }
    }
  }
  return count;
}

// parity per polygon, reused between point tests
let parity = new Uint8Array(16);

/**
 * Whether the point lies in the zone, a point on its boundary included: the answer of turf's
 * booleanPointInPolygon (7.4, the crossing test of point-in-polygon-hao, whose ray runs towards -x),
 * over the edges of the point's band: the ray meets no other edge, and an edge right of the point
 * neither crosses the ray nor holds the point.
 * Example: pointInOutline(zoneOutline([[[[0, 0], [2, 0], [2, 2], [0, 2], [0, 0]]]]), 1, 1) is true
 */
export function pointInOutline(outline: ZoneOutline, px: number, py: number): boolean {
  const { x, y, next, polygon, minX, minY, maxX, maxY, bandStart, bandEdge } = outline;
  if (px < minX || px > maxX || py < minY || py > maxY) return false;
  if (parity.length < outline.polygonCount) parity = new Uint8Array(outline.polygonCount * 2);
  parity.fill(0, 0, outline.polygonCount);
  const band = bandOf(minY, outline.bandHeight, bandStart.length - 1, py);
  for (let k = bandStart[band], end = bandStart[band + 1]; k < end; k++) {
    const i = bandEdge[k], j = next[i];
    const u1 = x[i] - px, v1 = y[i] - py, u2 = x[j] - px, v2 = y[j] - py;
    if (v1 === 0 && v2 === 0) {
      if ((u2 <= 0 && u1 >= 0) || (u1 <= 0 && u2 >= 0)) return true;
    } else if ((v2 >= 0 && v1 <= 0) || (v2 <= 0 && v1 >= 0)) {
      // orient2d(u1, u2, v1, v2, 0, 0) in plain arithmetic
      const f = u2 * v1 - u1 * v2;
      if (f === 0) return true;
      if ((f > 0 && v2 > 0 && v1 <= 0) || (f < 0 && v2 <= 0 && v1 > 0)) parity[polygon.length > 0 ? polygon[i] : 0] ^= 1;
    }
  }
  for (let p = 0; p < outline.polygonCount; p++) if (parity[p] === 1) return true;
  return false;
}
