import { defineConfig } from 'vitest/config';

// A JSON summary of the run goes to ORTHODROME_TEST_REPORT when set (.ci/run sets it and prints
// one "N passed, N failed, N skipped" line from it), or to test-results.json when CI is set.
const jsonReport = process.env.ORTHODROME_TEST_REPORT || (process.env.CI ? 'test-results.json' : '');

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    exclude: ['test/bench/**', 'node_modules/**', 'dist/**'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    maxWorkers: 2,
    reporters: jsonReport ? ['default', ['json', { outputFile: jsonReport }]] : ['default'],
  },
});
