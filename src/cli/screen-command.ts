// `doab screen`: read and check, screen, write all outputs or none, print the summary.
import { existsSync, readFileSync, rmSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { writeAllOrNothing, type OutputFile } from '../io/atomic-write.js';
import { linesLayer, rankingTable, stripsLayer, transectsLayer, type LayerFormat } from '../io/layers.js';
import { runRecord, summaryText, CAUTION } from '../io/run-record.js';
import { renderReport } from '../report/index.js';
import { formatProblem } from '../screening/district-inputs.js';
import { defaultConfig, parseConfig, type RunConfig } from '../screening/config.js';
import { screenDistrict, type ProgressListener } from '../screening/screen.js';
import type { RankBy } from '../screening/settings.js';
import { readTextFile, UsageError, VERSION } from './common.js';
import { errorsOf, InputProblems, loadDistrict, problemLines } from './load-district.js';

export interface ScreenOptions {
  canals: string;
  aquifer: string;
  out: string;
  config?: string;
  step?: number;
  maxGap?: number;
  maxAngle?: number;
  crs?: string;
  inputCrs?: string;
  rankBy?: RankBy;
  transects?: boolean;
  seq?: boolean;
  skipInvalid?: boolean;
  quiet?: boolean;
  debug?: boolean;
}

export interface CliIo {
  out: (text: string) => void;
  err: (text: string) => void;
}

/** Fails before any work when --out cannot become a folder: it, or the nearest existing path above it, is a file. */
export function checkOutputFolder(out: string): void {
  let path = resolve(out);
  while (!existsSync(path) && dirname(path) !== path) path = dirname(path);
  if (existsSync(path) && !statSync(path).isDirectory()) {
    throw new UsageError(`--out ${out}: ${path === resolve(out) ? 'is a file' : `${path} is a file`}, not a folder: name a folder for the outputs`);
  }
}

const OUTPUT_NAMES = new Set(['strips', 'canals', 'transects'].flatMap((layer) => [`${layer}.geojson`, `${layer}.geojsons`]).concat(['ranking.csv', 'report.html', 'run.json']));

/**
 * Outputs of an earlier run in the same folder that this run does not write (a transects layer
 * from a run with --transects, say), so that the folder never mixes two runs. Only names that the
 * earlier run.json lists as doab's own outputs qualify: doab deletes nothing it did not write.
 */
function staleOutputs(outDir: string, outputs: string[]): string[] {
  let previous: unknown;
  try {
    previous = JSON.parse(readFileSync(join(outDir, 'run.json'), 'utf8'));
  } catch {
    return [];
  }
  const record = previous as { tool?: unknown; outputs?: unknown };
  if (record.tool !== 'doab' || !Array.isArray(record.outputs)) return [];
  return record.outputs.filter((name): name is string => typeof name === 'string' && OUTPUT_NAMES.has(name) && !outputs.includes(name));
}

/** The config file (if any) with the command line's options over it. */
export function runConfig(options: Partial<ScreenOptions>): RunConfig {
  const config = options.config ? parseConfig(options.config, readTextFile(options.config)) : defaultConfig();
  const settings = config.settings;
  if (options.step !== undefined) settings.stepM = options.step;
  if (options.maxGap !== undefined) settings.maxGapM = options.maxGap;
  if (options.maxAngle !== undefined) {
    if (options.maxAngle >= 90) throw new UsageError(`--max-angle must be below 90 degrees, got ${options.maxAngle}`);
    settings.maxAngleDeg = options.maxAngle;
  }
  if (options.crs !== undefined) settings.crs = options.crs;
  if (options.rankBy !== undefined) settings.rankBy = options.rankBy;
  if (options.transects) settings.writeTransects = true;
  if (options.inputCrs !== undefined) config.inputCrs = options.inputCrs;
  return config;
}

export async function screenCommand(options: ScreenOptions, argv: string[], io: CliIo, onProgress?: ProgressListener): Promise<number> {
  const log = options.quiet ? () => {} : (text: string) => io.err(`${text}\n`);
  checkOutputFolder(options.out);
  const config = runConfig(options);
  const settings = config.settings;
  const district = await loadDistrict(options.canals, options.aquifer, config);
  const errors = errorsOf(district.problems);
  const fileErrors = errors.filter((problem) => problem.place.featureIndex === undefined);
  if (errors.length > 0 && (!options.skipInvalid || fileErrors.length > 0)) throw new InputProblems(errors);
  if (!district.canals || !district.aquifer) throw new InputProblems(errors);
  const warnings = district.problems.filter((problem) => problem.severity === 'warning');
  if (warnings.length > 0) log(problemLines(warnings).trimEnd());
  if (errors.length > 0) log(`skipping ${errors.length} invalid feature${errors.length === 1 ? '' : 's'} (--skip-invalid):\n${problemLines(errors).trimEnd()}`);
  if (district.lines.length === 0 || district.zones.length === 0) throw new InputProblems(errors);
  log(`read ${district.lines.length} lines from ${options.canals} and ${district.zones.length} zones from ${options.aquifer}`);

  let result;
  try {
    result = screenDistrict(district.lines, district.zones, settings, onProgress);
  } catch (error) {
    // an unusable --crs is the user's to fix, not an internal failure
    if (settings.crs !== null && /CRS/.test((error as Error).message)) throw new UsageError((error as Error).message);
    throw error;
  }
  for (const warning of result.warnings) log(`warning: ${warning}`);
  log(`solved ${result.counts.solvedFacings} of ${result.counts.facingsByReason.paired} paired transect sides; ${result.counts.strips} strips`);

  const format: LayerFormat = options.seq ? 'sequence' : 'collection';
  const extension = options.seq ? 'geojsons' : 'geojson';
  const files: OutputFile[] = [
    { name: `strips.${extension}`, content: stripsLayer(result, format) },
    { name: `canals.${extension}`, content: linesLayer(result, format) },
    { name: 'ranking.csv', content: rankingTable(result) },
  ];
  if (settings.writeTransects) files.push({ name: `transects.${extension}`, content: transectsLayer(result, format) });
  files.push({
    name: 'report.html',
    content: renderReport(result, {
      version: VERSION,
      commandLine: ['doab', ...argv],
      inputs: [
        { label: 'canals', path: district.canals.path, sha256: district.canals.sha256 },
        { label: 'aquifer', path: district.aquifer.path, sha256: district.aquifer.sha256 },
      ],
      inputWarnings: district.problems.map(formatProblem),
    }),
  });
  const outputs = [...files.map((file) => file.name), 'run.json'];
  files.push({
    name: 'run.json',
    content: runRecord(result, {
      version: VERSION,
      commandLine: ['doab', ...argv],
      canals: district.canals,
      aquifer: district.aquifer,
      config: options.config ?? null,
      inputCrs: config.inputCrs,
      rules: config.rules,
      outputs,
      problems: district.problems,
    }),
  });
  const stale = staleOutputs(options.out, outputs);
  writeAllOrNothing(options.out, files);
  for (const name of stale) rmSync(join(options.out, name), { force: true });
  log(`wrote ${outputs.join(', ')} to ${options.out}${stale.length > 0 ? `; removed ${stale.join(', ')} left by the previous run` : ''}`);
  if (!options.quiet) io.out(summaryText(result, 10, errors.length));
  else io.err(`${CAUTION}\n`);
  return 0;
}
