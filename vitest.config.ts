import { defineConfig } from 'vitest/config';

// Each workspace keeps its own vitest config; `npm test` runs them all through this list.
export default defineConfig({
  test: {
    projects: ['shared', 'server', 'server/vitest.alone.config.ts', 'client', 'lint', 'docker-free-scripts/stripe-fake'],
    // Two workers for every project, in one pool: the server's files spend most of their time
    // waiting on PostgreSQL, bcrypt and mail, so the client's and shared's files fill the gaps
    // (vitest's default here would be one worker, the cores less one).
    maxWorkers: 2,
  },
});
