import { configDefaults, defineConfig } from 'vitest/config';

/** Files that time a read against their own quiet baseline: each runs in a fresh process (vitest.alone.config.ts). */
export const ALONE = ['test/sign-in-load.test.ts'];

export default defineConfig({
  test: {
    name: 'server',
    include: ['test/**/*.test.ts'],
    exclude: [...configDefaults.exclude, ...ALONE],
    environment: 'node',
    globalSetup: ['test/global-setup.ts'],
    // Real bcrypt (cost 12), real PostgreSQL and real SMTP: allow for a slow shared machine.
    testTimeout: 90_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // One module graph per worker instead of per file: a file no longer imports the whole server
    // again (express, sequelize, pg-boss, the PDF renderer, every route) before its first test. The
    // 33 files' imports took 820 s of worker time isolated and 90 s shared (same machine, same time).
    // Each file's startTestServer binds the models to its own connection, and its close() stops what
    // it started (mail queue, password threads, PDF thread, pool) and lets the models go; no file
    // mocks modules or changes the environment. The files pass in shuffled file orders.
    // sign-in-load's burst test (a signed-in read within 1 s while 60 sign-ins queue) failed 3 times
    // in 5 after other files in the same process at load 10–16, and never alone: it runs in the
    // `server-alone` project, isolated.
    isolate: false,
    // The same as the root config's, so the server's files share one pool with the other projects'.
    maxWorkers: 3,
  },
});
