import { randomBytes } from 'node:crypto';
import PgBoss from 'pg-boss';
import type { TestProject } from 'vitest/node';
import { createSequelize } from '../src/db/sequelize.js';
import { migrateUp } from '../src/db/migrator.js';

declare module 'vitest' {
  export interface ProvidedContext {
    databaseUrl: string;
  }
}

const adminUrl = process.env.TEST_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54339/postgres';

/** One fresh database per run, migrated the same way production is; dropped afterwards. */
export default async function setup(project: TestProject) {
  const name = `ws_api_${randomBytes(5).toString('hex')}`;
  const admin = createSequelize(adminUrl, undefined, 1);
  await admin.query(`CREATE DATABASE ${name}`);
  await admin.close();

  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  const databaseUrl = url.toString();

  const sequelize = createSequelize(databaseUrl, undefined, 2);
  await migrateUp(sequelize);
  await sequelize.close();
  // Create the queue's schema once, so parallel test files do not race to install it.
  const boss = new PgBoss({ connectionString: databaseUrl, schema: 'pgboss', max: 1 });
  await boss.start();
  await boss.createQueue('mail-send');
  await boss.stop({ graceful: false, wait: true });

  project.provide('databaseUrl', databaseUrl);

  return async () => {
    const c = createSequelize(adminUrl, undefined, 1);
    await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    await c.close();
  };
}
