import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/** The shared decimalString allows 12 whole digits; numeric(12,1) held only 11, so widen it. */
export async function up({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`ALTER TABLE aircraft ALTER COLUMN airframe_hours TYPE numeric(13,1), ALTER COLUMN engine_hours TYPE numeric(13,1)`);
}

export async function down({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`ALTER TABLE aircraft ALTER COLUMN airframe_hours TYPE numeric(12,1), ALTER COLUMN engine_hours TYPE numeric(12,1)`);
}
