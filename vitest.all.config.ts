import { defineConfig } from 'vitest/config'

// Every tier in one run (scripts/test.sh): unit tests need nothing; integration and
// browser tests share one built server started by the global setup.
export default defineConfig({
  test: {
    projects: [
      { extends: './vitest.config.ts', test: { name: 'unit' } },
      {
        test: {
          name: 'server',
          include: ['tests/integration/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/server.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          // one built server and one database for all files: keep files in sequence
          fileParallelism: false,
        },
      },
    ],
  },
})
