import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * When the owner's e-mail of an invoice or credit note was queued: the sending task sets it in the
 * same transaction that queues the e-mail, so a task that runs twice sends one e-mail, and a sweep
 * finds documents issued but never mailed (the process stopped between the issue and its task).
 * Documents issued before this column was added were mailed as they were issued.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`ALTER TABLE invoices ADD COLUMN mailed_at timestamptz`);
  await q(`ALTER TABLE credit_notes ADD COLUMN mailed_at timestamptz`);
  await q(`UPDATE invoices SET mailed_at = issued_at`);
  await q(`UPDATE credit_notes SET mailed_at = issued_at`);
  // The sweep reads only the few rows still waiting.
  await q(`CREATE INDEX invoices_unmailed_idx ON invoices (issued_at) WHERE mailed_at IS NULL`);
  await q(`CREATE INDEX credit_notes_unmailed_idx ON credit_notes (issued_at) WHERE mailed_at IS NULL`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`ALTER TABLE credit_notes DROP COLUMN mailed_at`);
  await q(`ALTER TABLE invoices DROP COLUMN mailed_at`);
}
