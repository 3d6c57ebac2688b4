// Reads the tile files of an array job from their folder for gathering: every tile of the split
// must be there, whole, and from the same run (options and inputs); a missing, damaged or foreign
// tile stops the gathering with the tile named, and rerunning that one tile is enough.
import { closeSync, fstatSync, openSync, readdirSync, readSync } from 'node:fs';
import { join } from 'node:path';
import { decodeColumnFile } from '../shared/column-file.js';
import { DataError, UsageError } from '../shared/errors.js';
import { MAX_TILES } from '../geometry/tiles.js';
import { TILE_FILE_PATTERN, tileFileName, tilePartFromColumns, type TileFileMeta, type TilePart, type TileRunMeta } from '../screening/tiles.js';

/** A tile file may hold at most this much (a tile's columns take about 300 bytes a station). */
export const MAX_TILE_FILE_MB = 2047;

export interface GatheredTiles {
  parts: TilePart[];
  /** The run the tiles share (tile 1's record: all tiles agree). */
  run: TileRunMeta;
  paths: string[];
}

function readWhole(path: string, label: string): ArrayBuffer {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    throw new DataError({ file: path }, `cannot read ${label} (${(error as NodeJS.ErrnoException).code ?? error})`);
  }
  try {
    const size = fstatSync(fd).size;
    // checked before allocating: the size says how much to hold
    if (size > MAX_TILE_FILE_MB * 1024 * 1024) throw new DataError({ file: path }, `${label} is ${Math.round(size / 1048576)} MB, more than the ${MAX_TILE_FILE_MB} MB a tile file may hold`);
    const buffer = new ArrayBuffer(size);
    const bytes = new Uint8Array(buffer);
    let done = 0;
    while (done < size) {
      const read = readSync(fd, bytes, done, size - done, done);
      if (read <= 0) throw new DataError({ file: path }, `${label} ended after ${done} of ${size} bytes while being read`);
      done += read;
    }
    return buffer;
  } finally {
    closeSync(fd);
  }
}

/**
 * The tiles in `dir`, in tile order. The split's size comes from the files' names; every tile from
 * 1 to N must be there, and all must share tile 1's run key.
 */
export function readTileFolder(dir: string): GatheredTiles {
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch (error) {
    throw new UsageError(`--tiles ${dir}: cannot read the folder (${(error as NodeJS.ErrnoException).code ?? error})`, 'tiles');
  }
  const found = names.flatMap((name) => {
    const match = TILE_FILE_PATTERN.exec(name);
    return match ? [{ name, index: Number(match[1]), count: Number(match[2]) }] : [];
  });
  if (found.length === 0) throw new UsageError(`--tiles ${dir}: no tile files there (tile-I-of-N.doabtile, written by doab screen --tile I/N)`, 'tiles');
  const counts = [...new Set(found.map((tile) => tile.count))].sort((a, b) => a - b);
  if (counts.length > 1) {
    throw new UsageError(`--tiles ${dir}: tiles of different splits are there (into ${counts.join(', ')}); keep one split's tiles in a folder`, 'tiles');
  }
  const count = counts[0];
  if (!(count >= 1 && count <= MAX_TILES)) throw new UsageError(`--tiles ${dir}: a split into ${count} tiles (at most ${MAX_TILES})`, 'tiles');
  const present = new Set(found.map((tile) => tile.index));
  const missing: number[] = [];
  for (let index = 1; index <= count; index++) if (!present.has(index)) missing.push(index);
  if (missing.length > 0) {
    const shown = missing.slice(0, 10).map((index) => `${index} (${tileFileName({ index, count })})`).join(', ');
    throw new DataError(
      { file: dir },
      `tile${missing.length === 1 ? '' : 's'} ${shown}${missing.length > 10 ? ` and ${missing.length - 10} more` : ''} of ${count} ${missing.length === 1 ? 'is' : 'are'} missing: ` +
        `${missing.length === 1 ? 'it failed, did not run or is still running' : 'they failed, did not run or are still running'}; rerun ${missing.length === 1 ? 'it' : 'each'} with --tile ${missing[0]}/${count}${missing.length === 1 ? '' : ' and so on'}, then gather again`,
    );
  }
  const parts: TilePart[] = [];
  const paths: string[] = [];
  let run: TileRunMeta | null = null;
  for (let index = 1; index <= count; index++) {
    const path = join(dir, tileFileName({ index, count }));
    const label = `tile ${index} of ${count}`;
    let meta: TileFileMeta;
    let part: TilePart;
    try {
      const decoded = decodeColumnFile(readWhole(path, label));
      meta = decoded.meta as TileFileMeta;
      if (!meta || meta.tool !== 'doab' || typeof meta.runKey !== 'string' || !meta.options || typeof meta.cwd !== 'string') throw new Error('its header is not a doab tile\'s');
      part = tilePartFromColumns(meta, decoded.columns);
      if (part.tile.index !== index || part.tile.count !== count) throw new Error(`it holds tile ${part.tile.index} of ${part.tile.count}, not the one its name says`);
    } catch (error) {
      if (error instanceof DataError) throw error;
      throw new DataError({ file: path }, `${label} cannot be used: ${(error as Error).message}; rerun it with --tile ${index}/${count}, then gather again`);
    }
    if (run === null) run = { tool: meta.tool, version: meta.version, options: meta.options, cwd: meta.cwd, inputs: meta.inputs, runKey: meta.runKey };
    else if (meta.runKey !== run.runKey) {
      throw new DataError({ file: path }, `${label} was screened with other inputs or options than tile 1 (run key ${meta.runKey.slice(0, 12)}, tile 1 ${run.runKey.slice(0, 12)}); rerun it with tile 1's command and --tile ${index}/${count}`);
    }
    parts.push(part);
    paths.push(path);
  }
  return { parts, run: run!, paths };
}
