// Runs the doab CLI the way a user does: as a child process of the built command (bin/doab.js,
// compiled by test/global-build.ts), or main() in this process for the many small cases.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { main } from '../../src/cli/main.js';

export const ROOT = resolve(import.meta.dirname, '../..');
const ENTRY = join(ROOT, 'bin/doab.js');

export interface CliRun {
  status: number | null;
  stdout: string;
  stderr: string;
}

export function runCli(args: string[]): CliRun {
  const run = spawnSync(process.execPath, [ENTRY, ...args], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

/** The CLI's main() in this process, with its output captured: the same code path as bin/doab.js, without starting Node. */
export async function runCliInProcess(args: string[]): Promise<CliRun> {
  let stdout = '', stderr = '';
  const status = await main(args, { out: (text) => (stdout += text), err: (text) => (stderr += text) });
  return { status, stdout, stderr };
}

export function freshDir(prefix: string): string {
  return mkdtempSync(join(tmpdir(), `doab-${prefix}-`));
}

export function readJson(path: string): any {
  return JSON.parse(readFileSync(path, 'utf8'));
}

/** Minimal CSV reader for doab's own table (quoted cells allowed, no embedded newlines). */
export function readCsv(path: string): Record<string, string>[] {
  const lines = readFileSync(path, 'utf8').trimEnd().split('\n');
  const split = (line: string) => {
    const cells: string[] = [];
    let cell = '', quoted = false;
    for (let i = 0; i < line.length; i++) {
      const ch = line[i];
      if (quoted) {
        if (ch === '"' && line[i + 1] === '"') { cell += '"'; i++; }
        else if (ch === '"') quoted = false;
        else cell += ch;
      } else if (ch === '"') quoted = true;
      else if (ch === ',') { cells.push(cell); cell = ''; }
      else cell += ch;
    }
    cells.push(cell);
    return cells;
  };
  const header = split(lines[0]);
  return lines.slice(1).map((line) => Object.fromEntries(split(line).map((cell, i) => [header[i], cell])));
}

/** SHA-256 of every file under a folder, by relative path: to show that doab leaves its inputs alone. */
export function hashTree(dir: string): Record<string, string> {
  const found: Record<string, string> = {};
  const walk = (path: string) => {
    if (statSync(path).isDirectory()) for (const name of readdirSync(path)) walk(join(path, name));
    else found[relative(dir, path)] = createHash('sha256').update(readFileSync(path)).digest('hex');
  };
  walk(dir);
  return found;
}
