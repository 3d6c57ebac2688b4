// The screening pipeline: validated inputs -> work CRS -> stations -> transects -> zones on each
// transect -> solve -> strips and line totals -> ranking. Pure: it reads no file and writes none.
import { groundSampler, type DemGrid, type GroundSampler, type ToDem } from '../geometry/dem.js';
import { groundFromDem, sampleSpacingM, type GroundPass } from './ground.js';
import {
  FACING_OUTSIDE_AQUIFER,
  FACING_REASON_NAMES,
  buildLineTable,
  buildStrips,
  buildZoneIndex,
  lineLengthM,
  placeStations,
  zonePolygons,
  type CastOptions,
  type FacingTable,
  type LineGeometry,
  type LineTable,
  type StationTable,
  type ZoneIndex,
} from '../geometry/index.js';
import { boundsOfParts, chooseWorkCrs, projectPositions, type WorkCrs } from '../geometry/work-crs.js';
import { m3PerDayToM3PerYear } from '../shared/units.js';
import { lossPerKm, summariseLines, summariseStrip, type LineSummary, type StripSummary } from './aggregate.js';
import { districtSolve, type DistrictInputs, type DistrictResult, type DistrictTilePiece } from './district.js';
import { smoothingHalfWindowM } from '../geometry/transects.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import { castAndSolveFacings, NOT_PAIRED, type FacingResults } from './solve-facings.js';
import { keptResults, type KeptResults } from './facing-columns.js';
import { SOLVE_OK } from '../hydraulics/transect-solver.js';
import { RISK_CLASSES, type RiskClass, type ScreenSettings } from '../shared/settings.js';

/** Where the figures a planner reads came from: the 2D district solve, or the strips alone. */
export type FigureMethod = 'district' | 'strips';

/** The figures of one line that a planner reads, and the strip figures beside them. */
export interface LineFigure {
  /** Net loss (m^3/d): the district solve's when it ran and the line holds cells of its grid, else the strips'. */
  netLossM3PerDay: number;
  /** Per km: of the whole line for the district solve, of paired length for the strips (m^3/d/km). */
  netLossM3PerDayKm: number;
  method: FigureMethod;
  /** The strips' figure (over paired, solved sides only). */
  stripNetLossM3PerDay: number;
  stripNetLossM3PerDayKm: number;
  /** The district solve at twice the cell less the figure (m^3/d): its numerical uncertainty; NaN from strips. */
  coarseDiffM3PerDay: number;
  /**
   * Share of the line's sides (both sides, whole length) that the figure covers, 0 to 1: 1 for the
   * district solve; for the strips, the solved sides only, so two lines' strip figures compare only
   * as far as their shares do.
   */
  coversShare: number;
}

export interface DistrictTotals {
  /** Where loss, gain, net and risk area come from. */
  method: FigureMethod;
  /** What the lines that lose water lose to the ground, summed over those lines (m^3/d). */
  lossM3PerDay: number;
  lossM3PerYear: number;
  /** What the lines that gain water (drains, mostly) take in from the ground (m^3/d). */
  gainM3PerDay: number;
  /** Net seepage of all lines, loss less gain (m^3/d). */
  netM3PerDay: number;
  pairedM: number;
  unpairedM: number;
  /** Length of line sides solved, and of all line sides (twice the line length), m. */
  solvedSidesM: number;
  sidesM: number;
  /** Sum over strips of the positive losses of both lines (ranking.csv's loss_m3_d), m^3/d. */
  stripLossM3PerDay: number;
  /** Loss, gain and net of the lines by the strips alone (m^3/d), beside the district's. */
  stripLinesLossM3PerDay: number;
  stripLinesGainM3PerDay: number;
  /** Area with the water table less than the waterlogging depth below ground (ha): the district raster's when it ran. */
  riskAreaHa: number;
  /** The same summed over strips. */
  stripRiskAreaHa: number;
  stripsByRisk: Record<RiskClass | 'unsolved', number>;
}

export interface ScreenCounts {
  lines: number;
  zones: number;
  stations: number;
  facingsByReason: Record<string, number>;
  /** Paired transect sides whose strip solution holds. */
  solvedFacings: number;
  strips: number;
}

export interface ScreenResult {
  settings: ScreenSettings;
  crs: WorkCrs;
  warnings: string[];
  lines: LineRecord[];
  zones: ZoneRecord[];
  /** The lines in the work CRS (metres), in the order of `lines`. */
  geometries: LineGeometry[];
  lineLengthsM: Float64Array;
  zoneIndex: ZoneIndex;
  stations: StationTable;
  facings: FacingTable;
  /** The result columns kept after the strips and lines are summed (see KeptResults). */
  results: KeptResults;
  /** Every result column, for the transects layer: kept only when it is written (settings.writeTransects); null otherwise. */
  transects: FacingResults | null;
  /** Strips in ranked order. */
  strips: StripSummary[];
  lineSummaries: LineSummary[];
  /** Per line, the figures a planner reads (district solve when it ran) with the strips' beside them. */
  lineFigures: LineFigure[];
  /** The district solve; null when skipped (stripsOnly). */
  district: DistrictResult | null;
  /** Ground from a DEM, when one was given (the cross-sections draw it); null otherwise. */
  ground: GroundSampler | null;
  totals: DistrictTotals;
  counts: ScreenCounts;
}

/** Inputs beyond lines, zones and settings. */
export interface ScreenExtras {
  /** A DEM for the ground: its grid, lon/lat into its CRS (null: it is in lon/lat), pixel size (m) and a label for messages. */
  dem?: { grid: DemGrid; fromLonLat: ((lon: number, lat: number) => [number, number]) | null; pixelM: number; label: string } | null;
  /** False to leave out the district solve at twice the cell (each line's uncertainty): scenario runs that compare one cell. */
  coarseCheck?: boolean;
  /** The transects solved by the tiles of an array job (screening/tiles.ts), in place of solving them here. */
  tiles?: { assemble: (stations: StationTable) => SolvedStations & { districtPieces?: DistrictTilePiece[] | null } } | null;
}

/** Work CRS into the DEM's: through lon/lat. */
function toDemFrom(crs: WorkCrs, dem: NonNullable<ScreenExtras['dem']>): ToDem {
  const fromLonLat = dem.fromLonLat;
  return (x, y) => {
    const [lon, lat] = crs.inverse([x, y]);
    return fromLonLat ? fromLonLat(lon, lat) : [lon, lat];
  };
}

/** Told when each named stage starts and ends: (stage, done, total) with done 0 or total. */
export type ProgressListener = (stage: string, done: number, total: number) => void;

/** The first stage, shared by a whole run and a tile: the work CRS, the lines and zones in it, the stations. */
export interface PreparedDistrict {
  crs: WorkCrs;
  warnings: string[];
  geometries: LineGeometry[];
  lineLengthsM: Float64Array;
  zoneIndex: ZoneIndex;
  lineTable: LineTable;
  stations: StationTable;
}

export function prepareDistrict(lines: LineRecord[], zones: ZoneRecord[], settings: ScreenSettings, onProgress: ProgressListener = () => {}): PreparedDistrict {
  const { crs, warnings } = chooseWorkCrs(boundsOfParts(lines.map((line) => line.partsLonLat)), settings.crs ?? undefined);
  const geometries: LineGeometry[] = lines.map((line) => ({
    id: line.id,
    parts: line.partsLonLat.map((part) => projectPositions(crs, part)),
  }));
  const lineLengthsM = Float64Array.from(geometries, (g) => lineLengthM(g));
  const zoneIndex = buildZoneIndex(
    zonePolygons(
      zones.flatMap((zone) =>
        zone.polygonsLonLat.map((polygon) => ({ zone: zone.index, rings: polygon.map((ring) => projectPositions(crs, ring)) })),
      ),
    ),
  );
  // one table of the lines, shared by stations, transects and strips
  // in shared memory: worker threads that cast read this copy
  const lineTable = buildLineTable(geometries, true);
  onProgress('stations', 0, lines.length);
  const stations = placeStations(lineTable, settings.stepM);
  onProgress('stations', lines.length, lines.length);
  return { crs, warnings, geometries, lineLengthsM, zoneIndex, lineTable, stations };
}

/** What the district solve reads: the lines and zones in the work CRS, and the strips (none in a tile: their figures are taken when gathering). */
export function districtInputs(
  lines: LineRecord[],
  zones: ZoneRecord[],
  prepared: Pick<PreparedDistrict, 'lineTable' | 'lineLengthsM' | 'zoneIndex'>,
  strips: readonly StripSummary[],
  ground: GroundSampler | null,
): DistrictInputs {
  return {
    lines,
    zones,
    lineTable: prepared.lineTable,
    lineLengthsM: prepared.lineLengthsM,
    zonePolygons: prepared.zoneIndex.polygons,
    stripRings: strips.map((s) => s.strip.ringM),
    stripLines: strips.map((s) => [s.strip.lineA, s.strip.lineB] as const),
    ground,
  };
}

/** The district solve's inputs from a finished screening (for a solve again, as benches and tests do). */
export function districtInputsOfResult(result: ScreenResult): DistrictInputs {
  return districtInputs(result.lines, result.zones, { lineTable: buildLineTable(result.geometries), lineLengthsM: result.lineLengthsM, zoneIndex: result.zoneIndex }, result.strips, result.ground);
}

/** Ground from the DEM, in the work CRS; null without a DEM. */
export function groundOf(crs: WorkCrs, dem: ScreenExtras['dem']): GroundSampler | null {
  return dem ? groundSampler(dem.grid, toDemFrom(crs, dem), dem.pixelM) : null;
}

/** The transects of some stations, solved, with ground from the DEM: all of a run, or a tile's. */
export interface SolvedStations {
  facings: FacingTable;
  results: FacingResults;
  /** The DEM pass's counts; null without a DEM. */
  groundPass: GroundPass | null;
}

/**
 * Casts and solves the transects of `stations` (the whole table, or a tile's rows with the whole
 * district's smoothing window and a halo box), then takes the ground from the DEM.
 */
export function solveStations(
  lines: LineRecord[],
  zones: ZoneRecord[],
  prepared: PreparedDistrict,
  stations: StationTable,
  settings: ScreenSettings,
  ground: GroundSampler | null,
  cast: Pick<CastOptions, 'halfWindowM' | 'segmentBox'> = {},
  onProgress: ProgressListener = () => {},
): SolvedStations {
  // the smoothing window of a partner's direction: the whole table's, unless a tile gives its district's
  const halfWindowM = cast.halfWindowM ?? smoothingHalfWindowM(stations);
  const { facings, results } = castAndSolveFacings(
    lines,
    prepared.lineLengthsM,
    zones,
    prepared.zoneIndex,
    prepared.lineTable,
    stations,
    { maxGapM: settings.maxGapM, maxAngleDeg: settings.maxAngleDeg, ...cast, halfWindowM },
    settings,
    (stage, done, total) => onProgress(stage, done, total),
  );
  // ground from a DEM: the depths follow the sampled ground instead of each zone's one level
  const groundPass = ground ? groundFromDem(ground, lines, zones, prepared.zoneIndex, stations, facings, results, settings) : null;
  return { facings, results, groundPass };
}

export function screenDistrict(
  lines: LineRecord[],
  zones: ZoneRecord[],
  settings: ScreenSettings,
  onProgress: ProgressListener = () => {},
  extras: ScreenExtras = {},
): ScreenResult {
  const prepared = prepareDistrict(lines, zones, settings, onProgress);
  const { crs, warnings, geometries, lineLengthsM, zoneIndex, lineTable, stations } = prepared;
  const ground = groundOf(crs, extras.dem);
  // the transects come solved from the tiles of an array job, or are solved here
  const { facings, results, groundPass, districtPieces } = extras.tiles
    ? extras.tiles.assemble(stations)
    : { ...solveStations(lines, zones, prepared, stations, settings, ground, {}, onProgress), districtPieces: null };
  if (ground && extras.dem && groundPass) {
    const pass = groundPass;
    warnings.push(
      `ground from the DEM ${extras.dem.label}: depths, risk classes and shallow areas follow it, sampled every ${sampleSpacingM(ground, 0).toFixed(0)} m or so along each transect` +
        (pass.gapSamples > 0 ? `; ${pass.gapSamples} of ${pass.samples} samples (on ${pass.gapFacings} transects) fell where the DEM has no data and took their zone's ground_m` : '') +
        (pass.noGroundFacings > 0 ? `; ${pass.noGroundFacings} transect sides have no ground at all (no DEM data, no ground_m) and are left unsolved (no-ground)` : ''),
    );
  }
  onProgress('strips', 0, 1);
  // strips join sides that are paired after the solve (a transect leaving the zones ends a strip)
  const strips = buildStrips(lineTable, stations, { ...facings, reason: results.reason }, { spacingJump: settings.spacingJump }).map((strip) =>
    summariseStrip(strip, lines, stations, facings, results, settings),
  );
  rankStrips(strips, settings.rankBy);
  warnings.push(...solveWarnings(facings, results));
  const lineSummaries = summariseLines(lines, lineLengthsM, stations, facings, results);
  onProgress('strips', 1, 1);

  let district: DistrictResult | null = null;
  if (settings.stripsOnly) {
    warnings.push(
      'district solve skipped (stripsOnly): every loss and depth comes from the strips alone, which miss junctions, line ends and unpaired sides',
    );
  } else {
    onProgress('district solve', 0, 1);
    district = districtSolve(
      districtInputs(lines, zones, prepared, strips, ground),
      settings,
      // from the tiles: their bands of the grid, stitched (the figures then say so, with their tolerance)
      { coarseCheck: extras.coarseCheck, pieces: districtPieces ?? undefined },
    );
    warnings.push(...district.warnings);
    if (crs.epsg === null) warnings.push(`the rasters are written with no EPSG code: the work CRS is a proj4 string (${crs.proj4Def}), kept in their citation and in run.json`);
    district.strips.forEach((figures, i) => {
      const strip = strips[i];
      strip.district = figures;
      if (depthsDiffer(strip.minDepthM, figures.minDepthM, settings.districtDepthToleranceM)) strip.flags.push(FLAG_DISTRICT_DEPTH);
      if (lossesDiffer(strip.lossM3PerDay, figures.lossM3PerDay, settings.districtLossTolerance)) strip.flags.push(FLAG_DISTRICT_LOSS);
    });
    onProgress('district solve', 1, 1);
  }
  const lineFigures = lines.map((_, i) => lineFigure(lineSummaries[i], district, i));

  // how many threads solved the facings changes no figure: the result (and so run.json and the
  // report) leaves it out, and is the same for any number of workers
  const { workers: _workers, ...resultSettings } = settings;
  return {
    settings: resultSettings,
    crs,
    warnings,
    lines,
    zones,
    geometries,
    lineLengthsM,
    zoneIndex,
    stations,
    facings,
    results: keptResults(results),
    transects: settings.writeTransects ? results : null,
    strips,
    lineSummaries,
    lineFigures,
    district,
    ground,
    totals: districtTotals(lineSummaries, lineFigures, strips, district),
    counts: {
      lines: lines.length,
      zones: zones.length,
      stations: stations.count,
      facingsByReason: countReasons(facings, results),
      solvedFacings: results.status.reduce((count, status) => count + (status === SOLVE_OK ? 1 : 0), 0),
      strips: strips.length,
    },
  };
}

/** Strip flags where the quick method and the district solve part ways. */
export const FLAG_DISTRICT_DEPTH = 'district-depth-differs';
export const FLAG_DISTRICT_LOSS = 'district-loss-differs';
/** Losses smaller than this (m^3/d) on both sides are too small to flag for a relative difference. */
const LOSS_FLOOR_M3_PER_DAY = 1;

function depthsDiffer(stripM: number, districtM: number, toleranceM: number): boolean {
  // NaN on either side (no solved transect, no free cell) compares as not differing: risk says 'unsolved' there
  return Math.abs(stripM - districtM) > toleranceM;
}

function lossesDiffer(stripM3PerDay: number, districtM3PerDay: number, tolerance: number): boolean {
  const larger = Math.max(Math.abs(stripM3PerDay), Math.abs(districtM3PerDay));
  if (!(larger >= LOSS_FLOOR_M3_PER_DAY)) return false;
  return Math.abs(stripM3PerDay - districtM3PerDay) > tolerance * larger;
}

/** Ranks in place: by loss per km (where lining pays first) or by smallest depth (shallowest first). */
export function rankStrips(strips: StripSummary[], rankBy: 'loss' | 'risk'): void {
  const byLoss = (a: StripSummary, b: StripSummary) => descendingNaNLast(a.lossM3PerDayKm, b.lossM3PerDayKm);
  const byDepth = (a: StripSummary, b: StripSummary) => ascendingNaNLast(a.minDepthM, b.minDepthM);
  strips.sort((a, b) => {
    const first = rankBy === 'loss' ? byLoss(a, b) : byDepth(a, b);
    if (first !== 0) return first;
    const second = rankBy === 'loss' ? byDepth(a, b) : byLoss(a, b);
    if (second !== 0) return second;
    return a.stripId < b.stripId ? -1 : a.stripId > b.stripId ? 1 : 0;
  });
}

function ascendingNaNLast(a: number, b: number): number {
  if (Number.isNaN(a) || Number.isNaN(b)) return Number(Number.isNaN(a)) - Number(Number.isNaN(b));
  return a - b;
}

function descendingNaNLast(a: number, b: number): number {
  if (Number.isNaN(a) || Number.isNaN(b)) return Number(Number.isNaN(a)) - Number(Number.isNaN(b));
  return b - a;
}

function lineFigure(summary: LineSummary, district: DistrictResult | null, line: number): LineFigure {
  const stripPerKm = lossPerKm(summary);
  const districtLoss = district ? district.lineLossM3PerDay[line] : NaN;
  if (district && Number.isFinite(districtLoss)) {
    return {
      netLossM3PerDay: districtLoss,
      netLossM3PerDayKm: summary.lengthM > 0 ? districtLoss / (summary.lengthM / 1000) : NaN,
      method: 'district',
      stripNetLossM3PerDay: summary.netLossM3PerDay,
      stripNetLossM3PerDayKm: stripPerKm,
      coarseDiffM3PerDay: district.lineLossCoarseM3PerDay[line] - districtLoss,
      coversShare: 1,
    };
  }
  return {
    netLossM3PerDay: summary.netLossM3PerDay,
    netLossM3PerDayKm: stripPerKm,
    method: 'strips',
    stripNetLossM3PerDay: summary.netLossM3PerDay,
    stripNetLossM3PerDayKm: stripPerKm,
    coarseDiffM3PerDay: NaN,
    coversShare: summary.lengthM > 0 ? Math.min(summary.solvedSidesM / (2 * summary.lengthM), 1) : 0,
  };
}

function districtTotals(summaries: LineSummary[], figures: LineFigure[], strips: StripSummary[], district: DistrictResult | null): DistrictTotals {
  let loss = 0, gain = 0, stripLinesLoss = 0, stripLinesGain = 0, paired = 0, unpaired = 0, riskArea = 0, solvedSides = 0, sides = 0, stripLoss = 0;
  for (let i = 0; i < summaries.length; i++) {
    const summary = summaries[i];
    // a line with no solved side has no loss to add (NaN): neither loss nor gain
    if (summary.netLossM3PerDay > 0) stripLinesLoss += summary.netLossM3PerDay;
    else if (summary.netLossM3PerDay < 0) stripLinesGain -= summary.netLossM3PerDay;
    // with the district solve, its figures only: a line it did not reach adds nothing (and is warned of)
    const figure = figures[i];
    if (!district || figure.method === 'district') {
      if (figure.netLossM3PerDay > 0) loss += figure.netLossM3PerDay;
      else if (figure.netLossM3PerDay < 0) gain -= figure.netLossM3PerDay;
    }
    paired += summary.pairedM;
    unpaired += summary.unpairedM;
    solvedSides += summary.solvedSidesM;
    sides += 2 * summary.lengthM;
  }
  const stripsByRisk = { unsolved: 0 } as Record<RiskClass | 'unsolved', number>;
  for (const risk of RISK_CLASSES) stripsByRisk[risk] = 0;
  for (const strip of strips) {
    riskArea += strip.riskAreaHa;
    if (strip.lossM3PerDay > 0) stripLoss += strip.lossM3PerDay;
    stripsByRisk[strip.risk ?? 'unsolved']++;
  }
  return {
    method: district ? 'district' : 'strips',
    lossM3PerDay: loss,
    lossM3PerYear: m3PerDayToM3PerYear(loss),
    gainM3PerDay: gain,
    netM3PerDay: loss - gain,
    pairedM: paired,
    unpairedM: unpaired,
    solvedSidesM: solvedSides,
    sidesM: sides,
    stripLossM3PerDay: stripLoss,
    stripLinesLossM3PerDay: stripLinesLoss,
    stripLinesGainM3PerDay: stripLinesGain,
    riskAreaHa: district ? district.shallowAreaHa : riskArea,
    stripRiskAreaHa: riskArea,
    stripsByRisk,
  };
}

/** What the solve stage left out or bridged, said once for the whole district. */
function solveWarnings(facings: FacingTable, results: FacingResults): string[] {
  const warnings: string[] = [];
  let outside = 0, bridged = 0, bridgedMaxM = 0, unsolved = 0;
  for (let i = 0; i < facings.count; i++) {
    if (results.reason[i] === FACING_OUTSIDE_AQUIFER) outside++;
    if (results.uncoveredM[i] > 0) { bridged++; bridgedMaxM = Math.max(bridgedMaxM, results.uncoveredM[i]); }
    if (results.status[i] !== SOLVE_OK && results.status[i] !== NOT_PAIRED) unsolved++;
  }
  if (outside > 0) warnings.push(`${outside} transect side${outside === 1 ? '' : 's'} leave the aquifer zones (a gap or the edge of the zones): their seepage is not computed`);
  if (bridged > 0) warnings.push(`${bridged} transect side${bridged === 1 ? '' : 's'} cross small gaps between zones (up to ${bridgedMaxM.toFixed(1)} m), joined to the neighbouring zone`);
  if (unsolved > 0) warnings.push(`${unsolved} paired transect side${unsolved === 1 ? '' : 's'} could not be solved (see the strips' unsolved flags): their seepage is not computed`);
  return warnings;
}

function countReasons(facings: FacingTable, results: FacingResults): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const name of FACING_REASON_NAMES) counts[name] = 0;
  for (let i = 0; i < facings.count; i++) counts[FACING_REASON_NAMES[results.reason[i]]]++;
  return counts;
}
