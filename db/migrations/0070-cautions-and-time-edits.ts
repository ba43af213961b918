import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Cautions: a hazard note on a checklist item (propeller live, fuel, engine runs), shown to the
 * engineer beside the item. Template checklists and lines are JSONB and carry theirs inside;
 * a job keeps its own copy so a later template edit does not change a job already booked in.
 *
 * Time entries can now be corrected or removed: each keeps a version (optimistic locking) and
 * when it was last changed. A day has 24 hours, so one entry can never exceed 24; the check is
 * NOT VALID so rows written before it (if any) stay readable and can be corrected.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`ALTER TABLE job_checklist_items ADD COLUMN caution text NOT NULL DEFAULT '' CHECK (char_length(caution) <= 500)`);
  // The cautions of the template's scope lines, copied when the job is booked in: [{ "line": "...", "caution": "..." }].
  await q(`ALTER TABLE jobs ADD COLUMN scope_cautions jsonb NOT NULL DEFAULT '[]'::jsonb`);
  await q(`ALTER TABLE time_logs ADD COLUMN version integer NOT NULL DEFAULT 0`);
  await q(`ALTER TABLE time_logs ADD COLUMN updated_at timestamptz NOT NULL DEFAULT now()`);
  await q(`ALTER TABLE time_logs ADD CONSTRAINT time_logs_hours_in_a_day CHECK (hours <= 24) NOT VALID`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`ALTER TABLE time_logs DROP CONSTRAINT IF EXISTS time_logs_hours_in_a_day`);
  await q(`ALTER TABLE time_logs DROP COLUMN IF EXISTS updated_at`);
  await q(`ALTER TABLE time_logs DROP COLUMN IF EXISTS version`);
  await q(`ALTER TABLE jobs DROP COLUMN IF EXISTS scope_cautions`);
  await q(`ALTER TABLE job_checklist_items DROP COLUMN IF EXISTS caution`);
}
