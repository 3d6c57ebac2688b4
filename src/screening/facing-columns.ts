// The columns of the transect solve: what it reads of the stations and facings, what it shares
// between facings, and the typed arrays of its results, indexed by facing.
import type { FacingTable, StationTable, ZoneIndex } from '../geometry/index.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import type { ScreenSettings } from '../shared/settings.js';
import { newColumn } from '../shared/columns.js';

export interface FacingResults {
  /**
   * Each side's reason after the solve: the geometry stage's reason (facings.reason, never
   * written here), or outside-aquifer where a paired transect leaves the zones.
   */
  reason: Uint8Array;
  /** 0 = solved (SOLVE_OK); otherwise a solver status; 255 = not paired (see the facing's reason). */
  status: Uint8Array;
  flags: Uint8Array;
  ownStageM: Float64Array;
  partnerStageM: Float64Array;
  baseM: Float64Array;
  /** Seepage from the station's own line into this side's strip (m^2/d). */
  ownSeepageM2PerDay: Float64Array;
  /** Seepage from the partner line at the transect's far end (m^2/d), for the mass balance. */
  partnerSeepageM2PerDay: Float64Array;
  /** Recharge over the whole transect, sum of N l (m^2/d). */
  rechargeM2PerDay: Float64Array;
  peakWaterTableM: Float64Array;
  /** Distance of the peak from the station's own line (m). */
  peakOffsetM: Float64Array;
  minDepthM: Float64Array;
  /** Length of the transect where the water table is shallower than the waterlogging depth (m). */
  shallowM: Float64Array;
  dupuitRatio: Float64Array;
  /** Length of the transect outside every zone that was joined to a neighbour zone (m). */
  uncoveredM: Float64Array;
}

export const NOT_PAIRED = 255;

/**
 * The result columns a run keeps once its strips and lines are summed: what the report's map and
 * cross-sections, the wells and the lining planner read. The rest (seepage, recharge, peak offset,
 * shallow length, Dupuit ratio, bridged length) are read only by the transects layer, and a run
 * that does not write it lets them go (at a million stations, 110 MB).
 */
export type KeptResults = Pick<FacingResults, 'reason' | 'status' | 'flags' | 'ownStageM' | 'partnerStageM' | 'baseM' | 'peakWaterTableM' | 'minDepthM'>;

export function keptResults(results: KeptResults): KeptResults {
  const { reason, status, flags, ownStageM, partnerStageM, baseM, peakWaterTableM, minDepthM } = results;
  return { reason, status, flags, ownStageM, partnerStageM, baseM, peakWaterTableM, minDepthM };
}

/** The station columns the solve reads; a chunk's slices in a worker, the whole table in process. */
export type StationInputs = Pick<StationTable, 'x' | 'y' | 'line' | 'chainageM'>;
/** The facing columns the solve reads. */
export type FacingInputs = Pick<FacingTable, 'reason' | 'endX' | 'endY' | 'partner' | 'partnerChainageM' | 'transectLengthM'>;

/** What every facing's solve shares: the lines' stages and beds, the zones and their index, the settings. */
export interface SolveContext {
  lines: LineRecord[];
  lineLengthsM: Float64Array;
  zones: ZoneRecord[];
  zoneIndex: ZoneIndex;
  settings: ScreenSettings;
}

/**
 * Results for `reason.length` facings, every one unsolved, reasons copied from the geometry
 * stage's. Unfilled (zeros, no pass over the columns) for a caller that will overwrite every
 * facing, as the worker threads' chunks do. With `shared`, the columns live in SharedArrayBuffers
 * that worker threads write their chunks into.
 */
export function emptyResults(reason: Uint8Array, filled = true, shared = false): FacingResults {
  const n = reason.length;
  const float = () => newColumn(Float64Array, n, shared);
  const byte = () => newColumn(Uint8Array, n, shared);
  const results: FacingResults = {
    reason: byte(),
    status: byte(),
    flags: byte(),
    ownStageM: float(),
    partnerStageM: float(),
    baseM: float(),
    ownSeepageM2PerDay: float(),
    partnerSeepageM2PerDay: float(),
    rechargeM2PerDay: float(),
    peakWaterTableM: float(),
    peakOffsetM: float(),
    minDepthM: float(),
    shallowM: float(),
    dupuitRatio: float(),
    uncoveredM: float(),
  };
  if (filled) resetResults(results, reason);
  else results.reason.set(reason);
  return results;
}

/** Sets every facing of `results` unsolved, reasons copied from the geometry stage's: what a solve starts from. */
export function resetResults(results: FacingResults, reason: Uint8Array): void {
  results.reason.set(reason);
  results.status.fill(NOT_PAIRED);
  results.flags.fill(0);
  for (const column of [results.ownStageM, results.partnerStageM, results.baseM, results.ownSeepageM2PerDay, results.partnerSeepageM2PerDay, results.rechargeM2PerDay, results.peakWaterTableM, results.peakOffsetM, results.minDepthM, results.shallowM, results.dupuitRatio]) column.fill(NaN);
  results.uncoveredM.fill(0);
}

/** The results of facings start .. start + count - 1, as views: what is written there is written in `results`. */
export function resultsRange(results: FacingResults, start: number, count: number): FacingResults {
  return Object.fromEntries(Object.entries(results).map(([key, column]) => [key, (column as Float64Array).subarray(start, start + count)])) as unknown as FacingResults;
}
