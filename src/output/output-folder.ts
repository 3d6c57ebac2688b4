// The output folder of a run: check before any work that the run can write there without replacing
// anything it did not write (an input above all), write every file or none, and remove the layers an
// earlier run left there that this run does not write (only regular files that the earlier run.json
// lists as doab's own: doab deletes nothing it did not write).
import { existsSync, lstatSync, readFileSync, realpathSync, rmSync, statSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { UsageError } from '../shared/errors.js';
import { writeAllOrNothing, type OutputFile } from './atomic-write.js';
import type { LayerFormat } from './layers.js';
import { RASTER_NAMES } from './rasters.js';

/** Every name a screening run may write into its folder. */
export const RUN_OUTPUT_NAMES: ReadonlySet<string> = new Set(
  ['strips', 'canals', 'transects', 'wells']
    .flatMap((layer) => [`${layer}.geojson`, `${layer}.geojsons`])
    .concat(['ranking.csv', 'lines.csv', 'wells.csv', 'spread-strips.csv', 'spread-lines.csv', 'strips.sld', 'lines.sld', 'doab.gpkg', 'report.html', 'run.json', ...Object.values(RASTER_NAMES)]),
);

/** The real path of a path that may not exist yet: its nearest existing ancestor resolved, links followed. */
export function realPathOf(path: string): string {
  let existing = resolve(path);
  const rest: string[] = [];
  while (!existsSync(existing) && dirname(existing) !== existing) {
    rest.unshift(basename(existing));
    existing = dirname(existing);
  }
  let real = existing;
  try {
    real = realpathSync(existing);
  } catch {
    // a dangling link or no permission: compare as given
  }
  return join(real, ...rest);
}

/** The names an earlier doab run.json in the folder lists as its outputs, or none. */
function earlierOutputs(outDir: string): string[] {
  const recordPath = join(outDir, 'run.json');
  let previous: unknown;
  try {
    if (!lstatSync(recordPath).isFile()) return [];
    previous = JSON.parse(readFileSync(recordPath, 'utf8'));
  } catch {
    return [];
  }
  const record = previous as { tool?: unknown; outputs?: unknown };
  if (record.tool !== 'doab' || !Array.isArray(record.outputs)) return [];
  return record.outputs.filter((name): name is string => typeof name === 'string' && RUN_OUTPUT_NAMES.has(name));
}

function kindOf(path: string): string | null {
  try {
    const stats = lstatSync(path);
    if (stats.isFile()) return 'file';
    if (stats.isDirectory()) return 'a folder';
    if (stats.isSymbolicLink()) return 'a link';
    return 'not a regular file';
  } catch {
    return null;
  }
}

/** The names a run with these settings writes: the layers in their format, the tables, the rasters when the district solve runs, the report and the record. */
/** The run's GeoPackage: every layer, the ranking, the run record and the styles in one file. */
export const GEOPACKAGE_NAME = 'doab.gpkg';

export function runOutputNames(settings: { writeTransects: boolean; stripsOnly: boolean }, format: LayerFormat, withWells = false, withSpread = false): Set<string> {
  const extension = format === 'sequence' ? 'geojsons' : 'geojson';
  const layers = ['strips', 'canals', ...(settings.writeTransects ? ['transects'] : []), ...(withWells ? ['wells'] : [])].map((layer) => `${layer}.${extension}`);
  const rasters = settings.stripsOnly ? [] : Object.values(RASTER_NAMES);
  return new Set([...layers, 'strips.sld', 'lines.sld', GEOPACKAGE_NAME, 'ranking.csv', 'lines.csv', ...(withWells ? ['wells.csv'] : []), ...(withSpread ? ['spread-strips.csv', 'spread-lines.csv'] : []), ...rasters, 'report.html', 'run.json']);
}

/**
 * Fails before any work when the run cannot write its outputs into the folder: the folder (or the
 * nearest existing path above it) is a file; a name the run may write is taken by a folder, a link
 * or a file that no earlier doab run in this folder wrote; or a name would replace one of `inputs`
 * (real paths compared, links followed). `option` names the option the folder came from.
 */
export function checkOutputFolder(
  outDir: string,
  inputs: readonly string[] = [],
  names: ReadonlySet<string> = RUN_OUTPUT_NAMES,
  option = '--out',
  /** Names whose existing regular files doab may replace without a run record (its own profile files). */
  replaceable: ReadonlySet<string> = new Set(),
): void {
  if (outDir.trim() === '') throw new UsageError(`${option} is empty: name a folder for the outputs`, 'out');
  let path = resolve(outDir);
  while (!existsSync(path) && dirname(path) !== path) path = dirname(path);
  if (existsSync(path) && !statSync(path).isDirectory()) {
    throw new UsageError(`${option} ${outDir}: ${path === resolve(outDir) ? 'is a file' : `${path} is a file`}, not a folder: name a folder for the outputs`, 'out');
  }
  const realInputs = new Map(inputs.map((input) => [realPathOf(input), input]));
  const ours = new Set(earlierOutputs(outDir));
  for (const name of names) {
    const target = join(outDir, name);
    const input = realInputs.get(realPathOf(target));
    if (input !== undefined) throw new UsageError(`${option} ${outDir}: the output ${name} would replace your input ${input}; choose another folder for the outputs`, 'out');
    const kind = kindOf(target);
    if (kind === null) continue;
    if (kind !== 'file') throw new UsageError(`${option} ${outDir}: ${name} there is ${kind}, where doab writes a file; move it or choose another folder`, 'out');
    if (!ours.has(name) && !replaceable.has(name)) throw new UsageError(`${option} ${outDir}: ${name} there was not written by doab (no doab run.json there lists it); doab replaces only its own outputs: move it or choose another folder`, 'out');
  }
}

/** Outputs of an earlier run in the folder that this run does not write (a transects layer from a run with --transects, say). */
export function staleOutputs(outDir: string, names: readonly string[]): string[] {
  return earlierOutputs(outDir).filter((name) => !names.includes(name) && kindOf(join(outDir, name)) === 'file');
}

/** Writes a run's files (all or none), then removes what the earlier run left; returns the removed names. */
export async function writeRunFolder(outDir: string, files: OutputFile[]): Promise<{ written: string[]; removed: string[] }> {
  const names = files.map((file) => file.name);
  const removed = staleOutputs(outDir, names);
  await writeAllOrNothing(outDir, files, RUN_OUTPUT_NAMES);
  for (const name of removed) rmSync(join(outDir, name), { force: true });
  return { written: names, removed };
}
