import { defineConfig } from 'vitest/config';

// `npm run probe -w server`: the long reliability probes, kept out of `npm test`.
export default defineConfig({
  test: {
    name: 'server-probe',
    include: ['probe/**/*.probe.ts'],
    environment: 'node',
    globalSetup: ['test/global-setup.ts'],
    testTimeout: 3_600_000,
    hookTimeout: 120_000,
    pool: 'forks',
    maxWorkers: 1,
  },
});
