// `doab screen`: read and check, screen, write all outputs or none, print the summary.
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
  const { written, removed } = await writeRun(options.out, result, {
    district,
    config,
    configFile: options.config ?? null,
    commandLine: ['doab', ...argv],
    startedAt,
    format: options.seq ? 'sequence' : 'collection',
    wells: checked && wells?.file ? { outcome: checked.outcome, file: wells.file } : undefined,
    spread,
    dem,
  });
  log(`wrote ${written.join(', ')} to ${options.out}${removed.length > 0 ? `; removed ${removed.join(', ')} left by the previous run` : ''}`);
  if (!options.quiet) io.out(summaryText(result, 10, errors.length, checked?.outcome, spread));
  else io.err(`${CAUTION}\n`);
  return 0;
}
