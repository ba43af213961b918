import { defineConfig } from 'vitest/config';

// Each workspace keeps its own vitest config; `npm test` runs them all through this list.
export default defineConfig({
  test: {
    projects: ['shared', 'server', 'server/vitest.alone.config.ts', 'client', 'lint', 'docker-free-scripts/stripe-fake'],
    // Three workers for every project, in one pool, on two cores: the server's files spend most of
    // their time waiting on PostgreSQL, bcrypt and mail, so a third file fills the gaps (vitest's
    // default here would be one worker, the cores less one). Same machine, minutes apart, quiet:
    // the vitest stage took 313 s with two workers and 279 s with three, every test passing.
    maxWorkers: 3,
  },
});
