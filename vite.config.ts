// Vitest root: one project per workspace plus the cross-workspace tests.
// The web app's own build configuration lives in apps/web/vite.config.ts.
import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    projects: [
      {
        test: { name: 'stats', root: './packages/stats', include: ['src/**/*.test.ts', 'test/**/*.test.ts'] },
      },
      { test: { name: 'contracts', root: './packages/contracts', include: ['src/**/*.test.ts'] } },
      { test: { name: 'db', root: './packages/db', include: ['src/**/*.test.ts'], fileParallelism: false } },
      {
        test: {
          name: 'api',
          root: './apps/api',
          include: ['src/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        test: {
          name: 'worker',
          root: './apps/worker',
          include: ['src/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 30000,
        },
      },
      './apps/web/vite.config.ts',
      {
        test: {
          name: 'e2e',
          root: './tests',
          include: ['e2e/**/*.e2e.test.ts'],
          fileParallelism: false,
          testTimeout: 120000,
          hookTimeout: 120000,
        },
      },
      {
        test: {
          name: 'integration',
          root: './tests',
          include: ['integration/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 60000,
          hookTimeout: 120000,
        },
      },
    ],
  },
});
