import { availableParallelism } from 'node:os';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    globalSetup: ['test/global-build.ts'],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    // vitest leaves one core free by default, which is one worker on a 2-core machine; the tests
    // wait on child processes and files often enough that a worker per core is faster (97 s against 162 s measured)
    maxWorkers: Math.max(2, availableParallelism()),
  },
});
