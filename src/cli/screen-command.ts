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
  /** The settings' flags (--step and the rest), by commander's attribute names. */
  [flag: string]: unknown;
}

/** The config file (if any) with the command line's options over it. */
export function runConfig(options: { config?: string; [flag: string]: unknown }): RunConfig {
  const config = readConfig(options.config);
  applyFlags(config.settings, options);
  return config;
}

export async function screenCommand(options: ScreenOptions, argv: string[], io: CliIo, onProgress?: ProgressListener): Promise<number> {
  const startedAt = new Date().toISOString();
  const log = options.quiet ? () => {} : (text: string) => io.err(`${text}\n`);
  const config = runConfig(options);
  // before any work: never an output over an input, nor over a file doab did not write
  checkOutputFolder(options.out, [options.canals, options.aquifer, options.config].flatMap((path) => (path ? filesOfInput(path) : [])), runOutputNames(config.settings, options.seq ? 'sequence' : 'collection'));
  const district = await loadDistrict(options.canals, options.aquifer, config);
  const errors = errorsOf(district.problems);
  const stopping = stoppingProblems(district, options);
  if (stopping) throw new InputProblems(stopping);
  const warnings = district.problems.filter((problem) => problem.severity === 'warning');
  if (warnings.length > 0) log(problemLines(warnings, PROBLEMS_SHOWN).trimEnd());
  if (errors.length > 0) log(`skipping ${errors.length} invalid feature${errors.length === 1 ? '' : 's'} (--skip-invalid):\n${problemLines(errors, PROBLEMS_SHOWN).trimEnd()}`);
  log(`read ${district.lines.length} lines from ${options.canals} and ${district.zones.length} zones from ${options.aquifer}`);
  const result = screenLoaded(district, config, { skipInvalid: options.skipInvalid, onProgress });
  for (const warning of result.warnings) log(`warning: ${warning}`);
  log(`solved ${result.counts.solvedFacings} of ${result.counts.facingsByReason.paired} paired transect sides; ${result.counts.strips} strips`);
  const { written, removed } = await writeRun(options.out, result, {
    district,
    config,
    configFile: options.config ?? null,
    commandLine: ['doab', ...argv],
    startedAt,
    format: options.seq ? 'sequence' : 'collection',
  });
  log(`wrote ${written.join(', ')} to ${options.out}${removed.length > 0 ? `; removed ${removed.join(', ')} left by the previous run` : ''}`);
  if (!options.quiet) io.out(summaryText(result, 10, errors.length));
  else io.err(`${CAUTION}\n`);
  return 0;
}
