// The output folder of a run: check it can be one before any work, write every file or none, and
// remove the layers an earlier run left there that this run does not write (only names that the
// earlier run.json lists as doab's own: doab deletes nothing it did not write).
import { existsSync, readFileSync, rmSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { UsageError } from '../shared/errors.js';
import { writeAllOrNothing, type OutputFile } from './atomic-write.js';

/** Every name a screening run may write into its folder. */
export const RUN_OUTPUT_NAMES: ReadonlySet<string> = new Set(
  ['strips', 'canals', 'transects'].flatMap((layer) => [`${layer}.geojson`, `${layer}.geojsons`]).concat(['ranking.csv', 'report.html', 'run.json']),
);

/** Fails before any work when the folder cannot become one: it, or the nearest existing path above it, is a file. */
export function checkOutputFolder(outDir: string): void {
  let path = resolve(outDir);
  while (!existsSync(path) && dirname(path) !== path) path = dirname(path);
  if (existsSync(path) && !statSync(path).isDirectory()) {
    throw new UsageError(`--out ${outDir}: ${path === resolve(outDir) ? 'is a file' : `${path} is a file`}, not a folder: name a folder for the outputs`, 'out');
  }
}

/** Outputs of an earlier run in the folder that this run does not write (a transects layer from a run with --transects, say). */
export function staleOutputs(outDir: string, names: readonly string[]): string[] {
  let previous: unknown;
  try {
    previous = JSON.parse(readFileSync(join(outDir, 'run.json'), 'utf8'));
  } catch {
    return [];
  }
  const record = previous as { tool?: unknown; outputs?: unknown };
  if (record.tool !== 'doab' || !Array.isArray(record.outputs)) return [];
  return record.outputs.filter((name): name is string => typeof name === 'string' && RUN_OUTPUT_NAMES.has(name) && !names.includes(name));
}

/** Writes a run's files (all or none), then removes what the earlier run left; returns the removed names. */
export function writeRunFolder(outDir: string, files: OutputFile[]): { written: string[]; removed: string[] } {
  const names = files.map((file) => file.name);
  const removed = staleOutputs(outDir, names);
  writeAllOrNothing(outDir, files);
  for (const name of removed) rmSync(join(outDir, name), { force: true });
  return { written: names, removed };
}
