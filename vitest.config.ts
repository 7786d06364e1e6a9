import { defineConfig } from 'vitest/config';

// One vitest run over every workspace's unit and integration tests (Playwright runs separately).
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'shared', root: 'packages/shared', include: ['src/**/*.test.ts'] } },
      { test: { name: 'fe-core', root: 'packages/fe-core', include: ['src/**/*.test.ts'], testTimeout: 120_000 } },
      {
        test: {
          name: 'api',
          root: 'apps/api',
          include: ['src/**/*.test.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      { test: { name: 'web', root: 'apps/web', include: ['src/**/*.test.ts'] } },
      { test: { name: 'worker', root: 'apps/worker', include: ['src/**/*.test.ts'], testTimeout: 60_000 } },
      {
        test: {
          name: 'integration',
          root: 'tests',
          include: ['integration/**/*.test.ts'],
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
