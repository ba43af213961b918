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
    maxWorkers: 2,
    // Its own group when run beside the other projects, which use vitest's default worker count.
    sequence: { groupOrder: 1 },
  },
});
