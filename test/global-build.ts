// Builds dist/ once before the tests, so the child-process smoke tests and the packed-package
// test run the compiled command and library a user gets, and never race to rebuild it.
import { execFileSync } from 'node:child_process';
import { resolve } from 'node:path';

export default function setup(): void {
  execFileSync(process.platform === 'win32' ? 'npx.cmd' : 'npx', ['tsc', '-p', 'tsconfig.build.json'], { cwd: resolve(import.meta.dirname, '..'), stdio: 'inherit' });
}
