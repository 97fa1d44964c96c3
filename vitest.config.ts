import { defineConfig } from 'vitest/config';

// Server, shared and cross-layer suites. The Angular component tests run
// through `ng test` (angular.json), which has its own Vitest set-up.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['shared/**/*.spec.ts', 'server/**/*.spec.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          name: 'reference',
          include: ['test/reference/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120_000,
        },
      },
      {
        test: {
          name: 'api',
          include: ['test/api/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['test/helpers/database.global.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['test/helpers/database.global.ts'],
          testTimeout: 180_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
