import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
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
