import { availableParallelism } from 'node:os';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    globalSetup: ['tests/setup/global.ts'],
    // Each test file gets its own worker; SQLite and worker threads are per file.
    pool: 'forks',
    // Vitest's default leaves one core free: on a 2-core machine that ran every file one after
    // another (106 s); two at once took 78 s, three 91 s (measured 2026-12-02, quiet machine).
    maxWorkers: Math.max(2, availableParallelism() - 1),
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
