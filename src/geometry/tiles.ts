// Tiles of the work area: a deterministic split of the stations into N bands along the longer side
// of their bounding box, each holding about the same number of stations, so that N processes (an
// array job of a batch engine) share a district's transects. Every process places the same
// stations from the same inputs, so every process draws the same bands.
import type { StationTable } from './stations.js';

/** One tile of a split: its 1-based index and the number of tiles. */
export interface TileOfSplit {
  index: number;
  count: number;
}

/** The bands of a split: along x or y, and the N - 1 cuts between them (band k holds cut[k-1] <= v < cut[k]). */
export interface TileBands {
  axis: 'x' | 'y';
  cutsM: Float64Array;
}

/** Tiles at most (a batch array of more is many tiny jobs, each reading the whole district). */
export const MAX_TILES = 10_000;

export function checkTile(tile: TileOfSplit): void {
  if (!(Number.isInteger(tile.count) && tile.count >= 1 && tile.count <= MAX_TILES)) throw new Error(`Unexpected tile count: ${tile.count} (want 1 to ${MAX_TILES}).`);
  if (!(Number.isInteger(tile.index) && tile.index >= 1 && tile.index <= tile.count)) throw new Error(`Unexpected tile index: ${tile.index} of ${tile.count}.`);
}

/**
 * Cuts the stations into `count` bands with about equal numbers of stations: the cut between bands
 * k and k + 1 is the coordinate of the (k n / count)-th station in order along the axis. Stations
 * on a cut go to the band above it, so every station is in exactly one band.
 * Example: tileBands(stations, 2).cutsM.length === 1
 */
export function tileBands(stations: Pick<StationTable, 'count' | 'x' | 'y'>, count: number): TileBands {
  checkTile({ index: 1, count });
  const box = stationBox(stations, 0);
  const axis = box === null || box[2] - box[0] >= box[3] - box[1] ? 'x' : 'y';
  const sorted = (axis === 'x' ? stations.x : stations.y).slice(0, stations.count).sort();
  const cutsM = new Float64Array(count - 1);
  for (let k = 1; k < count; k++) cutsM[k - 1] = stations.count === 0 ? 0 : sorted[Math.floor((k * stations.count) / count)];
  return { axis, cutsM };
}

/** The 1-based band of a coordinate along the bands' axis. */
export function bandOf(bands: TileBands, valueM: number): number {
  // cuts are few (at most MAX_TILES - 1) and sorted: a binary search for the first cut above the value
  let lo = 0, hi = bands.cutsM.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (bands.cutsM[mid] <= valueM) lo = mid + 1;
    else hi = mid;
  }
  return lo + 1;
}

/** The stations of one tile, by index into the whole table, ascending. */
export function stationsOfTile(stations: Pick<StationTable, 'count' | 'x' | 'y'>, bands: TileBands, tile: TileOfSplit): Uint32Array {
  checkTile(tile);
  if (bands.cutsM.length !== tile.count - 1) throw new Error(`Unexpected bands: ${bands.cutsM.length + 1} for ${tile.count} tiles.`);
  const along = bands.axis === 'x' ? stations.x : stations.y;
  let n = 0;
  const chosen = new Uint32Array(stations.count);
  for (let i = 0; i < stations.count; i++) if (bandOf(bands, along[i]) === tile.index) chosen[n++] = i;
  return chosen.slice(0, n);
}

/** The rows of a station table at the given indices, in their order. */
export function stationSubset(stations: StationTable, indices: Uint32Array): StationTable {
  const take = <T extends Float64Array | Uint32Array>(column: T): T => {
    const out = new (column.constructor as { new (n: number): T })(indices.length);
    for (let k = 0; k < indices.length; k++) out[k] = column[indices[k]];
    return out;
  };
  return {
    count: indices.length,
    line: take(stations.line),
    part: take(stations.part),
    chainageM: take(stations.chainageM),
    x: take(stations.x),
    y: take(stations.y),
    dirX: take(stations.dirX),
    dirY: take(stations.dirY),
    lengthM: take(stations.lengthM),
  };
}

/** The box of some stations grown by a halo on every side (m): [minX, minY, maxX, maxY]; null for none. */
export function stationBox(stations: Pick<StationTable, 'count' | 'x' | 'y'>, haloM: number): [number, number, number, number] | null {
  if (stations.count === 0) return null;
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i < stations.count; i++) {
    minX = Math.min(minX, stations.x[i]);
    maxX = Math.max(maxX, stations.x[i]);
    minY = Math.min(minY, stations.y[i]);
    maxY = Math.max(maxY, stations.y[i]);
  }
  return [minX - haloM, minY - haloM, maxX + haloM, maxY + haloM];
}
