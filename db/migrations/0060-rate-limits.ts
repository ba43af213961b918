import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Rate-limit counters shared by every app process (sign-in per account and per address, failed
 * decision-link look-ups). The shape is the one rate-limiter-flexible's PostgreSQL store reads and
 * writes: one row per key, its points, and when they lapse (milliseconds since 1970). They replace
 * sign_in_failures, which only one limit used and which could not reserve an attempt atomically.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`
    CREATE TABLE rate_limits (
      key varchar(255) PRIMARY KEY,
      points integer NOT NULL DEFAULT 0,
      expire bigint
    )`);
  await q(`CREATE INDEX rate_limits_expire_idx ON rate_limits (expire)`);
  await q(`DROP TABLE IF EXISTS sign_in_failures`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`DROP TABLE IF EXISTS rate_limits`);
  await q(`
    CREATE TABLE sign_in_failures (
      id bigserial PRIMARY KEY,
      email text NOT NULL,
      address text NOT NULL DEFAULT '',
      at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX sign_in_failures_email_at_idx ON sign_in_failures (email, at)`);
}
