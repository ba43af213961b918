import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    name: 'shared',
    include: ['test/**/*.test.ts'],
    environment: 'node',
    // Property tests run hundreds of cases; on a busy shared machine 5 s is too tight a default.
    testTimeout: 30_000,
  },
});
