// doab's library API: read a config, load and check a district, screen it, write a run's outputs,
// render the report, draw a strip's profile. The command line is a thin layer over these.
//
//   import { readConfig, loadDistrict, screenLoaded, writeRun } from 'doab';
//   const config = readConfig('doab.jsonc');            // or readConfig() for the defaults
//   const district = await loadDistrict('canals.geojson', 'aquifer.geojson', config);
//   const result = screenLoaded(district, config);      // throws InputProblems on bad features
//   await writeRun('out', result, { district, config }); // strips, canals, ranking, report, run.json
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { configFromValue, defaultConfig, parseConfig, type RunConfig } from './input/config.js';
import { loadDistrict, type LoadedDistrict } from './input/load-district.js';
import { filesOfInput, hashInput } from './input/read-features.js';
import { readTextFile } from './input/read-text.js';
import type { OutputFile } from './output/atomic-write.js';
import { writeAllOrNothing } from './output/atomic-write.js';
import { roundNumber } from './output/format.js';
import { linesLayer, linesTablePieces, rankingTablePieces, stripsLayer, transectsLayer, type LayerFormat } from './output/layers.js';
import { checkOutputFolder, writeRunFolder } from './output/output-folder.js';
import { profileFileName, profileTable } from './output/profile-table.js';
import { districtRasters } from './output/rasters.js';
import { CAUTION, runRecord } from './output/run-record.js';
import { orientFromLineA, renderProfileSvg } from './report/profile-svg.js';
import { reportPieces, type ReportMeta } from './report/report.js';
import { keyFacing, profileOfFacing, type Profile } from './screening/profile.js';
import { checkRunBudget } from './screening/budget.js';
import { screenDistrict, type ProgressListener, type ScreenExtras, type ScreenResult } from './screening/screen.js';
import { assembleTiles, screenTile, type TileOfSplit, type TilePart } from './screening/tiles.js';
import type { StationTable } from './geometry/index.js';
import type { StripSummary } from './screening/aggregate.js';
import { DataError, errorsOf, formatProblem, InputProblems, type Problem } from './shared/errors.js';
import { VERSION } from './shared/version.js';
import { readLiningPlan } from './input/lining-plan.js';
import { loadWells, type LoadedWells } from './input/load-wells.js';
import { readDem, type Dem } from './input/read-dem.js';
import { geopackageFile } from './output/geopackage.js';
import { linesSld, stripsSld } from './output/sld.js';
import { LINE_COLOURS, STRIP_CLASSES, STRIP_STYLES } from './report/palette.js';
import { widthScaleTop } from './report/map-svg.js';
import { GEOPACKAGE_NAME } from './output/output-folder.js';
import { spreadLinesTable, spreadStripsTable } from './output/spread-tables.js';
import { readZoneSpreads, spreadFromK, type SpreadResult } from './screening/spread.js';
import { wellsLayer, wellsTable, type WellsOutcome } from './output/wells-tables.js';
import { compareWells } from './screening/wells.js';
import { fitConductivity, scaleZones } from './screening/k-fit.js';
import type { InputFile } from './input/read-features.js';
import { liningLayer, liningTable, programmeTable } from './output/lining-tables.js';
import { planLining, type LiningOutcome } from './screening/lining.js';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';

export { DataError, UsageError, InputProblems, errorsOf, problemLines, PROBLEMS_SHOWN, formatProblem, describePlace, type Problem, type DataProblemPlace } from './shared/errors.js';
export {
  SETTINGS,
  SETTING_KEYS,
  DEFAULT_SETTINGS,
  defaultSettings,
  applyFlags,
  flagAttribute,
  getSetting,
  settingsAsConfig,
  RISK_CLASSES,
  type ScreenSettings,
  type SettingKey,
  type SettingSpec,
  type RankBy,
  type RiskClass,
} from './shared/settings.js';
export { DEFAULT_RULES, type InputRules } from './shared/input-rules.js';
export { CONDUCTIVITY_UNITS, RECHARGE_UNITS, LENGTH_UNITS } from './shared/units.js';
export { VERSION } from './shared/version.js';
export { parseConfig, defaultConfig, type RunConfig } from './input/config.js';
export { loadDistrict, type LoadedDistrict } from './input/load-district.js';
export { readFeatureFile, filesOfInput, type InputFile } from './input/read-features.js';
export { screenDistrict, type ScreenResult, type ProgressListener, type DistrictTotals, type LineFigure, type FigureMethod } from './screening/screen.js';
export type { StripSummary, LineSummary } from './screening/aggregate.js';
export type { Profile } from './screening/profile.js';
export { checkOutputFolder, realPathOf, runOutputNames } from './output/output-folder.js';
export { profileFileName } from './output/profile-table.js';
export { writeAllOrNothing, type OutputFile } from './output/atomic-write.js';
export { CAUTION } from './output/run-record.js';
export { districtRasters, RASTER_NAMES, RASTER_NODATA } from './output/rasters.js';
export type { DistrictResult, DistrictBalance, DistrictStripFigures } from './screening/district.js';
export { summaryText } from './output/summary.js';
export { renderReport, type ReportMeta } from './report/report.js';
export { renderProfileSvg, peakLabelText } from './report/profile-svg.js';
export { readLiningPlan, parseLiningPlan, MAX_PLAN_REACHES } from './input/lining-plan.js';
export { planLining, type LiningPlan, type LiningOutcome, type PlanReach, type ReachOutcome } from './screening/lining.js';
export { LINING_COLUMNS, PROGRAMME_COLUMNS } from './output/lining-tables.js';

/** The config file's settings over the defaults, or the defaults when no file is named. */
export function readConfig(path?: string): RunConfig {
  return path ? parseConfig(path, readTextFile(path)) : defaultConfig();
}

/** The report's account of the inputs: each file with its SHA-256 and CRS, and the problems the checks found. */
function reportInputs(district: LoadedDistrict): Pick<ReportMeta, 'inputs' | 'inputWarnings'> {
  const files = [['canals', district.canals], ['aquifer', district.aquifer]] as const;
  return {
    inputs: files.flatMap(([label, file]) => (file ? [{ label, path: file.path, sha256: file.sha256, sourceCrs: file.sourceCrs }] : [])),
    inputWarnings: district.problems.map(formatProblem),
  };
}

/** A DEM as the screening takes it. */
function demExtras(dem: Dem | null | undefined): ScreenExtras['dem'] {
  return dem ? { grid: dem.grid, fromLonLat: dem.fromLonLat, pixelM: dem.pixelM, label: dem.path } : null;
}

export interface ScreenOptions {
  /** Leave out invalid features instead of stopping (a problem with a whole file still stops). */
  skipInvalid?: boolean;
  onProgress?: ProgressListener;
  /** Ground from a DEM (readDem). */
  dem?: Dem | null;
  /**
   * The transects as the tiles of an array job solved them (readTileFolder), instead of solving
   * them here. Taken when they are assembled: the array is emptied then, so that the tiles'
   * columns go once they are in place (at a million stations, 300 MB) rather than at the end.
   */
  tiles?: TilePart[] | null;
  /** The tiles' folder, for messages. */
  tilesLabel?: string;
}

/** The problems that stop a run on this district, or null when it can go on (bad features skipped, if asked). */
export function stoppingProblems(district: LoadedDistrict, options: { skipInvalid?: boolean } = {}): Problem[] | null {
  const errors = errorsOf(district.problems);
  const fileErrors = errors.filter((problem) => problem.place.featureIndex === undefined);
  if (errors.length > 0 && (!options.skipInvalid || fileErrors.length > 0)) return errors;
  if (!district.canals || !district.aquifer || district.lines.length === 0 || district.zones.length === 0) return errors;
  return null;
}

/** Screens a loaded district; throws InputProblems when its checks found errors that stop the run. */
export function screenLoaded(district: LoadedDistrict, config: RunConfig, options: ScreenOptions = {}): ScreenResult {
  const stopping = stoppingProblems(district, options);
  if (stopping) throw new InputProblems(stopping);
  checkRunBudget(district.lines, config.settings);
  const parts = options.tiles;
  const tiles = parts
    ? {
        assemble: (stations: StationTable) => {
          try {
            return assembleTiles(stations, parts.splice(0));
          } catch (error) {
            throw new DataError({ file: options.tilesLabel ?? 'the tiles' }, `the tiles cannot be gathered: ${(error as Error).message}`);
          }
        },
      }
    : null;
  return screenDistrict(district.lines, district.zones, config.settings, options.onProgress, { dem: demExtras(options.dem), tiles });
}

/** Screens one tile of a loaded district (doab screen --tile): its stations' transects, solved. */
export function screenTileLoaded(district: LoadedDistrict, config: RunConfig, tile: TileOfSplit, options: Omit<ScreenOptions, 'tiles' | 'tilesLabel'> = {}): TilePart {
  const stopping = stoppingProblems(district, options);
  if (stopping) throw new InputProblems(stopping);
  checkRunBudget(district.lines, config.settings);
  return screenTile(district.lines, district.zones, config.settings, tile, options.onProgress, { dem: demExtras(options.dem) });
}

export { checkTileFolder, writeTileFile } from './output/tile-file.js';
export { readTileFolder, type GatheredTiles } from './input/read-tiles.js';
export { tileFileName, tileSolvedSides, type TilePart, type TileRunMeta, type TileOfSplit } from './screening/tiles.js';
export { MAX_TILES } from './geometry/tiles.js';
export { hashInput } from './input/read-features.js';

export interface WriteRunOptions {
  district: LoadedDistrict;
  config: RunConfig;
  /** The config file's path, for the record; null when there was none. */
  configFile?: string | null;
  /** The command line as typed, for the record and the report. */
  commandLine?: string[];
  /** Layers as GeoJSON text sequences (RFC 8142) instead of FeatureCollections. */
  format?: LayerFormat;
  /** When the run started (ISO 8601), for the record and the report; default now, null to leave it out. */
  startedAt?: string | null;
  /** The checks against wells (--wells), and the wells file for the record. */
  wells?: { outcome: WellsOutcome; file: InputFile };
  /** The spread from uncertain K (--samples). */
  spread?: SpreadResult;
  /** The DEM the ground came from (--dem). */
  dem?: Dem | null;
}

/** The files of a run, in the order they are written: layers, table, report, run record. */
export function runFiles(result: ScreenResult, options: WriteRunOptions): OutputFile[] {
  const { district, config } = options;
  if (!district.canals || !district.aquifer) throw new Error('Unexpected district without both input files.');
  const format = options.format ?? 'collection';
  const extension = format === 'sequence' ? 'geojsons' : 'geojson';
  const commandLine = options.commandLine ?? ['doab'];
  const startedAt = options.startedAt === undefined ? new Date().toISOString() : options.startedAt;
  const files: OutputFile[] = [
    { name: `strips.${extension}`, content: stripsLayer(result, format) },
    { name: `canals.${extension}`, content: linesLayer(result, format) },
    { name: 'ranking.csv', content: rankingTablePieces(result) },
    { name: 'lines.csv', content: linesTablePieces(result) },
  ];
  if (result.settings.writeTransects) files.push({ name: `transects.${extension}`, content: transectsLayer(result, format) });
  if (result.district) for (const raster of districtRasters(result.district, result.crs)) files.push({ name: raster.name, content: [raster.content] });
  if (options.spread) files.push({ name: 'spread-strips.csv', content: spreadStripsTable(options.spread) }, { name: 'spread-lines.csv', content: spreadLinesTable(options.spread) });
  if (options.wells) {
    files.push({ name: `wells.${extension}`, content: wellsLayer(options.wells.outcome, format) }, { name: 'wells.csv', content: wellsTable(options.wells.outcome) });
  }
  files.push({
    name: 'report.html',
    content: reportPieces(result, {
      version: VERSION,
      commandLine,
      startedAt,
      ...reportInputs(district),
      rules: config.rules,
      wells: options.wells?.outcome,
      spread: options.spread,
    }),
  });
  // the styles, beside the layers and inside the GeoPackage: the report's own colours and widths
  const look = {
    strips: { classes: STRIP_CLASSES, styles: STRIP_STYLES },
    lines: { colours: LINE_COLOURS, widthTopM3PerDayKm: widthScaleTop(result) },
  };
  files.push({ name: 'strips.sld', content: stripsSld(look.strips) }, { name: 'lines.sld', content: linesSld(look.lines) });
  const outputs = [...files.map((file) => file.name), GEOPACKAGE_NAME, 'run.json'];
  const runJson = runRecord(result, {
      version: VERSION,
      commandLine,
      startedAt,
      canals: district.canals,
      aquifer: district.aquifer,
      config: options.configFile ?? null,
      rules: config.rules,
      outputs,
      problems: district.problems,
      wells: options.wells && { outcome: options.wells.outcome, sha256: options.wells.file.sha256 },
      spread: options.spread,
      dem: options.dem ? { path: options.dem.path, sha256: options.dem.sha256, crs: options.dem.crsLabel, pixels: options.dem.grid.width * options.dem.grid.height, nodataPixels: options.dem.nodataPixels } : null,
  });
  files.push({ name: GEOPACKAGE_NAME, content: geopackageFile(result, { runRecord: runJson, startedAt, look }) });
  files.push({ name: 'run.json', content: runJson });
  return files;
}

/** Writes every file of a run into outDir, or none; removes what an earlier doab run there left that this one does not write. */
export async function writeRun(outDir: string, result: ScreenResult, options: WriteRunOptions): Promise<{ written: string[]; removed: string[]; runRecord: string }> {
  const { district } = options;
  const files = runFiles(result, options);
  // the names this run writes, no more: a file of the user's under a name it does not write stays where it is
  checkOutputFolder(outDir, [district.canals?.path, district.aquifer?.path, options.configFile, options.wells?.file.path].flatMap((path) => (path ? filesOfInput(path) : [])), new Set(files.map((file) => file.name)));
  // the run record as written, for a database that keeps it beside the layers
  const runRecord = files.find((file) => file.name === 'run.json')?.content as string;
  return { ...(await writeRunFolder(outDir, files)), runRecord };
}

function isObject(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

function recordedInput(recordPath: string, inputs: unknown, label: string): { path: string; sha256: string } {
  const input = isObject(inputs) ? inputs[label] : undefined;
  if (!isObject(input) || typeof input.path !== 'string' || typeof input.sha256 !== 'string' || !/^[0-9a-f]{64}$/.test(input.sha256)) {
    throw new DataError({ file: recordPath, field: `inputs.${label}` }, 'missing, or without a path and a SHA-256');
  }
  return { path: input.path, sha256: input.sha256 };
}

function someIds(ids: string[], asked: string): string {
  // ids that share the asked id's first line are the likeliest meant; else the top-ranked
  const head = asked.split('|')[0];
  const near = head ? ids.filter((id) => id.split('|').includes(head)) : [];
  const shown = (near.length > 0 ? near : ids).slice(0, 5);
  return `${shown.map((id) => `"${id}"`).join(', ')}${ids.length > shown.length ? `, ... (${ids.length} strips in all; see ranking.csv)` : ''}`;
}

export interface StripProfile {
  strip: StripSummary;
  /** Oriented from the strip's line a. */
  profile: Profile;
}

/**
 * The cross-section of one strip of an earlier run: screens the recorded inputs again with the
 * recorded settings (run.json keeps them in config form), after checking the inputs are unchanged.
 */
/** An earlier run read back: its record, settings and inputs, the inputs checked unchanged and loaded again. */
interface RecordedRun {
  recordPath: string;
  record: Record<string, unknown>;
  config: RunConfig;
  district: LoadedDistrict;
  /** Features the run skipped (--skip-invalid); the run stopped on errors otherwise. */
  skipped: number;
  /** The DEM the run took its ground from, read again; null without one. */
  dem: Dem | null;
}

async function loadRun(runDir: string, command: string): Promise<RecordedRun> {
  const recordPath = join(runDir, 'run.json');
  if (!existsSync(recordPath)) throw new DataError({ file: recordPath }, `not found: is ${runDir} an output folder of doab screen?`);
  let record: unknown;
  try {
    record = JSON.parse(readTextFile(recordPath));
  } catch (error) {
    if (error instanceof DataError) throw error;
    throw new DataError({ file: recordPath }, `not valid JSON (${(error as Error).message})`);
  }
  if (!isObject(record) || record.tool !== 'doab') throw new DataError({ file: recordPath }, 'not a doab run record');
  if (!isObject(record.settings)) throw new DataError({ file: recordPath, field: 'settings' }, 'missing or not an object');
  const config = configFromValue(recordPath, record.settings, 'settings');
  const canals = recordedInput(recordPath, record.inputs, 'canals');
  const aquifer = recordedInput(recordPath, record.inputs, 'aquifer');
  for (const [label, input] of [['canals', canals], ['aquifer', aquifer]] as const) {
    if (!existsSync(input.path)) {
      throw new DataError(
        { file: input.path },
        `the ${label} input of the run in ${recordPath} is not found from ${process.cwd()}; run doab ${command} from the folder doab screen ran in`,
      );
    }
  }
  // the bytes are checked against the record before anything reads them as data, so a record that
  // points at another file (a system file, say) never has it parsed or quoted
  for (const input of [canals, aquifer]) {
    const { maxInputMB, maxUnzippedMB, maxZipRatio } = config.settings;
    const sha256 = hashInput(input.path, { maxInputMB, maxUnzippedMB, maxZipRatio });
    if (sha256 !== input.sha256) {
      throw new DataError(
        { file: input.path },
        `changed since the run in ${recordPath} (SHA-256 now ${sha256}, recorded ${input.sha256}); screen it again before doab ${command}`,
      );
    }
  }
  const district = await loadDistrict(canals.path, aquifer.path, config, { groundFromDem: isObject(record.dem) });
  const skipped = Array.isArray(record.skipped_features) ? record.skipped_features.length : 0;
  // a run with ground from a DEM reads it again, unchanged
  let dem: Dem | null = null;
  if (isObject(record.dem)) {
    const { path, sha256, crs } = record.dem;
    if (typeof path !== 'string' || typeof sha256 !== 'string' || typeof crs !== 'string') throw new DataError({ file: recordPath, field: 'dem' }, 'a DEM without path, SHA-256 and CRS');
    dem = await readDem(path, { demCrs: crs, maxInputMB: config.settings.maxInputMB });
    if (dem.sha256 !== sha256) throw new DataError({ file: path }, `changed since the run in ${recordPath} (SHA-256 now ${dem.sha256}, recorded ${sha256}); screen it again before doab ${command}`);
  }
  // a run screened with K fitted to wells (--apply-k-fit) is screened again with the same multipliers
  const fit = isObject(record.wells) && isObject(record.wells.k_fit) ? record.wells.k_fit : null;
  if (fit && fit.applied === true && Array.isArray(fit.zones)) {
    const byZone = new Map<string, number>();
    for (const zone of fit.zones) {
      if (!isObject(zone) || typeof zone.zone_id !== 'string' || typeof zone.multiplier !== 'number' || !(zone.multiplier > 0)) {
        throw new DataError({ file: recordPath, field: 'wells.k_fit.zones' }, 'a zone without a zone_id and a positive multiplier');
      }
      byZone.set(zone.zone_id, zone.multiplier);
    }
    district.zones = scaleZones(district.zones, district.zones.map((zone) => byZone.get(zone.id) ?? 1));
  }
  return { recordPath, record, config, district, skipped, dem };
}

export async function profileFromRun(runDir: string, stripId: string): Promise<StripProfile> {
  const { recordPath, config, district, skipped, dem } = await loadRun(runDir, 'profile');
  // the run itself stopped on errors unless it skipped them (--skip-invalid)
  // a profile draws a strip's own transect: the district solve would add seconds and change nothing drawn
  const result = screenLoaded(district, { ...config, settings: { ...config.settings, stripsOnly: true } }, { skipInvalid: skipped > 0, dem });
  const strip = result.strips.find((s) => s.stripId === stripId);
  if (!strip) throw new DataError({ file: recordPath }, `no strip "${stripId}" in this run; its strips include ${someIds(result.strips.map((s) => s.stripId), stripId)}`);
  const solved = profileOfFacing(result, strip, keyFacing(result, strip));
  if (!solved) {
    throw new DataError({ file: recordPath }, `strip "${strip.stripId}" has no solved transect (flags: ${strip.flags.join(';') || 'none'}): there is no water table to draw`);
  }
  return { strip, profile: orientFromLineA(solved, strip.lineAId) };
}

/** Writes a strip's profile as SVG and CSV into outDir (all or nothing); returns the file names. */
export async function writeProfile(outDir: string, { strip, profile }: StripProfile): Promise<string[]> {
  const name = profileFileName(strip.stripId);
  const files = [
    { name: `${name}.svg`, content: `${renderProfileSvg(profile)}\n` },
    { name: `${name}.csv`, content: profileTable(profile) },
  ];
  await writeAllOrNothing(outDir, files);
  return files.map((file) => file.name);
}

/** One paragraph on a profile, for a terminal. */
export function profileText({ strip, profile }: StripProfile, peakLabel: (peakM: number) => string): string {
  return (
    `Strip ${strip.stripId}: key transect from ${profile.lineA} to ${profile.lineB}, ${roundNumber(profile.transectLengthM)} m wide\n` +
    `Stages ${profile.stageAM.toFixed(2)} and ${profile.stageBM.toFixed(2)} m, base ${profile.baseM.toFixed(2)} m; ` +
    `peak water table ${peakLabel(profile.peakWaterTableM)} at ${roundNumber(profile.peakOffsetM)} m from ${profile.lineA}; ` +
    `smallest depth ${profile.minDepthM.toFixed(2)} m\n\nCAUTION: ${CAUTION}\n`
  );
}

/** The names `doab lining` writes into its output folder. */
export const LINING_OUTPUT_NAMES: ReadonlySet<string> = new Set(['lining.csv', 'lining-programme.csv', 'lining.geojson', 'report.html', 'run.json']);

export interface LiningRun {
  outcome: LiningOutcome;
  run: RecordedRun;
  planSha256: string;
}

/**
 * A lining plan on an earlier run: the run's inputs (checked unchanged) screened with its settings
 * now, with each reach lined, and with the programme; the district solve when the run had it.
 */
export async function liningFromRun(runDir: string, planPath: string, onScreening?: (done: number, total: number) => void): Promise<LiningRun> {
  const plan = readLiningPlan(planPath);
  const planSha256 = createHash('sha256').update(readFileSync(planPath)).digest('hex');
  const run = await loadRun(runDir, 'lining');
  const stopping = stoppingProblems(run.district, { skipInvalid: run.skipped > 0 });
  if (stopping) throw new InputProblems(stopping);
  checkRunBudget(run.district.lines, run.config.settings);
  const outcome = planLining(run.district.lines, run.district.zones, run.config.settings, plan, onScreening, { dem: demExtras(run.dem) });
  return { outcome, run, planSha256 };
}

/** The files of a lining run: the tables, the reaches' layer, the report with its lining section, and its record. */
export function liningFiles({ outcome, run, planSha256 }: LiningRun, commandLine: string[] = ['doab', 'lining'], startedAt: string = new Date().toISOString()): OutputFile[] {
  const { district, config } = run;
  if (!district.canals || !district.aquifer) throw new Error('Unexpected district without both input files.');
  const files: OutputFile[] = [
    { name: 'lining.csv', content: liningTable(outcome) },
    { name: 'lining-programme.csv', content: programmeTable(outcome) },
    { name: 'lining.geojson', content: liningLayer(outcome) },
    {
      name: 'report.html',
      content: reportPieces(outcome.resultNow, {
        version: VERSION,
        commandLine,
        startedAt,
        ...reportInputs(district),
        rules: config.rules,
        lining: outcome,
      }),
    },
  ];
  const record = JSON.parse(runRecord(outcome.resultNow, {
    version: VERSION,
    commandLine,
    startedAt,
    canals: district.canals,
    aquifer: district.aquifer,
    config: null,
    rules: config.rules,
    outputs: [...files.map((file) => file.name), 'run.json'],
    problems: district.problems,
  }));
  record.lining = {
    base_run: run.recordPath,
    plan: { path: outcome.plan.file, sha256: planSha256 },
    method: outcome.method,
    ranked_by: outcome.rankedBy,
    budget: outcome.plan.budget,
    screenings: outcome.screenings,
    reaches: outcome.reaches.length,
    programme: outcome.programme.map((step) => step.outcome.reach.id),
    programme_saved_m3_d: roundNumber(outcome.programmeSavedM3PerDay),
    programme_waterlogged_ha_change: roundNumber(outcome.programmeWaterloggedHaChange),
    programme_potential_ha_change: roundNumber(outcome.programmePotentialHaChange),
  };
  files.push({ name: 'run.json', content: `${JSON.stringify(record, null, 2)}\n` });
  return files;
}

/** Writes a lining run into outDir, all or nothing, after the same checks as a screening's folder. */
export async function writeLining(outDir: string, lining: LiningRun, commandLine?: string[], startedAt?: string): Promise<string[]> {
  const files = liningFiles(lining, commandLine, startedAt);
  const inputs = [lining.run.district.canals?.path, lining.run.district.aquifer?.path, lining.outcome.plan.file].flatMap((path) => (path ? filesOfInput(path) : []));
  checkOutputFolder(outDir, [...inputs, lining.run.recordPath], new Set(files.map((file) => file.name)));
  await writeRunFolder(outDir, files);
  return files.map((file) => file.name);
}

/** A paragraph on a lining run, for a terminal. */
export function liningText({ outcome }: LiningRun): string {
  const lines: string[] = [];
  const f = (value: number, decimals = 0) => (Number.isFinite(value) ? value.toFixed(decimals) : '-');
  lines.push(`doab lining: ${outcome.reaches.length} reaches, ${outcome.screenings} screenings (${outcome.method === 'district' ? 'district solve' : 'strips alone'}); programme ranked by ${outcome.rankedBy}`);
  lines.push('rank  reach        line   km     saved m3/d  saved m3/d/km  waterlogged ha');
  outcome.programme.forEach((step, i) => {
    const o = step.outcome;
    lines.push(`${String(i + 1).padEnd(4)}  ${o.reach.id.padEnd(11)}  ${o.reach.lineId.padEnd(5)}  ${f(o.lengthM / 1000, 2).padStart(5)}  ${f(o.savedM3PerDay).padStart(10)}  ${f(o.savedM3PerDayKm).padStart(13)}  ${f(o.waterloggedHaChange, 1).padStart(14)}`);
  });
  if (outcome.programme.length > 0) {
    lines.push(
      `Programme lined at once: canals keep ${f(outcome.programmeSavedM3PerDay)} m3/d; waterlogged area ${f(outcome.programmeWaterloggedHaChange, 1)} ha, potentially waterlogged ${f(outcome.programmePotentialHaChange, 1)} ha`,
    );
  } else lines.push('Programme empty: no reach saves water or none fits the budget');
  lines.push('', `CAUTION: ${CAUTION}`);
  return `${lines.join('\n')}\n`;
}

export { loadWells, type LoadedWells } from './input/load-wells.js';
export { readDem, type Dem } from './input/read-dem.js';
export type { WellsOutcome } from './output/wells-tables.js';

/**
 * The checks against wells: a conductivity multiplier per zone fitted to them, and, when asked
 * (applyFit), the district screened again with it; then each well against the run's water table.
 * Returns the result to write (the fitted one when applied) with the wells' outcome.
 */
export function checkAgainstWells(
  district: LoadedDistrict,
  config: RunConfig,
  result: ScreenResult,
  wells: LoadedWells,
  options: { applyFit?: boolean; onProgress?: ProgressListener; dem?: Dem | null } = {},
): { result: ScreenResult; outcome: WellsOutcome } {
  const path = wells.file?.path ?? 'wells';
  const fit = fitConductivity(district.lines, district.zones, config.settings, wells.wells, path);
  let checked = result;
  if (options.applyFit) {
    checked = screenDistrict(district.lines, scaleZones(district.zones, fit.zones.map((zone) => zone.multiplier)), config.settings, options.onProgress, { dem: demExtras(options.dem) });
    checked.warnings.push(
      `the zones' hydraulic conductivity carries the multipliers fitted to the wells (--apply-k-fit): ${fit.zones.filter((zone) => zone.wells > 0).map((zone) => `${zone.zoneId} x${zone.multiplier.toFixed(3)}`).join(', ') || 'none fitted'}`,
    );
  }
  return { result: checked, outcome: { comparison: compareWells(checked, wells.wells, path), fit, applied: Boolean(options.applyFit) } };
}

export { readZoneSpreads, spreadFromK, type SpreadResult } from './screening/spread.js';

/** The spread from uncertain K on a screened district: each zone's range read from its attributes (problems stop it), then the draws. */
export function spreadOfRun(district: LoadedDistrict, config: RunConfig, result: ScreenResult, options: { samples: number; seed: number; correlated: boolean }): SpreadResult {
  if (!district.aquifer) throw new Error('Unexpected district without its aquifer file.');
  const { spreads, problems } = readZoneSpreads(district.aquifer.path, district.aquifer.features, result.zones, config.rules);
  if (problems.length > 0) throw new InputProblems(problems);
  const spread = spreadFromK(result, spreads, { ...options, top: 20 });
  if (spread.zones.length === 0) {
    result.warnings.push(
      `no zone gives a K range ("${config.rules.fields.zones.kLow}" and "${config.rules.fields.zones.kHigh}", or "${config.rules.fields.zones.kLogSd}"): every one of the ${options.samples} draws is the deterministic run`,
    );
  }
  return spread;
}

export { writeToPostgis, redactedUrl, checkSchemaName } from './output/postgis.js';
