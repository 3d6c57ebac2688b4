import { pointAt, type LineGeometry, type LineTable, asLineTable } from './lines.js';
import { convexHull, dropRepeats, reverseRing, ringIsSimple, signedArea2 } from './rings.js';
import type { StationTable } from './stations.js';
import { FACING_PAIRED, type FacingTable } from './transects.js';

/**
 * The land between two facing reaches. Line a is the one whose first vertex lies further west (then
 * south; never chosen by id or feature order), except for the rare strip made only of b's facings (then stationsB is empty).
 */
export interface Strip {
  id: string;
  lineA: number;
  lineB: number;
  sideA: 0 | 1;
  /** side of b that faces a (b's facings in stationsB are on this side) */
  sideB: 0 | 1;
  /** stations of a facing b, consecutive along a */
  stationsA: Uint32Array;
  /** stations of b facing a whose transects land on a inside chainageA */
  stationsB: Uint32Array;
  /** chainage on a represented by stationsA */
  chainageA: [number, number];
  /** range of chainage on b where a's transects land */
  chainageB: [number, number];
  spacingMeanM: number;
  spacingMinM: number;
  spacingMaxM: number;
  /** closed (last vertex repeats the first), counter-clockwise, no self-intersection */
  ringM: Float64Array;
}

export interface StripOptions {
  /** relative change of spacing between neighbouring stations that ends a strip; default 0.25 */
  spacingJump?: number;
}

interface Run {
  line: number;
  side: 0 | 1;
  partner: number;
  first: number;
  last: number;
  startM: number;
  endM: number;
}

/** Stations of each line as [start, end) ranges; placeStations orders them by line. */
function stationRanges(stations: StationTable, lineCount: number): Uint32Array {
  const start = new Uint32Array(lineCount + 1);
  for (let s = 0; s < stations.count; s++) {
    if (s > 0 && stations.line[s] < stations.line[s - 1]) throw new Error(`Stations are not ordered by line at station ${s}.`);
    start[stations.line[s] + 1] = s + 1;
  }
  for (let l = 1; l <= lineCount; l++) start[l] = Math.max(start[l], start[l - 1]);
  return start;
}

/** Splits the eligible facings of one line and side into runs of one partner and smooth spacing. */
function findRuns(line: number, side: 0 | 1, from: number, to: number, stations: StationTable, f: FacingTable, jump: number, eligible: (k: number) => boolean): Run[] {
  const runs: Run[] = [];
  let run: Run | null = null;
  for (let s = from; s < to; s++) {
    const k = 2 * s + side;
    if (!eligible(k)) {
      run = null;
      continue;
    }
    const prev = 2 * (s - 1) + side;
    const continues =
      run !== null &&
      f.partner[prev] === f.partner[k] &&
      f.partnerSide[prev] === f.partnerSide[k] &&
      stations.part[s - 1] === stations.part[s] &&
      Math.abs(f.transectLengthM[k] - f.transectLengthM[prev]) <= jump * Math.min(f.transectLengthM[k], f.transectLengthM[prev]);
    if (continues && run) {
      run.last = s;
      run.endM = stations.chainageM[s] + stations.lengthM[s] / 2;
    } else {
      run = { line, side, partner: f.partner[k], first: s, last: s, startM: stations.chainageM[s] - stations.lengthM[s] / 2, endM: stations.chainageM[s] + stations.lengthM[s] / 2 };
      runs.push(run);
    }
  }
  return runs;
}

/**
 * Groups paired facings into strips, one per facing stretch of each pair of lines; every paired
 * facing ends up in exactly one strip. Line a of a strip is the one whose first vertex lies further
 * west (then south), whatever the ids or the order of the features. Ids are `${idA}|${idB}|${k}`, k
 * counting that pair's strips in chainage order, so the same input always gives the same ids.
 * Example: buildStrips(lines, stations, castTransects(lines, stations, opts))[0].spacingMeanM
 */
export function buildStrips(lines: LineGeometry[] | LineTable, stations: StationTable, facings: FacingTable, options: StripOptions = {}): Strip[] {
  const jump = options.spacingJump ?? 0.25;
  if (!(jump >= 0)) throw new Error(`Unexpected spacingJump value: ${jump}.`);
  if (facings.count !== 2 * stations.count) throw new Error(`Facings (${facings.count}) do not match stations (${stations.count}).`);
  const table = asLineTable(lines);
  const ranges = stationRanges(stations, table.lineCount);
  const ids = table.ids;
  // which of two facing lines is a: by where the lines lie, never by their ids or the order of the
  // features, so that renaming or reordering the lines gives the same strips
  const rank = geometricRank(table);
  const first = (a: number, b: number): boolean => rank[a] < rank[b];
  const paired = (k: number): boolean => facings.reason[k] === FACING_PAIRED && facings.partner[k] >= 0;

  const runsOf = (eligible: (k: number) => boolean): Run[] => {
    const all: Run[] = [];
    for (let l = 0; l < table.lineCount; l++) {
      const own = [...findRuns(l, 0, ranges[l], ranges[l + 1], stations, facings, jump, eligible), ...findRuns(l, 1, ranges[l], ranges[l + 1], stations, facings, jump, eligible)];
      own.sort((p, q) => p.startM - q.startM || p.side - q.side);
      for (const item of own) all.push(item);
    }
    return all;
  };
  const mainRuns = runsOf((k) => paired(k) && first(stations.line[k >> 1], facings.partner[k]));

  // b's facings join the a-run they land in, from the side the a-run faces
  const byPair = new Map<string, number[]>();
  mainRuns.forEach((r, i) => {
    const key = `${r.line}:${r.partner}`;
    const list = byPair.get(key);
    if (list) list.push(i);
    else byPair.set(key, [i]);
  });
  // A b facing that lands just past an a-run's end (within one station interval, as happens at
  // line ends and junctions) joins it too, rather than making a strip of a few metres on its own.
  const claimedBy = new Int32Array(facings.count).fill(-1);
  for (let k = 0; k < facings.count; k++) {
    const b = stations.line[k >> 1];
    if (!paired(k) || first(b, facings.partner[k])) continue;
    const c = facings.partnerChainageM[k];
    let best = -1, bestMiss = Infinity;
    for (const i of byPair.get(`${facings.partner[k]}:${b}`) ?? []) {
      const r = mainRuns[i];
      if (r.side !== facings.partnerSide[k] || facings.partnerSide[2 * r.first + r.side] !== (k & 1)) continue;
      const miss = c < r.startM ? r.startM - c : c > r.endM ? c - r.endM : 0;
      const reach = Math.max(stations.lengthM[r.first], stations.lengthM[r.last], stations.lengthM[k >> 1]);
      if (miss <= reach && miss < bestMiss) {
        best = i;
        bestMiss = miss;
        if (miss === 0) break;
      }
    }
    claimedBy[k] = best;
  }
  const leftoverRuns = runsOf((k) => paired(k) && !first(stations.line[k >> 1], facings.partner[k]) && claimedBy[k] < 0);

  const stationsB: number[][] = mainRuns.map(() => []);
  for (let k = 0; k < facings.count; k++) if (claimedBy[k] >= 0) stationsB[claimedBy[k]].push(k >> 1);

  const counters = new Map<string, number>();
  const strips: Strip[] = [];
  const all = [...mainRuns.map((r, i) => [r, stationsB[i]] as const), ...leftoverRuns.map((r) => [r, [] as number[]] as const)];
  for (const [r, bs] of all) {
    const key = `${ids[r.line]}|${ids[r.partner]}`;
    const k = counters.get(key) ?? 0;
    counters.set(key, k + 1);
    strips.push(makeStrip(`${key}|${k}`, r, bs, stations, facings, table));
  }
  return strips;
}

/**
 * Each line's place in an order of the lines by their geometry alone: first vertex (west, then south), then
 * last vertex, then length; ids and feature order break ties only between lines that lie exactly alike.
 */
function geometricRank(table: LineTable): Uint32Array {
  const n = table.lineCount;
  const key = new Float64Array(5 * n);
  for (let l = 0; l < n; l++) {
    const firstVertex = table.partVertexStart[table.linePartStart[l]];
    const lastVertex = table.partVertexStart[table.linePartStart[l + 1]] - 1;
    key.set([table.x[firstVertex], table.y[firstVertex], table.x[lastVertex], table.y[lastVertex], table.chainageM[lastVertex]], 5 * l);
  }
  const order = Array.from({ length: n }, (_, l) => l).sort((a, b) => {
    for (let j = 0; j < 5; j++) if (key[5 * a + j] !== key[5 * b + j]) return key[5 * a + j] - key[5 * b + j];
    return table.ids[a] < table.ids[b] ? -1 : table.ids[a] > table.ids[b] ? 1 : a - b;
  });
  const rank = new Uint32Array(n);
  order.forEach((line, position) => (rank[line] = position));
  return rank;
}

function makeStrip(id: string, r: Run, bs: number[], stations: StationTable, f: FacingTable, table: LineTable): Strip {
  const n = r.last - r.first + 1;
  const stationsA = new Uint32Array(n);
  let sum = 0, min = Infinity, max = -Infinity, bMin = Infinity, bMax = -Infinity;
  for (let i = 0; i < n; i++) {
    const s = r.first + i;
    const k = 2 * s + r.side;
    stationsA[i] = s;
    sum += f.transectLengthM[k];
    min = Math.min(min, f.transectLengthM[k]);
    max = Math.max(max, f.transectLengthM[k]);
    bMin = Math.min(bMin, f.partnerChainageM[k]);
    bMax = Math.max(bMax, f.partnerChainageM[k]);
  }
  return {
    id,
    lineA: r.line,
    lineB: r.partner,
    sideA: r.side,
    sideB: f.partnerSide[2 * r.first + r.side] as 0 | 1,
    stationsA,
    stationsB: Uint32Array.from(bs),
    chainageA: [r.startM, r.endM],
    chainageB: [bMin, bMax],
    spacingMeanM: sum / n,
    spacingMinM: min,
    spacingMaxM: max,
    ringM: stripRing(r, stations, f, table),
  };
}

/**
 * Along a from the start of the first station's interval to the end of the last one, back along
 * the crossings on b; b's ends are the first and last crossings moved by the same half interval
 * along a, so two parallel lines give an exact rectangle.
 */
function stripRing(r: Run, stations: StationTable, f: FacingTable, table: LineTable): Float64Array {
  const n = r.last - r.first + 1;
  const ring = new Float64Array(2 * (2 * n + 4));
  const globalPart = table.linePartStart[r.line] + stations.part[r.first];
  const xy = new Float64Array(2);
  let m = 0;
  const put = (x: number, y: number): void => {
    ring[m++] = x;
    ring[m++] = y;
  };
  pointAt(table, globalPart, r.startM, xy);
  put(xy[0], xy[1]);
  for (let s = r.first; s <= r.last; s++) put(stations.x[s], stations.y[s]);
  pointAt(table, globalPart, r.endM, xy);
  put(xy[0], xy[1]);
  const kLast = 2 * r.last + r.side, kFirst = 2 * r.first + r.side;
  const hLast = stations.lengthM[r.last] / 2, hFirst = stations.lengthM[r.first] / 2;
  put(f.endX[kLast] + stations.dirX[r.last] * hLast, f.endY[kLast] + stations.dirY[r.last] * hLast);
  for (let s = r.last; s >= r.first; s--) put(f.endX[2 * s + r.side], f.endY[2 * s + r.side]);
  put(f.endX[kFirst] - stations.dirX[r.first] * hFirst, f.endY[kFirst] - stations.dirY[r.first] * hFirst);

  let out = dropRepeats(ring);
  // crossing transects (a sharp bend of b, say) can tangle the naive ring; the hull is valid
  if (!ringIsSimple(out)) out = convexHull(out);
  if (signedArea2(out) < 0) out = reverseRing(out);
  const closed = new Float64Array(out.length + 2);
  closed.set(out);
  closed[out.length] = out[0];
  closed[out.length + 1] = out[1];
  return closed;
}
