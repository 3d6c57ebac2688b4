// `doab screen`: read and check, screen, write all outputs or none, print the summary.
import { basename, resolve } from 'node:path';
import {
  applyFlags,
  checkOutputFolder,
  runOutputNames,
  filesOfInput,
  CAUTION,
  errorsOf,
  InputProblems,
  loadDistrict,
  stoppingProblems,
  problemLines,
  PROBLEMS_SHOWN,
  readConfig,
  screenLoaded,
  summaryText,
  writeRun,
  type ProgressListener,
  checkAgainstWells,
  checkSchemaName,
  redactedUrl,
  writeToPostgis,
  spreadOfRun,
  readDem,
  loadWells,
  UsageError,
  type RunConfig,
  checkTileFolder,
  hashInput,
  screenTileLoaded,
  tileSolvedSides,
  writeTileFile,
  DataError,
  VERSION,
  type GatheredTiles,
} from '../index.js';
import { createHash } from 'node:crypto';
import { parseTileOption } from './tile-option.js';
import type { CliIo } from './io.js';
import { collectBetweenStages } from './collect-garbage.js';

export interface ScreenOptions {
  canals: string;
  aquifer: string;
  out: string;
  config?: string;
  seq?: boolean;
  skipInvalid?: boolean;
  quiet?: boolean;
  debug?: boolean;
  wells?: string;
  applyKFit?: boolean;
  samples?: string;
  seed?: string;
  dem?: string;
  demCrs?: string;
  toPostgis?: string;
  pgSchema?: string;
  pgIfExists?: string;
  correlatedK?: boolean;
  /** I/N, or N with the index from an array job's variable: screen one tile and write its file. */
  tile?: string;
  /** The settings' flags (--step and the rest), by commander's attribute names. */
  [flag: string]: unknown;
}

/** The config file (if any) with the command line's options over it. */
export function runConfig(options: { config?: string; [flag: string]: unknown }): RunConfig {
  const config = readConfig(options.config);
  applyFlags(config.settings, options);
  return config;
}

/** The command line with a connection string's password masked: run.json and the report record it. */
function recordedArgv(argv: string[]): string[] {
  return argv.map((arg, i) => (argv[i - 1] === '--to-postgis' ? redactedUrl(arg) : arg.startsWith('--to-postgis=') ? `--to-postgis=${redactedUrl(arg.slice(13))}` : arg));
}

/** Draws at most (each solves every strip again). */
const MAX_SAMPLES = 100_000;

/** The tiles being gathered (doab gather): their transects stand in for solving them here. */
export interface GatherSource {
  tiles: GatheredTiles;
  /** The tiles' folder, as given. */
  dir: string;
}

export async function screenCommand(options: ScreenOptions, argv: string[], io: CliIo, onProgress?: ProgressListener, gather?: GatherSource): Promise<number> {
  const startedAt = new Date().toISOString();
  const log = options.quiet ? () => {} : (text: string) => io.err(`${text}\n`);
  const config = runConfig(options);
  // before any work: never an output over an input, nor over a file doab did not write
  if (options.applyKFit && !options.wells) throw new UsageError('--apply-k-fit needs --wells: the multipliers are fitted to the wells', 'wells');
  const samples = options.samples === undefined ? null : Number(options.samples);
  if (samples !== null && !(Number.isInteger(samples) && samples >= 1 && samples <= MAX_SAMPLES)) {
    throw new UsageError(`--samples must be a whole number from 1 to ${MAX_SAMPLES}, found ${JSON.stringify(options.samples)}`, 'samples');
  }
  const seed = options.seed === undefined ? 1 : Number(options.seed);
  if (!Number.isInteger(seed) || seed < 0 || seed > 2 ** 32 - 1) throw new UsageError(`--seed must be a whole number from 0 to ${2 ** 32 - 1}, found ${JSON.stringify(options.seed)}`, 'seed');
  if ((options.seed !== undefined || options.correlatedK) && samples === null) throw new UsageError('--seed and --correlated-k need --samples', 'samples');
  if (options.demCrs !== undefined && !options.dem) throw new UsageError('--dem-crs needs --dem', 'dem');
  const pgIfExists = options.pgIfExists ?? 'refuse';
  if (pgIfExists !== 'replace' && pgIfExists !== 'refuse') throw new UsageError(`--pg-if-exists must be replace or refuse, found ${JSON.stringify(pgIfExists)}`, 'pg-if-exists');
  if ((options.pgSchema !== undefined || options.pgIfExists !== undefined) && options.toPostgis === undefined) throw new UsageError('--pg-schema and --pg-if-exists need --to-postgis', 'to-postgis');
  const pgSchema = options.pgSchema ?? 'doab';
  if (options.toPostgis !== undefined) {
    try {
      checkSchemaName(pgSchema);
    } catch (error) {
      throw new UsageError(`--pg-schema: ${(error as Error).message}`, 'pg-schema');
    }
  }
  if (options.tile !== undefined) {
    if (options.toPostgis !== undefined) throw new UsageError('--to-postgis goes to doab gather, which writes the whole run: a tile writes only its tile file', 'to-postgis');
    return screenTileCommand(options, config, io, onProgress);
  }
  checkOutputFolder(
    options.out,
    [options.canals, options.aquifer, options.config, options.wells, options.dem].flatMap((path) => (path ? filesOfInput(path) : [])),
    runOutputNames(config.settings, options.seq ? 'sequence' : 'collection', Boolean(options.wells), samples !== null),
  );
  // with a DEM, a zone may leave out its ground level: the DEM gives it
  const district = await loadDistrict(options.canals, options.aquifer, config, { groundFromDem: Boolean(options.dem) });
  const wells = options.wells ? await loadWells(options.wells, config) : null;
  // a bad well stops the run as a bad line does (--skip-invalid leaves bad wells out too)
  if (wells) district.problems.push(...wells.problems);
  const errors = errorsOf(district.problems);
  const stopping = stoppingProblems(district, options) ?? (wells && !wells.file ? errorsOf(wells.problems) : null);
  if (stopping) throw new InputProblems(stopping);
  const warnings = district.problems.filter((problem) => problem.severity === 'warning');
  if (warnings.length > 0) log(problemLines(warnings, PROBLEMS_SHOWN).trimEnd());
  if (errors.length > 0) log(`skipping ${errors.length} invalid feature${errors.length === 1 ? '' : 's'} (--skip-invalid):\n${problemLines(errors, PROBLEMS_SHOWN).trimEnd()}`);
  log(`read ${district.lines.length} lines from ${options.canals} and ${district.zones.length} zones from ${options.aquifer}`);
  const dem = options.dem ? await readDem(options.dem, { demCrs: options.demCrs ?? null, maxInputMB: config.settings.maxInputMB }) : null;
  if (dem) log(`read a DEM of ${dem.grid.width} x ${dem.grid.height} pixels (${dem.crsLabel}) from ${options.dem}${dem.nodataPixels > 0 ? `, ${dem.nodataPixels} without data` : ''}`);
  if (gather) {
    checkSameInputs(gather, { canals: district.canals?.sha256, aquifer: district.aquifer?.sha256, dem: dem?.sha256, ...extraInputHashes(options) }, options);
    log(`gathering ${gather.tiles.parts.length} tile${gather.tiles.parts.length === 1 ? '' : 's'} from ${gather.dir}: their transects, solved, stand in for solving them here`);
  }
  const screened = screenLoaded(district, config, { skipInvalid: options.skipInvalid, onProgress, dem, tiles: gather?.tiles.parts, tilesLabel: gather?.dir });
  const checked = wells ? checkAgainstWells(district, config, screened, wells, { applyFit: options.applyKFit, onProgress, dem }) : null;
  const result = checked ? checked.result : screened;
  const spread = samples === null ? undefined : spreadOfRun(district, config, result, { samples, seed, correlated: Boolean(options.correlatedK) });
  for (const warning of result.warnings) log(`warning: ${warning}`);
  log(`solved ${result.counts.solvedFacings} of ${result.counts.facingsByReason.paired} paired transect sides; ${result.counts.strips} strips`);
  collectBetweenStages(result.counts.stations);
  const { written, removed, runRecord } = await writeRun(options.out, result, {
    district,
    config,
    configFile: options.config ?? null,
    commandLine: ['doab', ...recordedArgv(argv)],
    startedAt,
    format: options.seq ? 'sequence' : 'collection',
    wells: checked && wells?.file ? { outcome: checked.outcome, file: wells.file } : undefined,
    spread,
    dem,
  });
  log(`wrote ${written.join(', ')} to ${options.out}${removed.length > 0 ? `; removed ${removed.join(', ')} left by the previous run` : ''}`);
  if (options.toPostgis !== undefined) {
    // the run's id is its output folder's name: rerunning into the same folder is the same run
    const runId = basename(resolve(options.out));
    const { tables } = await writeToPostgis(result, { url: options.toPostgis, schema: pgSchema, runId, runRecord, ifExists: pgIfExists });
    log(`wrote run ${runId} to PostGIS at ${redactedUrl(options.toPostgis)}, schema ${pgSchema}: ${Object.entries(tables).map(([table, rows]) => `${table} ${rows}`).join(', ')}`);
  }
  if (!options.quiet) io.out(summaryText(result, 10, errors.length, checked?.outcome, spread));
  else io.err(`${CAUTION}\n`);
  return 0;
}

/** Options a tile leaves out of its record: where it writes, which tile, and what changes no figure. */
const NOT_RECORDED = new Set(['out', 'tile', 'quiet', 'debug', 'workers', 'toPostgis', 'pgSchema', 'pgIfExists']);

/** The options that decide the run's figures, keys sorted, as the tiles record them. */
export function recordedTileOptions(options: ScreenOptions): Record<string, unknown> {
  return Object.fromEntries(
    Object.keys(options)
      .filter((key) => !NOT_RECORDED.has(key) && options[key] !== undefined)
      .sort()
      .map((key) => [key, options[key]]),
  );
}

/** SHA-256 of the config and wells files (the lines, zones and DEM are hashed as they are read). */
function extraInputHashes(options: ScreenOptions): Record<string, string> {
  const hashes: Record<string, string> = {};
  if (options.config) hashes.config = hashInput(options.config);
  if (options.wells) hashes.wells = hashInput(options.wells);
  return hashes;
}

/** Every input as the tiles read it: a file changed since stops the gathering, naming it. */
function checkSameInputs(gather: GatherSource, now: Record<string, string | undefined>, options: ScreenOptions): void {
  const recorded = gather.tiles.run.inputs;
  for (const key of new Set([...Object.keys(recorded), ...Object.keys(now)])) {
    if (now[key] === undefined && recorded[key] === undefined) continue;
    if (now[key] !== recorded[key]) {
      const path = String((options as Record<string, unknown>)[key] ?? key);
      throw new DataError({ file: path }, `this ${key} file is not the one the tiles in ${gather.dir} were screened with (its SHA-256 differs): rerun the tiles on it, or gather with the file they used`);
    }
  }
}

/** doab screen --tile: screen one tile and write its file into --out, for doab gather. */
async function screenTileCommand(options: ScreenOptions, config: RunConfig, io: CliIo, onProgress?: ProgressListener): Promise<number> {
  const log = options.quiet ? () => {} : (text: string) => io.err(`${text}\n`);
  const { tile, from } = parseTileOption(options.tile as string);
  const inputs = [options.canals, options.aquifer, options.config, options.wells, options.dem].flatMap((path) => (path ? filesOfInput(path) : []));
  checkTileFolder(options.out, tile, inputs);
  const district = await loadDistrict(options.canals, options.aquifer, config, { groundFromDem: Boolean(options.dem) });
  const stopping = stoppingProblems(district, options);
  if (stopping) throw new InputProblems(stopping);
  const dem = options.dem ? await readDem(options.dem, { demCrs: options.demCrs ?? null, maxInputMB: config.settings.maxInputMB }) : null;
  const part = screenTileLoaded(district, config, tile, { skipInvalid: options.skipInvalid, onProgress, dem });
  const recorded = recordedTileOptions(options);
  const hashes: Record<string, string> = { canals: district.canals!.sha256, aquifer: district.aquifer!.sha256, ...(dem ? { dem: dem.sha256 } : {}), ...extraInputHashes(options) };
  const runKey = createHash('sha256').update(JSON.stringify({ version: VERSION, options: recorded, inputs: hashes })).digest('hex');
  const path = await writeTileFile(options.out, part, { tool: 'doab', version: VERSION, options: recorded, cwd: process.cwd(), inputs: hashes, runKey });
  log(`tile ${tile.index} of ${tile.count} (from ${from}): ${part.stations.length} of ${part.districtStations} stations, ${tileSolvedSides(part)} transect sides solved; wrote ${path}`);
  log(`when all ${tile.count} tiles are written, run: doab gather --tiles ${options.out} --out <folder>`);
  if (options.quiet) io.err(`${CAUTION}\n`);
  return 0;
}
