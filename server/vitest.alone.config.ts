import { defineConfig } from 'vitest/config';
import shared, { ALONE } from './vitest.config.js';

// The API files that time a read against their own quiet baseline, each in a fresh process (the
// other API files share one per worker; see vitest.config.ts). Same set-up and limits otherwise.
export default defineConfig({
  test: {
    ...shared.test,
    name: 'server-alone',
    include: ALONE,
    exclude: [],
    isolate: true,
  },
});
