import Flatbush from 'flatbush';
import { boxIndex } from './box-index.js';
import { directionAt, type LineGeometry, type LineTable, asLineTable } from './lines.js';
import type { StationTable } from './stations.js';
import { newColumn } from '../shared/columns.js';

export const FACING_PAIRED = 0;
export const FACING_NO_PARTNER = 1;
export const FACING_NOT_PARALLEL = 2;
export const FACING_OUTSIDE_AQUIFER = 3;
export const FACING_REASON_NAMES = ['paired', 'no-partner', 'not-parallel', 'outside-aquifer'] as const;

/**
 * What each station faces on each side. Index i = 2 * station + side; side 0 is left of the
 * digitised direction, side 1 right.
 * - paired: partner, transectLengthM (transect length), endX/endY (crossing), partnerChainageM, angleDeg set.
 * - not-parallel: partner = -1; hitLine, transectLengthM, endX/endY, partnerChainageM, angleDeg describe the
 *   first line crossed, which runs across rather than alongside.
 * - no-partner: partner = hitLine = -1; transectLengthM = maxGapM and endX/endY the far end of the cast;
 *   partnerChainageM, angleDeg, partnerSide are NaN / 255.
 */
export interface FacingTable {
  count: number;
  partner: Int32Array;
  reason: Uint8Array;
  transectLengthM: Float64Array;
  endX: Float64Array;
  endY: Float64Array;
  partnerChainageM: Float64Array;
  /** angle between the two lines, 0 to 90 degrees, whatever their digitised directions */
  angleDeg: Float64Array;
  /** first other line crossed, paired or not; -1 if none */
  hitLine: Int32Array;
  /** side of the crossed line the transect comes from (0 left, 1 right of its direction), 255 if none */
  partnerSide: Uint8Array;
}

export interface CastOptions {
  maxGapM: number;
  maxAngleDeg: number;
  /** Columns to cast into (views of a larger table, say, in shared memory) instead of new ones; count must be twice the stations'. */
  into?: FacingTable;
  /**
   * Half the window over which a partner's direction is smoothed (m). Default: half the longest
   * station interval of `stations`; a tile casting part of a district gives the whole district's.
   */
  halfWindowM?: number;
  /**
   * Index only the segments that meet this box [minX, minY, maxX, maxY] (m): a tile's stations
   * grown by maxGapM (its halo), which holds every transect they cast. Default: every segment.
   */
  segmentBox?: readonly [number, number, number, number] | null;
  /** The segments of these same lines, indexed once in shared memory (sharedCastIndex, opened with castIndexOf) for many casts, in any thread. */
  index?: CastIndex;
}

/** The lines' segments indexed for casting: build once with sharedCastIndex, cast many chunks of stations with it. */
export interface CastIndex {
  readonly segments: unknown;
}

// A crossing this close to the station is the station's own junction with a touching line (a
// T-junction or a shared end), not a line across the land; centimetre digitising makes 1 mm safe.
const JUNCTION_TOLERANCE_M = 1e-3;
// Lets a crossing exactly at a shared vertex count for either segment despite rounding.
const VERTEX_SLACK = 1e-9;

/** One entry per segment of non-zero length, indexed by flatbush. */
interface SegmentIndex {
  vertex: Uint32Array;
  part: Uint32Array;
  tree: Flatbush;
}

function buildSegmentIndex(t: LineTable, box: CastOptions['segmentBox'] = null, shared = false): SegmentIndex {
  const partCount = t.partLine.length;
  const vertex = newColumn(Uint32Array, t.x.length, shared);
  const part = newColumn(Uint32Array, t.x.length, shared);
  let n = 0;
  const outside = (v: number) =>
    box !== null &&
    (Math.max(t.x[v], t.x[v + 1]) < box[0] || Math.max(t.y[v], t.y[v + 1]) < box[1] || Math.min(t.x[v], t.x[v + 1]) > box[2] || Math.min(t.y[v], t.y[v + 1]) > box[3]);
  for (let p = 0; p < partCount; p++) {
    for (let v = t.partVertexStart[p]; v + 1 < t.partVertexStart[p + 1]; v++) {
      if (t.chainageM[v + 1] > t.chainageM[v] && !outside(v)) {
        vertex[n] = v;
        part[n] = p;
        n++;
      }
    }
  }
  // 32-bit boxes, widened outwards so none is missed (boxIndex): half the memory of 64-bit ones
  // (at a million stations, 60 MB); the exact crossing test after the search decides
  const tree = boxIndex(n, (i, add) => {
    const v = vertex[i];
    add(Math.min(t.x[v], t.x[v + 1]), Math.min(t.y[v], t.y[v + 1]), Math.max(t.x[v], t.x[v + 1]), Math.max(t.y[v], t.y[v + 1]));
  }, shared, Float32Array);
  return { vertex: vertex.subarray(0, n), part: part.subarray(0, n), tree };
}

/** The half window a partner's direction is smoothed over: half the longest station interval (m). */
export function smoothingHalfWindowM(stations: Pick<StationTable, 'count' | 'lengthM'>): number {
  let halfWindowM = 0;
  for (let i = 0; i < stations.count; i++) halfWindowM = Math.max(halfWindowM, stations.lengthM[i] / 2);
  return halfWindowM;
}

/**
 * Every segment of the lines, indexed in shared memory (sharedCastIndex), for castTransects'
 * `index` option with the same lines. It is posted to worker threads as these buffers (a
 * structured clone keeps shared buffers, not the index's class), and each thread opens it with
 * castIndexOf: every thread reads the one copy instead of building its own.
 */
export interface SharedCastIndex {
  vertex: Uint32Array;
  part: Uint32Array;
  tree: SharedArrayBuffer;
}

export function sharedCastIndex(lines: LineTable): SharedCastIndex {
  const { vertex, part, tree } = buildSegmentIndex(lines, null, true);
  return { vertex, part, tree: tree.data as SharedArrayBuffer };
}

/** A shared index (sharedCastIndex, here or posted from another thread) for castTransects. */
export function castIndexOf(shared: SharedCastIndex): CastIndex {
  const segments: SegmentIndex = { vertex: shared.vertex, part: shared.part, tree: Flatbush.from(shared.tree) };
  return { segments };
}

function checkOptions(o: CastOptions): void {
  if (!(o.maxGapM > 0) || !Number.isFinite(o.maxGapM)) throw new Error(`Unexpected maxGapM value: ${o.maxGapM}.`);
  if (!(o.maxAngleDeg >= 0 && o.maxAngleDeg <= 90)) throw new Error(`Unexpected maxAngleDeg value: ${o.maxAngleDeg} (want 0 to 90).`);
}

/**
 * Casts a transect square to the line from every station on both sides, up to maxGapM, and
 * records the first other line crossed. Crossings with the station's own line are ignored, so a
 * line's meanders and parts never block or pair with it.
 * Example: castTransects(lines, placeStations(lines, 50), { maxGapM: 1000, maxAngleDeg: 30 })
 */
export function castTransects(lines: LineGeometry[] | LineTable, stations: StationTable, options: CastOptions): FacingTable {
  checkOptions(options);
  const t = asLineTable(lines);
  for (let i = 0; i < stations.count; i++) {
    if (stations.line[i] >= t.lineCount) throw new Error(`Station ${i} is on line ${stations.line[i]}, but there are ${t.lineCount} lines.`);
  }
  const seg = options.index ? (options.index.segments as SegmentIndex) : buildSegmentIndex(t, options.segmentBox ?? null);
  const n = stations.count * 2;
  if (options.into && options.into.count !== n) throw new Error(`Unexpected ${options.into.count} facings to cast ${stations.count} stations into.`);
  const f: FacingTable = options.into ?? {
    count: n,
    partner: new Int32Array(n),
    reason: new Uint8Array(n),
    transectLengthM: new Float64Array(n),
    endX: new Float64Array(n),
    endY: new Float64Array(n),
    partnerChainageM: new Float64Array(n),
    angleDeg: new Float64Array(n),
    hitLine: new Int32Array(n),
    partnerSide: new Uint8Array(n),
  };
  f.partner.fill(-1);
  f.reason.fill(0);
  f.transectLengthM.fill(0);
  f.endX.fill(0);
  f.endY.fill(0);
  f.partnerChainageM.fill(NaN);
  f.angleDeg.fill(NaN);
  f.hitLine.fill(-1);
  f.partnerSide.fill(255);
  // the partner's direction is smoothed over the same window as the stations' own (half a step)
  const halfWindowM = options.halfWindowM ?? smoothingHalfWindowM(stations);
  const cosMax = Math.cos((options.maxAngleDeg * Math.PI) / 180);
  const maxGapM = options.maxGapM;
  const minT = JUNCTION_TOLERANCE_M / maxGapM;

  // state shared with the filter below, which does the work inside flatbush's search and keeps
  // no result list, so the loop allocates nothing of its own
  let px = 0, py = 0, dx = 0, dy = 0, ownLine = 0;
  let bestT = Infinity, bestSeg = -1, bestU = 0;
  const visit = (i: number): boolean => {
    const v = seg.vertex[i];
    if (t.partLine[seg.part[i]] === ownLine) return false;
    const ax = t.x[v], ay = t.y[v];
    const ex = t.x[v + 1] - ax, ey = t.y[v + 1] - ay;
    const denom = dx * ey - dy * ex;
    // parallel or collinear: the transect runs along the segment and crosses nothing
    if (Math.abs(denom) <= 1e-12 * Math.hypot(dx, dy) * Math.hypot(ex, ey)) return false;
    const qx = ax - px, qy = ay - py;
    const tt = (qx * ey - qy * ex) / denom;
    const u = (qx * dy - qy * dx) / denom;
    // an exact tie (a shared vertex, a junction) goes to the first segment in the line table, so the
    // answer does not hang on the order the index visits them in (a tile's index holds fewer)
    if (tt >= minT && tt <= 1 && u >= -VERTEX_SLACK && u <= 1 + VERTEX_SLACK && (tt < bestT || (tt === bestT && v < seg.vertex[bestSeg]))) {
      bestT = tt;
      bestSeg = i;
      bestU = Math.min(1, Math.max(0, u));
    }
    return false;
  };

  const dir = new Float64Array(2);
  for (let s = 0; s < stations.count; s++) {
    for (let side = 0; side < 2; side++) {
      const k = 2 * s + side;
      const sign = side === 0 ? 1 : -1;
      px = stations.x[s];
      py = stations.y[s];
      // left normal of (dirX, dirY) is (-dirY, dirX) in a y-up plane
      dx = -sign * stations.dirY[s] * maxGapM;
      dy = sign * stations.dirX[s] * maxGapM;
      ownLine = stations.line[s];
      bestT = Infinity;
      bestSeg = -1;
      seg.tree.search(Math.min(px, px + dx), Math.min(py, py + dy), Math.max(px, px + dx), Math.max(py, py + dy), visit);
      if (bestSeg < 0) {
        f.reason[k] = FACING_NO_PARTNER;
        f.transectLengthM[k] = maxGapM;
        f.endX[k] = px + dx;
        f.endY[k] = py + dy;
        continue;
      }
      const v = seg.vertex[bestSeg];
      const p = seg.part[bestSeg];
      const hit = t.partLine[p];
      const cx = px + bestT * dx;
      const cy = py + bestT * dy;
      const c = t.chainageM[v] + bestU * (t.chainageM[v + 1] - t.chainageM[v]);
      directionAt(t, p, c, halfWindowM, dir);
      const cos = Math.min(1, Math.abs(stations.dirX[s] * dir[0] + stations.dirY[s] * dir[1]));
      f.hitLine[k] = hit;
      f.transectLengthM[k] = bestT * maxGapM;
      f.endX[k] = cx;
      f.endY[k] = cy;
      f.partnerChainageM[k] = c;
      f.angleDeg[k] = (Math.acos(cos) * 180) / Math.PI;
      f.partnerSide[k] = dir[0] * (py - cy) - dir[1] * (px - cx) > 0 ? 0 : 1;
      if (cos >= cosMax) {
        f.partner[k] = hit;
        f.reason[k] = FACING_PAIRED;
      } else {
        f.reason[k] = FACING_NOT_PARALLEL;
      }
    }
  }
  return f;
}
