import { defineConfig } from 'vitest/config';

// Each workspace keeps its own vitest config; `npm test` runs them all through this list.
export default defineConfig({
  test: {
    projects: ['shared', 'server', 'client', 'lint', 'docker-free-scripts/stripe-fake'],
  },
});
