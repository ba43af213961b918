import { z } from 'zod';
import { createSequelize } from './sequelize.js';

/** The scripts need only the database, so they do not demand the whole app configuration. */
export function scriptSequelize() {
  const parsed = z.string().regex(/^postgres(ql)?:\/\//).safeParse(process.env.DATABASE_URL);
  if (!parsed.success) {
    console.error('DATABASE_URL must be set to a postgres:// URL.');
    process.exit(1);
  }
  return createSequelize(parsed.data, undefined, 2);
}
