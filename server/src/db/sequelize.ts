import pg from 'pg';
import type { Logger } from 'pino';
import { Sequelize } from 'sequelize';

/**
 * pg's Client, listening for 'error' from the moment it exists. Sequelize attaches its own listener
 * only after the connection is up; a server shutting down can send its goodbye (57P01) in the same
 * packet as the connection's first "ready", before that listener exists, and an 'error' event
 * nobody hears ends the process. Heard here, the connection is marked unusable and the pool
 * replaces it, so the app rides out a database restart.
 */
class ListeningClient extends pg.Client {
  constructor(config?: unknown) {
    super(config);
    this.on('error', () => {
      (this as unknown as { _invalid?: boolean })._invalid = true;
    });
  }
}
// Everything else of pg (types, defaults) comes through the prototype unchanged.
const pgWithListeningClient = Object.assign(Object.create(pg) as typeof pg, { Client: ListeningClient });

export function createSequelize(databaseUrl: string, logger?: Logger, poolMax = 10): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    // Only when trace is on: Sequelize builds a log line for every statement it is given a logger for.
    logging: logger?.isLevelEnabled('trace') ? (sql) => logger.trace({ sql }, 'sql') : false,
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 20_000 },
    define: { underscored: true },
    // NUMERIC comes back as a string and stays one; no float ever touches money or hours.
    dialectOptions: { application_name: 'wingstage' },
    dialectModule: pgWithListeningClient,
  });
}
