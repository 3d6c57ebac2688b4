import { availableParallelism } from 'node:os';
import { defineConfig } from 'vitest/config';

// Test files that replace a module of doab's with vi.mock: they need a module registry of their own.
const MOCKING = ['test/screening/safety.test.ts'];

export default defineConfig({
  test: {
    globalSetup: ['test/global-build.ts'],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    // vitest leaves one core free by default, which is one worker on a 2-core machine; the tests
    // wait on child processes and files often enough that a worker per core is faster (97 s against 162 s measured)
    maxWorkers: Math.max(2, availableParallelism()),
    projects: [
      // the files of a worker share its loaded modules instead of importing doab afresh for each
      // file (measured on this 2-core machine: the suite in 146 s instead of 188 s)
      { extends: true, test: { name: 'shared', include: ['test/**/*.test.ts'], exclude: MOCKING, isolate: false } },
      { extends: true, test: { name: 'isolated', include: MOCKING } },
    ],
  },
});
