// A tile's file: its solved transects in doab's column container (shared/column-file.ts), with the
// run's options and inputs beside them, so that gathering can check that every tile ran the same
// screening and rerun it from the same inputs. Written all or nothing, as every output is.
import { closeSync, lstatSync, openSync, readSync } from 'node:fs';
import { join } from 'node:path';
import { COLUMN_FILE_MAGIC_BYTES, encodeColumnFile, isColumnFile } from '../shared/column-file.js';
import { UsageError } from '../shared/errors.js';
import { tileFileName, tilePartColumns, type TileFileMeta, type TilePart, type TileRunMeta } from '../screening/tiles.js';
import type { TileOfSplit } from '../geometry/tiles.js';
import { writeAllOrNothing } from './atomic-write.js';
import { realPathOf } from './output-folder.js';

/** Fails before any work when the tile's file cannot go into the folder: an input there, or a file of that name doab did not write. */
export function checkTileFolder(outDir: string, tile: TileOfSplit, inputs: readonly string[]): void {
  const name = tileFileName(tile);
  const target = join(outDir, name);
  const real = realPathOf(target);
  const input = inputs.find((path) => realPathOf(path) === real);
  if (input !== undefined) throw new UsageError(`--out ${outDir}: the tile file ${name} would replace your input ${input}; choose another folder`, 'out');
  let stats;
  try {
    stats = lstatSync(target);
  } catch {
    return;
  }
  if (!stats.isFile()) throw new UsageError(`--out ${outDir}: ${name} there is not a regular file; move it or choose another folder`, 'out');
  // a rerun of the tile replaces its own earlier file, and nothing else
  const start = new Uint8Array(COLUMN_FILE_MAGIC_BYTES);
  const fd = openSync(target, 'r');
  try {
    readSync(fd, start, 0, start.length, 0);
  } finally {
    closeSync(fd);
  }
  if (!isColumnFile(start)) throw new UsageError(`--out ${outDir}: ${name} there was not written by doab; doab replaces only its own tile files: move it or choose another folder`, 'out');
}

/** Writes the tile's file into the folder (all or nothing); returns its path. */
export async function writeTileFile(outDir: string, part: TilePart, run: TileRunMeta): Promise<string> {
  const { meta, columns } = tilePartColumns(part);
  const name = tileFileName(part.tile);
  const [path] = await writeAllOrNothing(outDir, [{ name, content: encodeColumnFile({ ...run, ...meta } satisfies TileFileMeta, columns) }]);
  return path;
}
