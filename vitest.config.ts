import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    exclude: ['test/bench/**', 'node_modules/**', 'dist/**'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    maxWorkers: 2,
    // CI also writes a JSON summary, from which .ci/run prints one "N passed, N failed" line
    reporters: process.env.CI ? ['default', ['json', { outputFile: 'test-results.json' }]] : ['default'],
  },
});
