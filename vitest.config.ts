import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    // npm run coverage: the unit project under V8 coverage; every module of the server and the
    // client is listed, so a module no test reaches shows as 0 %.
    coverage: {
      provider: 'v8',
      include: ['server/**/*.ts', 'client/src/**/*.{ts,tsx}', 'db/**/*.ts', 'descriptors/**/*.ts'],
      reporter: ['text-summary', 'json-summary'],
      reportsDirectory: 'test-output/coverage',
      reportOnFailure: true,
    },
    projects: [
      {
        test: {
          name: 'unit',
          // One frozen clock for the server, the CLI and the demo (server/clock.ts), so the suite gives
          // the same answer on any day; the demo is built around this clock (server/store/demo/scenario.ts).
          env: { EPOCHWRIGHT_NOW: '2026-12-01T12:00:00Z', EPOCHWRIGHT_CHECK_RESPONSES: '1' },
          include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
          exclude: ['test/e2e/**', 'node_modules/**'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        // Browser tests: the built client served by the real server, in Debian's chromium.
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          globalSetup: ['test/e2e/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
