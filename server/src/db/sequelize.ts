import { Sequelize } from 'sequelize';
import type { Logger } from 'pino';

export function createSequelize(databaseUrl: string, logger?: Logger, poolMax = 10): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    logging: logger ? (sql) => logger.trace({ sql }, 'sql') : false,
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 20_000 },
    define: { underscored: true },
    // NUMERIC comes back as a string and stays one; no float ever touches money or hours.
    dialectOptions: { application_name: 'wingstage' },
  });
}
