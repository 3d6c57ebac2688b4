import { readFileSync } from 'node:fs';
import { DataError } from '../shared/errors.js';

/** A small text file the user named (a config, a run record); a failure names the file. */
export function readTextFile(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new DataError({ file: path }, code === 'ENOENT' ? 'file not found' : `cannot be read (${code ?? String(error)})`);
  }
}
