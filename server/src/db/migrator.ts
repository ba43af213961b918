import path from 'node:path';
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import { repoRoot } from '../config/config.js';

export const migrationsDir = path.join(repoRoot, 'db', 'migrations');

type MigrationModule = {
  up: (p: { context: QueryInterface }) => Promise<void>;
  down?: (p: { context: QueryInterface }) => Promise<void>;
};

export function createMigrator(sequelize: Sequelize, log: (msg: string) => void = () => {}) {
  return new Umzug<QueryInterface>({
    migrations: {
      glob: ['*.ts', { cwd: migrationsDir, ignore: ['*.d.ts'] }],
      // Our own import() so the .ts files load under tsx and under vitest alike.
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => ((await import(file!)) as MigrationModule).up({ context }),
        down: async () => {
          const m = (await import(file!)) as MigrationModule;
          if (!m.down) throw new Error(`Migration ${name} cannot be undone.`);
          await m.down({ context });
        },
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: { info: (m) => log(JSON.stringify(m)), warn: (m) => log(JSON.stringify(m)), error: (m) => log(JSON.stringify(m)), debug: () => {} },
  });
}

export async function migrateUp(sequelize: Sequelize, log?: (msg: string) => void) {
  return createMigrator(sequelize, log).up();
}
