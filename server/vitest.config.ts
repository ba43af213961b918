import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    name: 'server',
    include: ['test/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['test/global-setup.ts'],
    // Real bcrypt (cost 12), real PostgreSQL and real SMTP: allow for a slow shared machine.
    testTimeout: 90_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // The same as the root config's, so the server's files share one pool with the other projects'.
    maxWorkers: 2,
  },
});
