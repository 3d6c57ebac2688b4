// Writes a set of output files so that a failed run leaves none of them half-written: every file
// goes to a temporary name in the output folder first, and all are renamed only when all are written.
import { mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

export interface OutputFile {
  name: string;
  content: string;
}

export function writeAllOrNothing(outDir: string, files: OutputFile[]): string[] {
  mkdirSync(outDir, { recursive: true });
  const written: string[] = [];
  try {
    for (const file of files) {
      const temporary = join(outDir, `.${file.name}.${process.pid}.tmp`);
      writeFileSync(temporary, file.content, { flag: 'wx' });
      written.push(temporary);
    }
  } catch (error) {
    for (const temporary of written) rmSync(temporary, { force: true });
    throw error;
  }
  return files.map((file, i) => {
    const target = join(outDir, file.name);
    renameSync(written[i], target);
    return target;
  });
}
