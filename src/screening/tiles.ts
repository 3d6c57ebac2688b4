// A district screened as N tiles by N processes (an array job on a batch engine), then gathered.
// Each tile places every station of the district (cheap, and the same in every process), keeps
// those in its band (geometry/tiles.ts), and casts and solves their transects against the lines
// within a halo of maxGapM around them, with the whole district's smoothing window: each of its
// transects is cast and solved exactly as in a single run. Gathering puts the tiles' columns back
// in station order and runs the rest of the screening (strips, ranking, district solve, outputs)
// as one run does, so the gathered outputs are those of a single run, byte for byte.
import { smoothingHalfWindowM } from '../geometry/transects.js';
import { checkTile, stationBox, stationSubset, stationsOfTile, tileBands, type TileOfSplit } from '../geometry/tiles.js';
import type { FacingTable, StationTable } from '../geometry/index.js';
import type { ScreenSettings } from '../shared/settings.js';
import { UsageError } from '../shared/errors.js';
import { SOLVE_OK } from '../hydraulics/transect-solver.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import type { FacingResults } from './facing-columns.js';
import type { GroundPass } from './ground.js';
import { districtInputs, groundOf, prepareDistrict, solveStations, type ProgressListener, type ScreenExtras, type SolvedStations } from './screen.js';
import { districtTilePiece, type DistrictTilePiece } from './district-tiles.js';

export type { TileOfSplit };

/** What one tile solved: its stations (by index into the whole district's) and their two sides each. */
export interface TilePart {
  tile: TileOfSplit;
  /** Stations in the whole district, and the band cuts every tile drew: all tiles must agree. */
  districtStations: number;
  /** Indices of the tile's stations in the whole district's table, ascending. */
  stations: Uint32Array;
  /** Columns of the tile's transect sides: side k of station j of the tile is row 2 j + k. */
  facings: FacingTable;
  results: FacingResults;
  groundPass: GroundPass | null;
  /** The tile's share of the district solve (its band of the grid, solved over a margin); null with stripsOnly. */
  district: DistrictTilePiece | null;
}

/** Transect sides of a tile whose strip solution holds. */
export function tileSolvedSides(part: Pick<TilePart, 'results'>): number {
  let solved = 0;
  for (let i = 0; i < part.results.status.length; i++) if (part.results.status[i] === SOLVE_OK) solved++;
  return solved;
}

/** The halo around a tile's stations (m): every transect they cast, maxGapM long, lies inside it. */
export function tileHaloM(settings: Pick<ScreenSettings, 'maxGapM'>): number {
  return settings.maxGapM * 1.001 + 1;
}

/** Casts and solves the transects of one tile's stations. Pure, as screenDistrict is. */
export function screenTile(
  lines: LineRecord[],
  zones: ZoneRecord[],
  settings: ScreenSettings,
  tile: TileOfSplit,
  onProgress: ProgressListener = () => {},
  extras: Pick<ScreenExtras, 'dem' | 'coarseCheck'> = {},
): TilePart {
  checkTile(tile);
  const prepared = prepareDistrict(lines, zones, settings, onProgress);
  const whole = prepared.stations;
  const indices = stationsOfTile(whole, tileBands(whole, tile.count), tile);
  const stations = stationSubset(whole, indices);
  // the whole district's window, as castTransects takes it from a whole table
  const halfWindowM = smoothingHalfWindowM(whole);
  const ground = groundOf(prepared.crs, extras.dem);
  const solved = solveStations(lines, zones, prepared, stations, settings, ground, { halfWindowM, segmentBox: stationBox(stations, tileHaloM(settings)) }, onProgress);
  let district: DistrictTilePiece | null = null;
  if (!settings.stripsOnly) {
    onProgress('district solve', 0, 1);
    // the heads need no strips: the strips' district figures are taken when gathering, from the stitched heads
    const inputs = districtInputs(lines, zones, prepared, [], ground);
    try {
      district = districtTilePiece(inputs, settings, tile, { coarseCheck: extras.coarseCheck });
    } catch (error) {
      // more tiles than the district grid has columns (or rows): say so as the user's choice to change
      if (/^Unexpected tile count/.test((error as Error).message)) throw new UsageError(`--tile: ${(error as Error).message.replace(/^Unexpected tile count: /, 'the district solve cannot be split into ')}; use fewer tiles or --strips-only`, 'tile');
      throw error;
    }
    onProgress('district solve', 1, 1);
  }
  return { tile, districtStations: whole.count, stations: indices, ...solved, district };
}

const FACING_COLUMNS = ['partner', 'reason', 'transectLengthM', 'endX', 'endY', 'partnerChainageM', 'angleDeg', 'hitLine', 'partnerSide'] as const;
const RESULT_COLUMNS = [
  'reason', 'status', 'flags', 'ownStageM', 'partnerStageM', 'baseM', 'ownSeepageM2PerDay', 'partnerSeepageM2PerDay', 'rechargeM2PerDay',
  'peakWaterTableM', 'peakOffsetM', 'minDepthM', 'shallowM', 'dupuitRatio', 'uncoveredM',
] as const;

export const TILE_FACING_COLUMNS: readonly string[] = FACING_COLUMNS;
export const TILE_RESULT_COLUMNS: readonly string[] = RESULT_COLUMNS;

type Column = Float64Array | Int32Array | Uint8Array;

function emptyLike<T extends Column>(column: T, n: number): T {
  return new (column.constructor as { new (n: number): T })(n);
}

/**
 * Puts the tiles' columns back in station order for the whole district. Throws (naming the tile)
 * when they are not the N tiles of one split of these stations: a count, a station claimed twice
 * or by none.
 */
export function assembleTiles(stations: StationTable, parts: readonly TilePart[]): SolvedStations & { districtPieces: DistrictTilePiece[] | null } {
  if (parts.length === 0) throw new Error('Unexpected: no tiles to gather.');
  const count = parts[0].tile.count;
  if (parts.length !== count) throw new Error(`Unexpected: ${parts.length} tiles for a split into ${count}.`);
  const owner = new Int32Array(stations.count).fill(-1);
  const seen = new Set<number>();
  for (const part of parts) {
    const name = `tile ${part.tile.index} of ${part.tile.count}`;
    if (part.tile.count !== count) throw new Error(`${name} belongs to a split into ${part.tile.count}, the others to ${count}.`);
    if (seen.has(part.tile.index)) throw new Error(`${name} is given twice.`);
    seen.add(part.tile.index);
    if (part.districtStations !== stations.count) throw new Error(`${name} placed ${part.districtStations} stations, this run ${stations.count}: the inputs or settings differ.`);
    if (part.facings.count !== 2 * part.stations.length) throw new Error(`${name} has ${part.facings.count} transect sides for ${part.stations.length} stations.`);
    for (const s of part.stations) {
      if (s >= stations.count) throw new Error(`${name} holds station ${s}, past the district's ${stations.count}.`);
      if (owner[s] !== -1) throw new Error(`${name} holds station ${s}, which tile ${parts[owner[s]].tile.index} holds too.`);
      owner[s] = parts.indexOf(part);
    }
  }
  for (let s = 0; s < stations.count; s++) if (owner[s] === -1) throw new Error(`Station ${s} is in no tile: the tiles do not cover the district.`);
  const n = 2 * stations.count;
  const first = parts[0];
  const facings = { count: n } as FacingTable;
  const results = {} as FacingResults;
  for (const name of FACING_COLUMNS) (facings as unknown as Record<string, Column>)[name] = emptyLike(first.facings[name], n);
  for (const name of RESULT_COLUMNS) (results as unknown as Record<string, Column>)[name] = emptyLike(first.results[name], n);
  let groundPass: GroundPass | null = null;
  for (const part of parts) {
    for (const name of FACING_COLUMNS) scatter(facings[name], part.facings[name], part.stations);
    for (const name of RESULT_COLUMNS) scatter(results[name], part.results[name], part.stations);
    if (part.groundPass) {
      groundPass ??= { samples: 0, gapSamples: 0, gapFacings: 0, noGroundFacings: 0 };
      groundPass.samples += part.groundPass.samples;
      groundPass.gapSamples += part.groundPass.gapSamples;
      groundPass.gapFacings += part.groundPass.gapFacings;
      groundPass.noGroundFacings += part.groundPass.noGroundFacings;
    }
  }
  const withDistrict = parts.filter((part) => part.district !== null).length;
  if (withDistrict !== 0 && withDistrict !== parts.length) throw new Error('some tiles hold their share of the district solve and some do not: the settings differ');
  const districtPieces = withDistrict === 0 ? null : parts.map((part) => part.district as DistrictTilePiece);
  return { facings, results, groundPass, districtPieces };
}

/** Rows 2 j and 2 j + 1 of `from` go to rows 2 s and 2 s + 1 of `into`, s = stations[j]. */
function scatter(into: Column, from: Column, stations: Uint32Array): void {
  for (let j = 0; j < stations.length; j++) {
    const s = stations[j];
    into[2 * s] = from[2 * j];
    into[2 * s + 1] = from[2 * j + 1];
  }
}

/** What a tile file's header says of the tile itself (the run's options and inputs go beside it). */
export interface TilePartMeta {
  tile: TileOfSplit;
  districtStations: number;
  groundPass: GroundPass | null;
  /** The header of the tile's share of the district solve; null with stripsOnly. */
  district?: DistrictTilePiece['header'] | null;
}

/** A tile's columns under their names (facing.*, result.*), and what goes with them. */
export function tilePartColumns(part: TilePart): { meta: TilePartMeta; columns: Record<string, Column | Uint32Array> } {
  const columns: Record<string, Column | Uint32Array> = { stations: part.stations };
  for (const name of FACING_COLUMNS) columns[`facing.${name}`] = part.facings[name];
  for (const name of RESULT_COLUMNS) columns[`result.${name}`] = part.results[name];
  if (part.district) for (const [name, column] of Object.entries(part.district.arrays)) columns[`district.${name}`] = column as Column;
  return { meta: { tile: part.tile, districtStations: part.districtStations, groundPass: part.groundPass, district: part.district ? part.district.header : null }, columns };
}

/** The tile back from its columns; throws, saying what is missing or the wrong size. */
export function tilePartFromColumns(meta: TilePartMeta, columns: Record<string, ArrayBufferView>): TilePart {
  const stations = columns.stations;
  if (!(stations instanceof Uint32Array)) throw new Error('it has no stations column');
  const n = 2 * stations.length;
  const take = (name: string, like: Column): Column => {
    const column = columns[name];
    if (!column || column.constructor !== like.constructor || (column as Column).length !== n) throw new Error(`its column ${name} is missing, or not ${n} ${like.constructor.name} values`);
    return column as Column;
  };
  // the shapes the columns must have, from an empty table of the same kinds
  const facings = { count: n } as FacingTable;
  const results = {} as FacingResults;
  const likeFacing: Record<string, Column> = { partner: new Int32Array(0), reason: new Uint8Array(0), transectLengthM: new Float64Array(0), endX: new Float64Array(0), endY: new Float64Array(0), partnerChainageM: new Float64Array(0), angleDeg: new Float64Array(0), hitLine: new Int32Array(0), partnerSide: new Uint8Array(0) };
  for (const name of FACING_COLUMNS) (facings as unknown as Record<string, Column>)[name] = take(`facing.${name}`, likeFacing[name]);
  for (const name of RESULT_COLUMNS) {
    const like = name === 'reason' || name === 'status' || name === 'flags' ? new Uint8Array(0) : new Float64Array(0);
    (results as unknown as Record<string, Column>)[name] = take(`result.${name}`, like);
  }
  const tile = meta?.tile;
  if (!tile || !Number.isInteger(tile.index) || !Number.isInteger(tile.count)) throw new Error('its header names no tile');
  if (!Number.isSafeInteger(meta.districtStations)) throw new Error('its header gives no station count');
  let district: DistrictTilePiece | null = null;
  if (meta.district) {
    if (typeof meta.district !== 'object') throw new Error('its header\'s district part is not an object');
    const arrays: DistrictTilePiece['arrays'] = {};
    for (const [name, column] of Object.entries(columns)) if (name.startsWith('district.')) arrays[name.slice(9)] = column as DistrictTilePiece['arrays'][string];
    district = { header: meta.district, arrays };
  }
  return { tile: { index: tile.index, count: tile.count }, districtStations: meta.districtStations, stations, facings, results, groundPass: meta.groundPass ?? null, district };
}

/** What every tile of a run records of the run, beside its own columns. */
export interface TileRunMeta {
  tool: 'doab';
  version: string;
  /** The screen command's options as given (paths as typed), less --out and --tile. */
  options: Record<string, unknown>;
  /** The folder the tile ran in: relative input paths are read from there. */
  cwd: string;
  /** SHA-256 of each input file the run reads, by option name. */
  inputs: Record<string, string>;
  /** One hash of the options and inputs: tiles of one run share it. */
  runKey: string;
}

export type TileFileMeta = TileRunMeta & TilePartMeta;

/** tile-0003-of-0007.doabtile: the name sorts with the index. */
export function tileFileName(tile: TileOfSplit): string {
  const width = Math.max(4, String(tile.count).length);
  return `tile-${String(tile.index).padStart(width, '0')}-of-${String(tile.count).padStart(width, '0')}.doabtile`;
}

export const TILE_FILE_PATTERN = /^tile-(\d+)-of-(\d+)\.doabtile$/;

