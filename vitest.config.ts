import { defineConfig } from 'vitest/config';

// Two projects: `unit` (statistics, reference checks: no PostgreSQL, no stand-ins) and `api` (supertest against
// the test PostgreSQL with the local stand-ins, started once by the global setup). Browser specs (tests/e2e) are
// run by tests/e2e/run.ts, never by vitest.
export default defineConfig({
  test: {
    exclude: ['tests/e2e/**', 'node_modules/**'],
    pool: 'forks',
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts', 'tests/reference/**/*.test.ts'],
          testTimeout: 30_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          // one database and one set of stand-ins: files take turns
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
    ],
  },
});
