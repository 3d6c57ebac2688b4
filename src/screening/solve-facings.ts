// Solve stage: for every paired facing (a station and the partner its transect meets), cut the
// transect through the aquifer zones, take both lines' stages, and solve the strip across it.
// Results live in typed arrays indexed like the facings, so a district of a million stations
// needs no object per transect.
import {
  FACING_OUTSIDE_AQUIFER,
  FACING_PAIRED,
  castTransects,
  cutTransect,
  type CastOptions,
  type LineTable,
  type FacingTable,
  type StationTable,
  type TransectCut,
  type ZoneIndex,
} from '../geometry/index.js';
import { SOLVE_OK, TransectSolver } from '../hydraulics/transect-solver.js';
import { bedAt, stageAtChainage, type LineRecord, type ZoneRecord } from './district-inputs.js';
import type { ScreenSettings } from '../shared/settings.js';
import { emptyResults, NOT_PAIRED, type FacingInputs, type FacingResults, type SolveContext, type StationInputs } from './facing-columns.js';
import { solveInWorkers, workerCount } from './facing-workers.js';

export { emptyResults, NOT_PAIRED, type FacingInputs, type FacingResults, type SolveContext, type StationInputs };

export const FLAG_NARROW = 1;
export const FLAG_UNEVEN_BASE = 2;
export const FLAG_ZONE_OVERLAP = 4;

/**
 * A transect may cross this much land outside every zone (m; the larger of the two) and still be
 * solved, the gap joining its neighbour zone: digitising gaps and slivers between zones that
 * share an edge, which no user means as a hole in the aquifer.
 */
const UNCOVERED_TOLERANCE_M = 2;
const UNCOVERED_TOLERANCE_FRACTION = 0.01;


/**
 * Solves every paired facing. With `settings.workers` above 1 and enough facings, contiguous
 * chunks go to worker threads (facing-workers.ts); each facing is solved by the same code either
 * way, so the results are the same to the last bit for any number of workers.
 */
export function solveFacings(
  lines: LineRecord[],
  lineLengthsM: Float64Array,
  zones: ZoneRecord[],
  zoneIndex: ZoneIndex,
  stations: StationTable,
  facings: FacingTable,
  settings: ScreenSettings,
  onProgress: (done: number) => void = () => {},
): FacingResults {
  const context: SolveContext = { lines, lineLengthsM, zones, zoneIndex, settings };
  const workers = workerCount(settings.workers ?? null, facings.count);
  if (workers > 1) return solveInWorkers(context, stations, facings, workers, onProgress, solveFacingRange).results;
  const results = emptyResults(facings.reason);
  onProgress(0);
  solveFacingRange(context, stations, facings, results, onProgress);
  onProgress(facings.count);
  return results;
}

/**
 * Solves facings 0 .. reason.length - 1 of the given columns into `results` (made by
 * emptyResults). Facing i belongs to station i >> 1 of `stations`, so a chunk that starts at an
 * even facing is solved from its slices exactly as from the whole table.
 */
/**
 * Casts and solves the transects of every station. With `settings.workers` above 1 and enough
 * stations, the worker threads cast their chunks of stations too (against the lines in shared
 * memory); each transect is cast and solved by the same code either way, with the same smoothing
 * window, so the columns are the same to the last bit for any number of workers.
 */
export function castAndSolveFacings(
  lines: LineRecord[],
  lineLengthsM: Float64Array,
  zones: ZoneRecord[],
  zoneIndex: ZoneIndex,
  lineTable: LineTable,
  stations: StationTable,
  cast: CastOptions & { halfWindowM: number },
  settings: ScreenSettings,
  onProgress: (stage: 'transects' | 'solve', done: number, total: number) => void = () => {},
): { facings: FacingTable; results: FacingResults } {
  const n = 2 * stations.count;
  const workers = workerCount(settings.workers ?? null, n);
  if (workers > 1) {
    const context: SolveContext = { lines, lineLengthsM, zones, zoneIndex, settings };
    const options = { maxGapM: cast.maxGapM, maxAngleDeg: cast.maxAngleDeg, halfWindowM: cast.halfWindowM };
    return solveInWorkers(context, stations, { lineTable, options }, workers, (done) => onProgress('solve', done, n), solveFacingRange);
  }
  onProgress('transects', 0, stations.count);
  const facings = castTransects(lineTable, stations, cast);
  onProgress('transects', stations.count, stations.count);
  const results = solveFacings(lines, lineLengthsM, zones, zoneIndex, stations, facings, settings, (done) => onProgress('solve', done, n));
  return { facings, results };
}

export function solveFacingRange(
  context: SolveContext,
  stations: StationInputs,
  facings: FacingInputs,
  results: FacingResults,
  onProgress: (done: number) => void = () => {},
): void {
  const { lines, lineLengthsM, zones, zoneIndex, settings } = context;
  const n = facings.reason.length;
  const solver = new TransectSolver(64);
  const loaded = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    // a report every 2^16 facings keeps a progress bar moving at no measurable cost
    if ((i & 0xffff) === 0xffff) onProgress(i + 1);
    if (facings.reason[i] !== FACING_PAIRED) continue;
    const station = i >> 1;
    const cut = cutTransect(zoneIndex, stations.x[station], stations.y[station], facings.endX[i], facings.endY[i]);
    if (cut.count === 0 || cut.uncoveredM > Math.max(UNCOVERED_TOLERANCE_M, UNCOVERED_TOLERANCE_FRACTION * facings.transectLengthM[i])) {
      results.reason[i] = FACING_OUTSIDE_AQUIFER;
      continue;
    }
    const pieces = loadCut(solver, cut, zones, loaded);
    if (pieces === 0) {
      results.reason[i] = FACING_OUTSIDE_AQUIFER;
      continue;
    }
    const baseM = loaded[LOADED_BASE];
    const ownLine = stations.line[station];
    const partner = facings.partner[i];
    const ownStageM = stageAtChainage(lines[ownLine], stations.chainageM[station], lineLengthsM[ownLine]);
    const partnerStageM = stageAtChainage(lines[partner], facings.partnerChainageM[i], lineLengthsM[partner]);
    results.ownStageM[i] = ownStageM;
    results.partnerStageM[i] = partnerStageM;
    results.baseM[i] = baseM;
    if (cut.overlapM > UNCOVERED_TOLERANCE_M) results.flags[i] |= FLAG_ZONE_OVERLAP;
    if (cut.uncoveredM > 0) results.uncoveredM[i] = cut.uncoveredM;
    setBeds(solver, lines[ownLine], stations.chainageM[station], ownStageM, lines[partner], facings.partnerChainageM[i], partnerStageM);
    const status = solver.solve(ownStageM, partnerStageM, baseM, pieces);
    results.status[i] = status;
    if (status !== SOLVE_OK) continue;
    results.ownSeepageM2PerDay[i] = solver.ownSeepageM2PerDay;
    results.partnerSeepageM2PerDay[i] = solver.partnerSeepageM2PerDay;
    let recharge = 0;
    for (let p = 0; p < pieces; p++) recharge += solver.rechargeMPerDay[p] * solver.lengthM[p];
    results.rechargeM2PerDay[i] = recharge;
    results.peakWaterTableM[i] = solver.peakWaterTableM;
    results.peakOffsetM[i] = solver.peakOffsetM;
    solver.scanDepth(settings.bankWidthM);
    results.minDepthM[i] = solver.minDepthM;
    results.shallowM[i] = solver.shallowLengthM(settings.risk.waterloggedDepthM, settings.bankWidthM);
    results.dupuitRatio[i] = solver.dupuitRatio;
    if (solver.dupuitRatio < settings.dupuitRatioMin) results.flags[i] |= FLAG_NARROW;
    if (loaded[LOADED_BASE_HIGH] - loaded[LOADED_BASE_LOW] > settings.baseSpreadFraction * solver.meanThicknessM) results.flags[i] |= FLAG_UNEVEN_BASE;
  }
}

export const LOADED_BASE = 0;
export const LOADED_BASE_LOW = 1;
export const LOADED_BASE_HIGH = 2;

/**
 * Fills the solver's zones from a transect's cut, in order from its start, and returns how many
 * it filled (0 when the cut crosses no zone). A sliver outside every zone (rounding or a small
 * gap at shared edges) joins its neighbour. Writes into `loaded` the base the strip solution stands
 * on, the length-weighted mean of the zones crossed, and the lowest and highest base; `zoneOfPiece`,
 * when given, gets each filled piece's zone index. Allocates nothing.
 */
/**
 * The beds of a transect's two lines: each side passes its half of the wetted perimeter over the
 * bed resistance (m/d per metre of line), a clean bed none (Infinity); the bed's underside lies the
 * water depth below the stage where the depth is known.
 */
export function setBeds(
  solver: TransectSolver,
  own: LineRecord,
  ownChainageM: number,
  ownStageM: number,
  partner: LineRecord,
  partnerChainageM: number,
  partnerStageM: number,
): void {
  solver.ownBedConductanceMPerDay = sideConductance(own, ownChainageM);
  solver.ownBedFloorM = Number.isNaN(own.waterDepthM) ? -Infinity : ownStageM - own.waterDepthM;
  solver.partnerBedConductanceMPerDay = sideConductance(partner, partnerChainageM);
  solver.partnerBedFloorM = Number.isNaN(partner.waterDepthM) ? -Infinity : partnerStageM - partner.waterDepthM;
}

/** A side's bed conductance per metre of line at a chainage (m/d): half the wetted perimeter over the resistance; Infinity for a clean bed. */
export function sideConductance(line: LineRecord, chainageM: number): number {
  const bed = bedAt(line, chainageM);
  return bed.resistanceD > 0 ? bed.perimeterM / 2 / bed.resistanceD : Infinity;
}

export function loadCut(solver: TransectSolver, cut: TransectCut, zones: ZoneRecord[], loaded: Float64Array, zoneOfPiece?: Int32Array): number {
  let pieces = 0, carryM = 0, baseSum = 0, lengthSum = 0, baseLow = Infinity, baseHigh = -Infinity;
  for (let p = 0; p < cut.count; p++) {
    const zoneNumber = cut.zone[p];
    if (zoneNumber < 0) {
      if (pieces > 0) solver.lengthM[pieces - 1] += cut.lengthM[p];
      else carryM += cut.lengthM[p];
      continue;
    }
    const zone = zones[zoneNumber];
    const length = cut.lengthM[p] + carryM;
    carryM = 0;
    if (pieces === solver.maxZones) {
      // more zones than the solver holds is absurd for one transect: lump the tail, do not fail
      solver.lengthM[pieces - 1] += length;
    } else {
      solver.lengthM[pieces] = length;
      solver.kMPerDay[pieces] = zone.kMPerDay;
      solver.rechargeMPerDay[pieces] = zone.rechargeMPerDay;
      solver.groundM[pieces] = zone.groundM;
      if (zoneOfPiece) zoneOfPiece[pieces] = zoneNumber;
      pieces++;
    }
    baseSum += zone.baseM * length;
    lengthSum += length;
    if (zone.baseM < baseLow) baseLow = zone.baseM;
    if (zone.baseM > baseHigh) baseHigh = zone.baseM;
  }
  loaded[LOADED_BASE] = baseSum / lengthSum;
  loaded[LOADED_BASE_LOW] = baseLow;
  loaded[LOADED_BASE_HIGH] = baseHigh;
  return pieces;
}
