// The fault and load tests: run by `npm run test:resilience` (scripts/test-resilience.sh), which
// starts PostgreSQL and Redis of their own, since these tests stop and start them.
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    name: 'resilience',
    root: fileURLToPath(new URL('.', import.meta.url)),
    include: ['**/*.test.ts'],
    fileParallelism: false,
    testTimeout: 600_000,
    hookTimeout: 300_000,
  },
});
