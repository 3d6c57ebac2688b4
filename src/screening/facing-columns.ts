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

/** Results for `reason.length` facings, every one unsolved, reasons copied from the geometry stage's. */
export function emptyResults(reason: Uint8Array): FacingResults {
  const n = reason.length;
  return {
    reason: reason.slice(),
    status: new Uint8Array(n).fill(NOT_PAIRED),
    flags: new Uint8Array(n),
    ownStageM: new Float64Array(n).fill(NaN),
    partnerStageM: new Float64Array(n).fill(NaN),
    baseM: new Float64Array(n).fill(NaN),
    ownSeepageM2PerDay: new Float64Array(n).fill(NaN),
    partnerSeepageM2PerDay: new Float64Array(n).fill(NaN),
    rechargeM2PerDay: new Float64Array(n).fill(NaN),
    peakWaterTableM: new Float64Array(n).fill(NaN),
    peakOffsetM: new Float64Array(n).fill(NaN),
    minDepthM: new Float64Array(n).fill(NaN),
    shallowM: new Float64Array(n).fill(NaN),
    dupuitRatio: new Float64Array(n).fill(NaN),
    uncoveredM: new Float64Array(n),
  };
}

