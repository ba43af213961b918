import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    name: 'lint',
    include: ['**/*.test.ts'],
    exclude: ['fixtures/**', '**/node_modules/**'],
    environment: 'node',
    // ESLint loads the TypeScript parser and resolves imports: allow for a busy shared machine.
    testTimeout: 60_000,
  },
});
