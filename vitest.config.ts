import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    globalSetup: ['tests/setup/global.ts'],
    // Each test file gets its own worker; SQLite and worker threads are per file.
    pool: 'forks',
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
