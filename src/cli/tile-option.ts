// --tile I/N, or --tile N with the index from the array job's variable of a batch engine.
import { MAX_TILES, UsageError, type TileOfSplit } from '../index.js';

/** The array-job variables doab reads, in the order it looks: each counts from 0. */
export const ARRAY_INDEX_VARIABLES = ['JOB_COMPLETION_INDEX', 'SLURM_ARRAY_TASK_ID', 'AWS_BATCH_JOB_ARRAY_INDEX'] as const;

const WHOLE = /^\d{1,9}$/;

/** The tile a --tile value names, and where its index came from (for the log). */
export function parseTileOption(text: string, env: Record<string, string | undefined> = process.env): { tile: TileOfSplit; from: string } {
  const given = text.trim();
  const explicit = /^(\d{1,9})\/(\d{1,9})$/.exec(given);
  let index: number, count: number, from: string;
  if (explicit) {
    index = Number(explicit[1]);
    count = Number(explicit[2]);
    from = '--tile';
  } else if (WHOLE.test(given)) {
    count = Number(given);
    const variable = ARRAY_INDEX_VARIABLES.find((name) => env[name] !== undefined && env[name] !== '');
    if (variable === undefined) {
      throw new UsageError(`--tile ${given} gives the number of tiles only, and none of ${ARRAY_INDEX_VARIABLES.join(', ')} is set to say which tile this is: give --tile I/${given}`, 'tile');
    }
    const value = (env[variable] as string).trim();
    if (!WHOLE.test(value)) throw new UsageError(`${variable}=${JSON.stringify(env[variable])} is not a whole number (the array job's index, counted from 0)`, 'tile');
    index = Number(value) + 1;
    from = `${variable}=${value} (counted from 0)`;
    if (index > count) throw new UsageError(`${variable}=${value} is past the last of ${count} tiles: the array's indices must run from 0 to ${count - 1}`, 'tile');
  } else {
    throw new UsageError(`--tile must be I/N (tile I of N, counted from 1) or N (the index from the array job's variable), found ${JSON.stringify(text)}`, 'tile');
  }
  if (!(count >= 1 && count <= MAX_TILES)) throw new UsageError(`--tile: the number of tiles must be from 1 to ${MAX_TILES}, found ${count}`, 'tile');
  if (!(index >= 1 && index <= count)) throw new UsageError(`--tile ${given}: the tile must be from 1 to ${count} (counted from 1), found ${index}`, 'tile');
  return { tile: { index, count }, from };
}
