import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * When the receipt e-mail of a card payment was queued: the receipt job sets it in the same
 * transaction that queues the e-mail, so a job that runs twice sends one receipt.
 */
export async function up({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`ALTER TABLE payments ADD COLUMN receipt_mailed_at timestamptz`);
}

export async function down({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`ALTER TABLE payments DROP COLUMN receipt_mailed_at`);
}
