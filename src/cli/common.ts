import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { DataError } from '../io/data-error.js';

const require = createRequire(import.meta.url);
// src/cli and dist/cli both sit two folders below package.json
export const VERSION: string = (require('../../package.json') as { version: string }).version;

/** A command line that cannot run as given (exit code 2). */
export class UsageError extends Error {}

export function readJsonFile(path: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    throw new DataError({ file: path }, `cannot be read (${(error as NodeJS.ErrnoException).code ?? String(error)})`);
  }
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new DataError({ file: path }, `not valid JSON (${(error as Error).message})`);
  }
}
