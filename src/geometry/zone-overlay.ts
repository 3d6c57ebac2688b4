import { boxIndex } from './box-index.js';
import { edgeList, edgesNear, NODE_SIZE, pointInOutline, type ZoneOutline } from './zone-outlines.js';

/**
 * Overlaps between zones and the holes their union leaves, from the zones' edges alone: no polygon
 * is clipped. An area is a sum over the boundary of the region (Green's theorem): the overlap of A
 * and B is bounded by the pieces of A's edges inside B and of B's edges inside A, and the union by
 * the pieces of every zone's edges outside all the others. Each edge is cut only where it meets
 * another zone's edge, found through that zone's edge index; an edge that meets none keeps the
 * inside-or-outside state of the edge before it. So an outline of many vertices costs about one
 * pass over its vertices plus the edges near other zones, not a sweep of every vertex of both.
 *
 * Areas are measured as turf's area (7.4) measures a polygon: the plane area in longitude (radians)
 * against sine of latitude, times the square of turf's earth radius.
 */

/** turf's earthRadius (m). */
const EARTH_RADIUS_M = 6371008.8;
const RAD = Math.PI / 180;
/** Degrees (about 10 micrometres): a vertex this close to another zone's edge lies on it. */
const EPS = 1e-10;

/** Status of a piece of edge against another zone. */
const OUTSIDE = 0, INSIDE = 1, SHARED_SAME = 2, SHARED_OPPOSITE = 3, UNKNOWN = 4;

export interface ZoneHole {
  areaM2: number;
  /** mean of the hole ring's vertices, as turf's centroid gives it */
  lon: number;
  lat: number;
}

export interface ZoneOverlay {
  /** overlap area (m^2) of zones a < b, by overlapKey(a, b, zone count); pairs that do not overlap are absent */
  overlapM2: Map<number, number>;
  /** holes inside the union of the zones, or null when the union's rings could not be closed */
  holes: ZoneHole[] | null;
}

export function overlapKey(a: number, b: number, count: number): number {
  return Math.min(a, b) * count + Math.max(a, b);
}

/** One run of union boundary along one ring: its ends, its share of the area, and its vertices but the last. */
interface Link {
  x0: number; y0: number; x1: number; y1: number;
  /** direction of the first and of the last piece */
  dx0: number; dy0: number; dx1: number; dy1: number;
  area: number;
  sumLon: number; sumLat: number; vertices: number;
}

// split points of the edge being cut, grown on demand
let splitT = new Float64Array(16), splitX = new Float64Array(16), splitY = new Float64Array(16);
let splitCount = 0;

function addSplit(t: number, x: number, y: number): void {
  if (splitCount === splitT.length) {
    const grow = (a: Float64Array) => { const b = new Float64Array(a.length * 2); b.set(a); return b; };
    splitT = grow(splitT); splitX = grow(splitX); splitY = grow(splitY);
  }
  splitT[splitCount] = t; splitX[splitCount] = x; splitY[splitCount] = y;
  splitCount++;
}

/** Distance from (px, py) to the segment a-b, or Infinity when it projects beyond an end by more than EPS. */
function nearSegment(ax: number, ay: number, bx: number, by: number, px: number, py: number): number {
  const dx = bx - ax, dy = by - ay, len = Math.hypot(dx, dy);
  const along = ((px - ax) * dx + (py - ay) * dy) / len;
  if (along < -EPS || along > len + EPS) return Infinity;
  return Math.abs(dx * (py - ay) - dy * (px - ax)) / len;
}

/**
 * Cuts edge a-b of zone za (its first vertex ia) where edge c-d of zone zc (first vertex ic)
 * meets it: at c or d when they lie on a-b, else where the two cross. The crossing point is worked
 * out with the two edges in one fixed order, so both zones get the same point to the last bit.
 */
function cutBy(za: number, ia: number, ax: number, ay: number, bx: number, by: number, zc: number, ic: number, cx: number, cy: number, dx: number, dy: number): void {
  const lenA2 = (bx - ax) ** 2 + (by - ay) ** 2;
  // an end of c-d that is an end of a-b lies on it and cuts nothing: zones digitised from one map share vertices
  const endC = (cx === ax && cy === ay) || (cx === bx && cy === by), endD = (dx === ax && dy === ay) || (dx === bx && dy === by);
  const touchC = endC || (nearBox(ax, ay, bx, by, cx, cy) && nearSegment(ax, ay, bx, by, cx, cy) <= EPS);
  const touchD = endD || (nearBox(ax, ay, bx, by, dx, dy) && nearSegment(ax, ay, bx, by, dx, dy) <= EPS);
  if (touchC && !endC) splitAt(ax, ay, bx, by, lenA2, cx, cy);
  if (touchD && !endD) splitAt(ax, ay, bx, by, lenA2, dx, dy);
  if (touchC || touchD || nearSegment(cx, cy, dx, dy, ax, ay) <= EPS || nearSegment(cx, cy, dx, dy, bx, by) <= EPS) return;
  if (!(side(ax, ay, bx, by, cx, cy) * side(ax, ay, bx, by, dx, dy) < 0 && side(cx, cy, dx, dy, ax, ay) * side(cx, cy, dx, dy, bx, by) < 0)) return;
  const aFirst = za < zc || (za === zc && ia < ic);
  const p1x = aFirst ? ax : cx, p1y = aFirst ? ay : cy, p2x = aFirst ? bx : dx, p2y = aFirst ? by : dy;
  const q1x = aFirst ? cx : ax, q1y = aFirst ? cy : ay, q2x = aFirst ? dx : bx, q2y = aFirst ? dy : by;
  const u = ((q1x - p1x) * (q2y - q1y) - (q1y - p1y) * (q2x - q1x)) / ((p2x - p1x) * (q2y - q1y) - (p2y - p1y) * (q2x - q1x));
  const x = p1x + (p2x - p1x) * u, y = p1y + (p2y - p1y) * u;
  addSplit(((x - ax) * (bx - ax) + (y - ay) * (by - ay)) / lenA2, x, y);
}

/** Whether p lies in the box of a-b grown by 2 EPS, as every point within EPS of a-b (nearSegment) does. */
function nearBox(ax: number, ay: number, bx: number, by: number, px: number, py: number): boolean {
  return px >= Math.min(ax, bx) - 2 * EPS && px <= Math.max(ax, bx) + 2 * EPS && py >= Math.min(ay, by) - 2 * EPS && py <= Math.max(ay, by) + 2 * EPS;
}

/** Twice the signed area of p, q, r: positive when r lies left of p-q. */
function side(px: number, py: number, qx: number, qy: number, rx: number, ry: number): number {
  return (qx - px) * (ry - py) - (qy - py) * (rx - px);
}

/** Cuts a-b at the other zone's vertex p, which lies on it, unless p is one of its ends. */
function splitAt(ax: number, ay: number, bx: number, by: number, lenA2: number, px: number, py: number): void {
  if (Math.hypot(px - ax, py - ay) <= EPS || Math.hypot(px - bx, py - by) <= EPS) return;
  addSplit(((px - ax) * (bx - ax) + (py - ay) * (by - ay)) / lenA2, px, py);
}

// edges of the other zones near the run of edges being cut, with their ends (x0, y0, x1, y1) for the
// filter each edge of the run makes; and the edges of one zone near a piece of an edge
const near = edgeList(), nearPiece = edgeList();
let nearEnds = new Float64Array(256);

/** Copies the ends of the edges near.ids[from .. to - 1] of zone b into nearEnds. */
function copyEnds(b: ZoneOutline, from: number, to: number): void {
  if (nearEnds.length < 4 * to) {
    const grown = new Float64Array(8 * to);
    grown.set(nearEnds);
    nearEnds = grown;
  }
  for (let m = from; m < to; m++) {
    const e = near.ids[m], f = b.next[e];
    nearEnds[4 * m] = b.x[e]; nearEnds[4 * m + 1] = b.y[e]; nearEnds[4 * m + 2] = b.x[f]; nearEnds[4 * m + 3] = b.y[f];
  }
}

/** Where the piece p-q of an edge lies against zone b: on one of b's edges (either way round), inside, or outside. */
function classify(b: ZoneOutline, px: number, py: number, qx: number, qy: number): number {
  const mx = (px + qx) / 2, my = (py + qy) / 2;
  const count = edgesNear(b, mx - EPS, my - EPS, mx + EPS, my + EPS, nearPiece);
  for (let k = 0; k < count; k++) {
    const e = nearPiece.ids[k], j = b.next[e];
    const cx = b.x[e], cy = b.y[e], dx = b.x[j], dy = b.y[j];
    if (nearSegment(cx, cy, dx, dy, mx, my) > EPS) continue;
    const len = Math.hypot(dx - cx, dy - cy);
    if (Math.abs(side(cx, cy, dx, dy, px, py)) > EPS * len || Math.abs(side(cx, cy, dx, dy, qx, qy)) > EPS * len) continue;
    return (qx - px) * (dx - cx) + (qy - py) * (dy - cy) > 0 ? SHARED_SAME : SHARED_OPPOSITE;
  }
  return pointInOutline(b, mx, my) ? INSIDE : OUTSIDE;
}

/**
 * Overlap areas of every pair of zones whose boxes meet, and the holes of their union.
 * Example: zoneOverlay([zoneOutline(squareA), zoneOutline(squareB)]).overlapM2.get(overlapKey(0, 1, 2))
 */
export function zoneOverlay(outlines: ZoneOutline[]): ZoneOverlay {
  const count = outlines.length;
  const boxes = boxIndex(count, (i, add) => add(outlines[i].minX - EPS, outlines[i].minY - EPS, outlines[i].maxX + EPS, outlines[i].maxY + EPS));
  const overlapM2 = new Map<number, number>();
  const links: Link[] = [];
  // one origin for the union's rings, near the zones, so that the sums keep their digits
  let ox = 0, oy = 0;
  if (count > 0) {
    ox = (Math.min(...outlines.map((o) => o.minX)) + Math.max(...outlines.map((o) => o.maxX))) / 2 * RAD;
    oy = Math.sin((Math.min(...outlines.map((o) => o.minY)) + Math.max(...outlines.map((o) => o.maxY))) / 2 * RAD);
  }
  for (let za = 0; za < count; za++) {
    const a = outlines[za];
    const others = boxes.search(a.minX, a.minY, a.maxX, a.maxY).filter((zb) => zb !== za).sort((p, q) => p - q);
    const k = others.length;
    const status = new Uint8Array(k), busy = new Uint8Array(k);
    // per pair, SHARED_SAME or SHARED_OPPOSITE when the other zone has the edge being cut itself, else UNKNOWN
    const whole = new Uint8Array(k);
    // the other zones whose box meets the run of a's edges (a's index node) that holds the edge being
    // cut, and their edges near that run: one search per run and zone, which each edge of the run
    // filters, finds what a search per edge would. Every edge of the run lies outside the other zones.
    const active = new Uint32Array(k), nearStart = new Uint32Array(k + 1);
    let activeCount = 0, run = -1;
    // per pair, where the run of pieces in the other zone began on the edge being cut
    const runOn = new Uint8Array(k), runX = new Float64Array(k), runY = new Float64Array(k);
    // per pair, an origin in the middle of the two boxes' overlap, and the running sum
    const pairX = new Float64Array(k), pairS = new Float64Array(k), pairSum = new Float64Array(k);
    others.forEach((zb, n) => {
      const b = outlines[zb];
      pairX[n] = ((Math.max(a.minX, b.minX) + Math.min(a.maxX, b.maxX)) / 2) * RAD;
      pairS[n] = Math.sin(((Math.max(a.minY, b.minY) + Math.min(a.maxY, b.maxY)) / 2) * RAD);
    });
    for (let r = 0; r + 1 < a.ringStart.length; r++) {
      status.fill(UNKNOWN);
      run = -1;
      let open: Link | null = null, first: Link | null = null, firstAtStart = false;
      for (let i = a.ringStart[r]; i < a.ringStart[r + 1]; i++) {
        const j = a.next[i];
        const ax = a.x[i], ay = a.y[i], bx = a.x[j], by = a.y[j];
        const minX = Math.min(ax, bx) - EPS, minY = Math.min(ay, by) - EPS, maxX = Math.max(ax, bx) + EPS, maxY = Math.max(ay, by) + EPS;
        if (Math.floor(i / NODE_SIZE) !== run) {
          run = Math.floor(i / NODE_SIZE);
          const box = 4 * run;
          const runMinX = a.nodeBox[box] - EPS, runMinY = a.nodeBox[box + 1] - EPS, runMaxX = a.nodeBox[box + 2] + EPS, runMaxY = a.nodeBox[box + 3] + EPS;
          activeCount = 0;
          for (let n = 0; n < k; n++) {
            const b = outlines[others[n]];
            nearStart[n + 1] = nearStart[n];
            if (runMaxX < b.minX || runMinX > b.maxX || runMaxY < b.minY || runMinY > b.maxY) {
              status[n] = OUTSIDE;
              busy[n] = 0;
              whole[n] = UNKNOWN;
              continue;
            }
            active[activeCount++] = n;
            nearStart[n + 1] = edgesNear(b, runMinX, runMinY, runMaxX, runMaxY, near, nearStart[n]);
            copyEnds(b, nearStart[n], nearStart[n + 1]);
          }
        }
        splitCount = 0;
        for (let t = 0; t < activeCount; t++) {
          const n = active[t], b = outlines[others[n]];
          busy[n] = 0;
          whole[n] = UNKNOWN;
          if (maxX < b.minX || minX > b.maxX || maxY < b.minY || minY > b.maxY) {
            status[n] = OUTSIDE;
            continue;
          }
          for (let m = nearStart[n]; m < nearStart[n + 1]; m++) {
            const cx = nearEnds[4 * m], cy = nearEnds[4 * m + 1], dx = nearEnds[4 * m + 2], dy = nearEnds[4 * m + 3];
            if ((cx > maxX && dx > maxX) || (cx < minX && dx < minX) || (cy > maxY && dy > maxY) || (cy < minY && dy < minY)) continue;
            busy[n] = 1;
            // the same edge, either way round, cuts nothing, and every piece of a-b lies on it
            if (cx === ax && cy === ay && dx === bx && dy === by) whole[n] = SHARED_SAME;
            else if (cx === bx && cy === by && dx === ax && dy === ay) whole[n] = SHARED_OPPOSITE;
            else cutBy(za, i, ax, ay, bx, by, others[n], near.ids[m], cx, cy, dx, dy);
          }
        }
        sortSplits();
        // in a pair's overlap, pieces in a row inside the other zone make one chord: a split made by a
        // third zone is no vertex of it. The union keeps every split, as a vertex where a run may end.
        let edgeBusy = false;
        for (let t = 0; t < activeCount; t++) if (busy[active[t]]) edgeBusy = true;
        if (edgeBusy) open = null;
        let px = ax, py = ay;
        for (let s = 0; s <= splitCount; s++) {
          const qx = s < splitCount ? splitX[s] : bx, qy = s < splitCount ? splitY[s] : by;
          if (qx === px && qy === py) continue;
          let onUnion = true;
          for (let t = 0; t < activeCount; t++) {
            const n = active[t];
            if (whole[n] !== UNKNOWN) status[n] = whole[n];
            else if (busy[n] || status[n] >= SHARED_SAME) status[n] = classify(outlines[others[n]], px, py, qx, qy);
            const st = status[n], lower = za < others[n];
            const inPair = st === INSIDE || (st === SHARED_SAME && lower);
            if (inPair && !runOn[n]) {
              runOn[n] = 1;
              runX[n] = px;
              runY[n] = py;
            } else if (!inPair && runOn[n]) {
              runOn[n] = 0;
              pairSum[n] += term(runX[n], runY[n], px, py, pairX[n], pairS[n]);
            }
            if (st === INSIDE || st === SHARED_OPPOSITE || (st === SHARED_SAME && !lower)) onUnion = false;
          }
          if (!onUnion) open = null;
          else {
            // near another zone every piece is a run of its own, so runs of other zones can join at its ends
            if (open === null || edgeBusy) {
              open = { x0: px, y0: py, x1: px, y1: py, dx0: Number.NaN, dy0: 0, dx1: 0, dy1: 0, area: 0, sumLon: 0, sumLat: 0, vertices: 0 };
              if (first === null) {
                first = open;
                firstAtStart = i === a.ringStart[r] && !edgeBusy;
              }
              links.push(open);
            }
            addChord(open, px, py, qx, qy, ox, oy);
          }
          px = qx;
          py = qy;
        }
        if (edgeBusy) open = null;
        for (let t = 0; t < activeCount; t++) {
          const n = active[t];
          if (!runOn[n]) continue;
          runOn[n] = 0;
          pairSum[n] += term(runX[n], runY[n], bx, by, pairX[n], pairS[n]);
        }
      }
      // a run that reaches the ring's end goes on into the run that left its first vertex
      if (open !== null && first !== null && open !== first && firstAtStart) {
        first.x0 = open.x0; first.y0 = open.y0; first.dx0 = open.dx0; first.dy0 = open.dy0;
        first.area += open.area; first.sumLon += open.sumLon; first.sumLat += open.sumLat; first.vertices += open.vertices;
        links.splice(links.lastIndexOf(open), 1);
      }
    }
    // each pair's sum gathers A's pieces here and B's when B's turn comes
    others.forEach((zb, n) => overlapM2.set(overlapKey(za, zb, count), (overlapM2.get(overlapKey(za, zb, count)) ?? 0) + pairSum[n]));
  }
  for (const [key, sum] of overlapM2) {
    if (sum > 0) overlapM2.set(key, sum * EARTH_RADIUS_M * EARTH_RADIUS_M);
    else overlapM2.delete(key);
  }
  return { overlapM2, holes: unionHoles(links) };
}

/** The chord p-q's term of the area sum (Green's theorem in longitude against sine of latitude), about an origin. */
function term(px: number, py: number, qx: number, qy: number, ox: number, os: number): number {
  const xp = px * RAD - ox, sp = Math.sin(py * RAD) - os, xq = qx * RAD - ox, sq = Math.sin(qy * RAD) - os;
  return (xp * sq - xq * sp) / 2;
}

/** Adds the chord p-q to a run of union boundary. */
function addChord(link: Link, px: number, py: number, qx: number, qy: number, ox: number, os: number): void {
  if (Number.isNaN(link.dx0)) {
    link.dx0 = qx - px;
    link.dy0 = qy - py;
  }
  link.area += term(px, py, qx, qy, ox, os);
  link.sumLon += px;
  link.sumLat += py;
  link.vertices++;
  link.x1 = qx; link.y1 = qy; link.dx1 = qx - px; link.dy1 = qy - py;
}

/** Insertion sort of the split points by their place along the edge (few per edge). */
function sortSplits(): void {
  for (let i = 1; i < splitCount; i++) {
    const t = splitT[i], x = splitX[i], y = splitY[i];
    let j = i - 1;
    for (; j >= 0 && splitT[j] > t; j--) {
      splitT[j + 1] = splitT[j]; splitX[j + 1] = splitX[j]; splitY[j + 1] = splitY[j];
    }
    splitT[j + 1] = t; splitX[j + 1] = x; splitY[j + 1] = y;
  }
}

/**
 * Joins the runs of union boundary end to start into rings. The union lies on the left of each
 * run, so a clockwise ring bounds a hole; where several runs leave one point, the sharpest turn to
 * the right keeps a hole that touches another ring at a point a ring of its own.
 */
function unionHoles(links: Link[]): ZoneHole[] | null {
  // a run may end where the next begins or, where two zones' vertices differ by rounding, next to it
  const starts = boxIndex(links.length, (i, add) => add(links[i].x0, links[i].y0, links[i].x0, links[i].y0));
  const startingNear = (x: number, y: number): number[] => starts.search(x - 2 * EPS, y - 2 * EPS, x + 2 * EPS, y + 2 * EPS);
  const used = new Uint8Array(links.length);
  const holes: ZoneHole[] = [];
  for (let start = 0; start < links.length; start++) {
    if (used[start]) continue;
    let area = 0, sumLon = 0, sumLat = 0, vertices = 0;
    let link = links[start];
    used[start] = 1;
    for (;;) {
      area += link.area; sumLon += link.sumLon; sumLat += link.sumLat; vertices += link.vertices;
      if (Math.abs(link.x1 - links[start].x0) <= 2 * EPS && Math.abs(link.y1 - links[start].y0) <= 2 * EPS) break;
      const candidates = startingNear(link.x1, link.y1).filter((c) => !used[c]);
      if (candidates.length === 0) return null;
      let best = candidates[0], bestTurn = Infinity;
      for (const c of candidates) {
        const turn = Math.atan2(link.dx1 * links[c].dy0 - link.dy1 * links[c].dx0, link.dx1 * links[c].dx0 + link.dy1 * links[c].dy0);
        if (turn < bestTurn) { best = c; bestTurn = turn; }
      }
      used[best] = 1;
      link = links[best];
    }
    if (area < 0) holes.push({ areaM2: -area * EARTH_RADIUS_M * EARTH_RADIUS_M, lon: sumLon / vertices, lat: sumLat / vertices });
  }
  return holes;
}
