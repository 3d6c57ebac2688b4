// The columns of the transect solve: what it reads of the stations and facings, what it shares
// between facings, and the typed arrays of its results, indexed by facing.
import type { FacingTable, StationTable, ZoneIndex } from '../geometry/index.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import type { ScreenSettings } from '../shared/settings.js';

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
 * facing, as the worker threads' chunks do.
 */
export function emptyResults(reason: Uint8Array, filled = true): FacingResults {
  const n = reason.length;
  const column = (value: number) => (filled && value !== 0 ? new Float64Array(n).fill(value) : new Float64Array(n));
  return {
    reason: reason.slice(),
    status: filled ? new Uint8Array(n).fill(NOT_PAIRED) : new Uint8Array(n),
    flags: new Uint8Array(n),
    ownStageM: column(NaN),
    partnerStageM: column(NaN),
    baseM: column(NaN),
    ownSeepageM2PerDay: column(NaN),
    partnerSeepageM2PerDay: column(NaN),
    rechargeM2PerDay: column(NaN),
    peakWaterTableM: column(NaN),
    peakOffsetM: column(NaN),
    minDepthM: column(NaN),
    shallowM: column(NaN),
    dupuitRatio: column(NaN),
    uncoveredM: column(0),
  };
}
