import { directionAt, partEndM, partStartM, pointAt, type LineGeometry, type LineTable, asLineTable } from './lines.js';

/**
 * Stations of all lines, ordered by line, then part, then chainage. Each station sits at the
 * middle of the chainage interval it stands for (lengthM), so a line's lengthM add up to its length.
 */
export interface StationTable {
  count: number;
  /** index into the lines array */
  line: Uint32Array;
  /** index into that line's parts */
  part: Uint32Array;
  chainageM: Float64Array;
  x: Float64Array;
  y: Float64Array;
  /** unit tangent in the digitised direction, smoothed over one step */
  dirX: Float64Array;
  dirY: Float64Array;
  lengthM: Float64Array;
}

// A remainder under a millimetre is rounding in the coordinates (a lon/lat round trip, say), not
// land; it joins the last interval rather than making a sliver station of its own.
const REMAINDER_TOLERANCE_M = 1e-3;

function intervalCount(lengthM: number, stepM: number): number {
  return lengthM > 0 ? Math.max(1, Math.ceil((lengthM - REMAINDER_TOLERANCE_M) / stepM)) : 0;
}

/**
 * Places a station every stepM of chainage on every part. Intervals restart at each part so that
 * a station never straddles a gap between parts; the last interval of a part may be shorter.
 * Example: placeStations([{ id: 'c1', parts: [new Float64Array([0, 0, 250, 0])] }], 100).count === 3
 */
export function placeStations(lines: LineGeometry[] | LineTable, stepM: number): StationTable {
  if (!(stepM > 0) || !Number.isFinite(stepM)) throw new Error(`Unexpected stepM value: ${stepM}.`);
  return placeStationsOnTable(asLineTable(lines), stepM);
}

export function placeStationsOnTable(t: LineTable, stepM: number): StationTable {
  const partCount = t.partLine.length;
  let count = 0;
  for (let p = 0; p < partCount; p++) count += intervalCount(partEndM(t, p) - partStartM(t, p), stepM);

  const s: StationTable = {
    count,
    line: new Uint32Array(count),
    part: new Uint32Array(count),
    chainageM: new Float64Array(count),
    x: new Float64Array(count),
    y: new Float64Array(count),
    dirX: new Float64Array(count),
    dirY: new Float64Array(count),
    lengthM: new Float64Array(count),
  };
  const xy = new Float64Array(2);
  let i = 0;
  for (let p = 0; p < partCount; p++) {
    const c0 = partStartM(t, p);
    const c1 = partEndM(t, p);
    const n = intervalCount(c1 - c0, stepM);
    for (let k = 0; k < n; k++, i++) {
      const a = c0 + k * stepM;
      const b = k === n - 1 ? c1 : c0 + (k + 1) * stepM;
      const c = (a + b) / 2;
      s.line[i] = t.partLine[p];
      s.part[i] = p - t.linePartStart[t.partLine[p]];
      s.chainageM[i] = c;
      s.lengthM[i] = b - a;
      pointAt(t, p, c, xy);
      s.x[i] = xy[0];
      s.y[i] = xy[1];
      directionAt(t, p, c, stepM / 2, xy);
      s.dirX[i] = xy[0];
      s.dirY[i] = xy[1];
    }
  }
  return s;
}
