// `doab gather`: the tiles of an array job (doab screen --tile I/N) into the outputs of one run.
// It reads every tile's file, checks they are all there and from one run, reads the inputs they
// were screened from (checking each is unchanged), and runs the rest of the screening, with the
// tiles' solved transects in place of solving them, into --out.
import { isAbsolute, resolve } from 'node:path';
import { readTileFolder } from '../index.js';
import type { CliIo } from './io.js';
import type { ProgressListener } from '../index.js';
import { screenCommand, type ScreenOptions } from './screen-command.js';

export interface GatherOptions {
  tiles: string;
  out: string;
  quiet?: boolean;
  debug?: boolean;
  workers?: number;
  toPostgis?: string;
  pgSchema?: string;
  pgIfExists?: string;
}

const PATH_OPTIONS = ['canals', 'aquifer', 'config', 'wells', 'dem'] as const;

/** A path the tile recorded as typed: as typed when it names the same file from here, else from the tile's folder. */
function fromTileFolder(path: string, tileCwd: string): string {
  if (isAbsolute(path)) return path;
  const there = resolve(tileCwd, path);
  return there === resolve(path) ? path : there;
}

export async function gatherCommand(options: GatherOptions, argv: string[], io: CliIo, onProgress?: ProgressListener): Promise<number> {
  const tiles = readTileFolder(options.tiles);
  const recorded = { ...tiles.run.options } as Record<string, unknown>;
  for (const key of PATH_OPTIONS) if (typeof recorded[key] === 'string') recorded[key] = fromTileFolder(recorded[key] as string, tiles.run.cwd);
  const screenOptions: ScreenOptions = {
    ...(recorded as Partial<ScreenOptions>),
    canals: recorded.canals as string,
    aquifer: recorded.aquifer as string,
    out: options.out,
    quiet: options.quiet,
    debug: options.debug,
    ...(options.workers !== undefined ? { workers: options.workers } : {}),
    toPostgis: options.toPostgis,
    pgSchema: options.pgSchema,
    pgIfExists: options.pgIfExists,
  };
  return screenCommand(screenOptions, argv, io, onProgress, { tiles, dir: options.tiles });
}
