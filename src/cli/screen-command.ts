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
} from '../index.js';
import type { CliIo } from './io.js';

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

export async function screenCommand(options: ScreenOptions, argv: string[], io: CliIo, onProgress?: ProgressListener): Promise<number> {
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
  const screened = screenLoaded(district, config, { skipInvalid: options.skipInvalid, onProgress, dem });
  const checked = wells ? checkAgainstWells(district, config, screened, wells, { applyFit: options.applyKFit, onProgress, dem }) : null;
  const result = checked ? checked.result : screened;
  const spread = samples === null ? undefined : spreadOfRun(district, config, result, { samples, seed, correlated: Boolean(options.correlatedK) });
  for (const warning of result.warnings) log(`warning: ${warning}`);
  log(`solved ${result.counts.solvedFacings} of ${result.counts.facingsByReason.paired} paired transect sides; ${result.counts.strips} strips`);
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
