import { newColumn } from '../shared/columns.js';

/** A line (canal or drain) in metres: each part is interleaved x,y; several parts share one id. */
export interface LineGeometry {
  id: string;
  parts: Float64Array[];
}

/**
 * All lines flattened into typed arrays, with chainage at every vertex, so that stations and
 * transects can find a point by chainage without touching the input objects.
 */
export interface LineTable {
  lineCount: number;
  /** each line's id, in line order */
  ids: string[];
  /** first part of each line; length lineCount + 1 */
  linePartStart: Uint32Array;
  /** first vertex of each part; length partCount + 1 */
  partVertexStart: Uint32Array;
  partLine: Uint32Array;
  /** chainage at each vertex, cumulative across the parts of its line */
  chainageM: Float64Array;
  x: Float64Array;
  y: Float64Array;
}

function checkPart(id: string, part: Float64Array): void {
  if (part.length % 2 !== 0) throw new Error(`Line "${id}" has a part with an odd number of coordinates: ${part.length}.`);
  for (let i = 0; i < part.length; i++) {
    if (!Number.isFinite(part[i])) throw new Error(`Line "${id}" has a non-finite coordinate: ${part[i]}.`);
  }
}

function partLengthM(p: Float64Array): number {
  let sum = 0;
  for (let i = 2; i < p.length; i += 2) sum += Math.hypot(p[i] - p[i - 2], p[i + 1] - p[i - 1]);
  return sum;
}

/** Length of a line in metres, all parts together. */
export function lineLengthM(line: LineGeometry): number {
  let sum = 0;
  for (const p of line.parts) sum += partLengthM(p);
  return sum;
}

/** The table of lines, built once by the caller and shared by every stage, or built here from the lines. */
export function asLineTable(lines: LineGeometry[] | LineTable): LineTable {
  return Array.isArray(lines) ? buildLineTable(lines) : lines;
}

/**
 * The lines' table. With `shared`, its columns live in SharedArrayBuffers, so that worker threads
 * read this one copy (the same numbers; a single thread reads them as fast).
 */
export function buildLineTable(lines: LineGeometry[], shared = false): LineTable {
  let partCount = 0;
  let vertexCount = 0;
  for (const line of lines) {
    for (const p of line.parts) {
      checkPart(line.id, p);
      partCount++;
      vertexCount += p.length / 2;
    }
  }
  const linePartStart = newColumn(Uint32Array, lines.length + 1, shared);
  const partVertexStart = newColumn(Uint32Array, partCount + 1, shared);
  const partLine = newColumn(Uint32Array, partCount, shared);
  const chainageM = newColumn(Float64Array, vertexCount, shared);
  const x = newColumn(Float64Array, vertexCount, shared);
  const y = newColumn(Float64Array, vertexCount, shared);
  let part = 0;
  let v = 0;
  for (let l = 0; l < lines.length; l++) {
    linePartStart[l] = part;
    let c = 0;
    for (const p of lines[l].parts) {
      partVertexStart[part] = v;
      partLine[part] = l;
      for (let i = 0; i < p.length; i += 2, v++) {
        if (i > 0) c += Math.hypot(p[i] - p[i - 2], p[i + 1] - p[i - 1]);
        x[v] = p[i];
        y[v] = p[i + 1];
        chainageM[v] = c;
      }
      part++;
    }
  }
  linePartStart[lines.length] = part;
  partVertexStart[partCount] = v;
  return { lineCount: lines.length, ids: lines.map((line) => line.id), linePartStart, partVertexStart, partLine, chainageM, x, y };
}

/** Chainage range [start, end] of a part. An empty part has start = end. */
export function partStartM(t: LineTable, part: number): number {
  const v0 = t.partVertexStart[part];
  return v0 < t.partVertexStart[part + 1] ? t.chainageM[v0] : 0;
}

export function partEndM(t: LineTable, part: number): number {
  const v1 = t.partVertexStart[part + 1];
  return v1 > t.partVertexStart[part] ? t.chainageM[v1 - 1] : 0;
}

/** Last vertex index v of the part with chainage[v] <= c (clamped), so that v, v+1 bracket c. */
function segmentAt(t: LineTable, part: number, c: number): number {
  let lo = t.partVertexStart[part];
  let hi = t.partVertexStart[part + 1] - 2;
  if (hi < lo) return lo;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (t.chainageM[mid] <= c) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Writes the point at chainage c (clamped to the part) into out[0], out[1]. */
export function pointAt(t: LineTable, part: number, c: number, out: Float64Array): void {
  const v = segmentAt(t, part, c);
  const n = t.partVertexStart[part + 1];
  if (v + 1 >= n) {
    out[0] = t.x[v];
    out[1] = t.y[v];
    return;
  }
  const seg = t.chainageM[v + 1] - t.chainageM[v];
  const f = seg > 0 ? Math.min(1, Math.max(0, (c - t.chainageM[v]) / seg)) : 0;
  out[0] = t.x[v] + f * (t.x[v + 1] - t.x[v]);
  out[1] = t.y[v] + f * (t.y[v + 1] - t.y[v]);
}

const scratch = new Float64Array(4);

/**
 * Unit direction at chainage c, taken as the chord from c - halfWindow to c + halfWindow: a chord
 * averages out digitising jitter, and on a circular arc it stays exactly parallel to the tangent.
 * Writes into out[0], out[1]; falls back to the local segment when the chord has no length.
 */
export function directionAt(t: LineTable, part: number, c: number, halfWindowM: number, out: Float64Array): void {
  const lo = Math.max(partStartM(t, part), c - halfWindowM);
  const hi = Math.min(partEndM(t, part), c + halfWindowM);
  pointAt(t, part, lo, scratch);
  scratch[2] = scratch[0];
  scratch[3] = scratch[1];
  pointAt(t, part, hi, scratch);
  let dx = scratch[0] - scratch[2];
  let dy = scratch[1] - scratch[3];
  let len = Math.hypot(dx, dy);
  if (len === 0) {
    // a closed or doubled-back part: use the first segment with length at or after c
    let v = segmentAt(t, part, c);
    const end = t.partVertexStart[part + 1] - 1;
    while (v < end && t.chainageM[v + 1] === t.chainageM[v]) v++;
    if (v < end) {
      dx = t.x[v + 1] - t.x[v];
      dy = t.y[v + 1] - t.y[v];
      len = Math.hypot(dx, dy);
    }
  }
  out[0] = len > 0 ? dx / len : 1;
  out[1] = len > 0 ? dy / len : 0;
}

/**
 * The stretch of a line between two chainages (m, cumulative across its parts, as in the line
 * table), as parts of x, y pairs: one part per part of the line the stretch touches.
 */
export function cutByChainage(geometry: LineGeometry, fromM: number, toM: number): Float64Array[] {
  const pieces: Float64Array[] = [];
  let start = 0;
  for (const part of geometry.parts) {
    const out: number[] = [];
    let chainage = start;
    for (let i = 2; i < part.length; i += 2) {
      const x0 = part[i - 2], y0 = part[i - 1], x1 = part[i], y1 = part[i + 1];
      const length = Math.hypot(x1 - x0, y1 - y0);
      const c0 = chainage, c1 = chainage + length;
      chainage = c1;
      if (c1 < fromM || c0 > toM || length === 0) continue;
      const a = Math.max(0, (fromM - c0) / length), b = Math.min(1, (toM - c0) / length);
      if (out.length === 0) out.push(x0 + a * (x1 - x0), y0 + a * (y1 - y0));
      out.push(x0 + b * (x1 - x0), y0 + b * (y1 - y0));
    }
    if (out.length >= 4) pieces.push(Float64Array.from(out));
    start = chainage;
  }
  return pieces;
}
