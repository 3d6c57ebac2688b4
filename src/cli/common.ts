import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { DataError } from '../io/data-error.js';

const require = createRequire(import.meta.url);
// src/cli and dist/cli both sit two folders below package.json
export const VERSION: string = (require('../../package.json') as { version: string }).version;

/** A command line that cannot run as given (exit code 2). */
export class UsageError extends Error {}

export function readTextFile(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new DataError({ file: path }, code === 'ENOENT' ? 'file not found' : `cannot be read (${code ?? String(error)})`);
  }
}
