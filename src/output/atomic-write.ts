// Writes a set of output files so that a failed run leaves none of them half-written: every file
// goes to a temporary name in the output folder first, and all are renamed only when all are written.
import { closeSync, mkdirSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { DataError } from '../shared/errors.js';

export interface OutputFile {
  name: string;
  /** The text, or its pieces in order: a layer of a large district is written piece by piece, never held whole. */
  content: string | Iterable<string>;
}

export function writeAllOrNothing(outDir: string, files: OutputFile[]): string[] {
  try {
    mkdirSync(outDir, { recursive: true });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOTDIR' || code === 'EEXIST' ? 'a file stands where a folder is needed' : code === 'EACCES' || code === 'EPERM' ? 'no permission' : String(code ?? error);
    throw new DataError({ file: outDir }, `cannot create the output folder (${why})`);
  }
  const written: string[] = [];
  try {
    for (const file of files) {
      const temporary = join(outDir, `.${file.name}.${process.pid}.tmp`);
      const fd = openSync(temporary, 'wx');
      written.push(temporary);
      try {
        if (typeof file.content === 'string') writeSync(fd, file.content);
        else for (const piece of file.content) writeSync(fd, piece);
      } finally {
        closeSync(fd);
      }
    }
  } catch (error) {
    for (const temporary of written) rmSync(temporary, { force: true });
    const code = (error as NodeJS.ErrnoException).code;
    if (typeof code === 'string') throw new DataError({ file: outDir }, `cannot write the outputs (${code}); nothing was written`);
    throw error;
  }
  return files.map((file, i) => {
    const target = join(outDir, file.name);
    renameSync(written[i], target);
    return target;
  });
}
