// Builds dist/ once before the tests, so the child-process smoke tests and the packed-package
// test run the compiled command and library a user gets, and never race to rebuild it.
import { execFileSync } from 'node:child_process';
import { resolve } from 'node:path';

export default function setup(): void {
  // for a quick run of in-process tests while dist/ is known to be current
  if (process.env.DOAB_SKIP_BUILD === '1') return;
  execFileSync(process.platform === 'win32' ? 'npx.cmd' : 'npx', ['tsc', '-p', 'tsconfig.build.json'], { cwd: resolve(import.meta.dirname, '..'), stdio: 'inherit' });
}
