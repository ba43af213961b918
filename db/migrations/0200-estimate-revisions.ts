import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * The estimate's revision: a number PostgreSQL changes, in the writing transaction, whenever
 * anything the estimate read (GET /api/jobs/:id/estimate) answers from changes. The read compares
 * it on every request before it sends an answer it made earlier (server/src/routes/estimate-read.ts),
 * so an answer is never sent after the rows it came from changed.
 *
 * - `estimates.revision`: taken from one sequence, so a value is never used twice, not after a
 *   rollback, not for an estimate deleted and made again. A BEFORE UPDATE trigger gives the row a
 *   new one on every update of the row itself (the save's version, the finding number, anything).
 * - Statement triggers with transition tables on every other table the read's statement reads for
 *   the job: estimate_lines, access_tasks, approval_requests (the quote's open request) and
 *   approval_decisions (the owner's last word on the quote). One statement that writes 200 lines
 *   bumps its estimate once, not 200 times. The estimates rows are locked in job order first, so two
 *   statements touching several jobs each cannot deadlock on them.
 * - `workshops.pricing_revision`: what the read takes from the workshop (currency, VAT rates,
 *   settings) changes it; the read folds it into the same key instead of touching every estimate.
 *
 * Whoever writes (a route, the approval sweep, a seed, psql) cannot forget: the triggers do it.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`CREATE SEQUENCE estimate_revision_seq AS bigint`);
  await q(`ALTER TABLE estimates ADD COLUMN revision bigint NOT NULL DEFAULT nextval('estimate_revision_seq')`);
  await q(`ALTER TABLE workshops ADD COLUMN pricing_revision bigint NOT NULL DEFAULT nextval('estimate_revision_seq')`);

  await q(`
    CREATE FUNCTION estimates_new_revision() RETURNS trigger
    LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.revision IS NOT DISTINCT FROM OLD.revision THEN
        NEW.revision := nextval('estimate_revision_seq');
      END IF;
      RETURN NEW;
    END $$`);
  await q(`CREATE TRIGGER estimates_new_revision BEFORE UPDATE ON estimates FOR EACH ROW EXECUTE FUNCTION estimates_new_revision()`);

  await q(`
    CREATE FUNCTION estimate_revision_bump(jobs uuid[]) RETURNS void
    LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM 1 FROM estimates WHERE job_id = ANY(jobs) ORDER BY job_id FOR NO KEY UPDATE;
      UPDATE estimates SET revision = nextval('estimate_revision_seq') WHERE job_id = ANY(jobs);
    END $$`);

  // One function for every table keyed by job_id; each trigger names its transition tables new_rows / old_rows.
  await q(`
    CREATE FUNCTION estimate_rows_changed() RETURNS trigger
    LANGUAGE plpgsql AS $$
    DECLARE
      jobs uuid[];
    BEGIN
      IF TG_OP = 'INSERT' THEN
        SELECT array_agg(DISTINCT job_id) INTO jobs FROM new_rows;
      ELSIF TG_OP = 'DELETE' THEN
        SELECT array_agg(DISTINCT job_id) INTO jobs FROM old_rows;
      ELSE
        SELECT array_agg(DISTINCT job_id) INTO jobs FROM (SELECT job_id FROM old_rows UNION SELECT job_id FROM new_rows) x;
      END IF;
      IF jobs IS NOT NULL THEN
        PERFORM estimate_revision_bump(jobs);
      END IF;
      RETURN NULL;
    END $$`);
  for (const table of TABLES) {
    await q(`CREATE TRIGGER ${table}_rev_ins AFTER INSERT ON ${table} REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION estimate_rows_changed()`);
    await q(`CREATE TRIGGER ${table}_rev_upd AFTER UPDATE ON ${table} REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION estimate_rows_changed()`);
    await q(`CREATE TRIGGER ${table}_rev_del AFTER DELETE ON ${table} REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION estimate_rows_changed()`);
  }

  await q(`
    CREATE FUNCTION workshops_pricing_revision() RETURNS trigger
    LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.currency IS DISTINCT FROM OLD.currency OR NEW.vat_rates IS DISTINCT FROM OLD.vat_rates OR NEW.settings IS DISTINCT FROM OLD.settings THEN
        NEW.pricing_revision := nextval('estimate_revision_seq');
      END IF;
      RETURN NEW;
    END $$`);
  await q(`CREATE TRIGGER workshops_pricing_revision BEFORE UPDATE ON workshops FOR EACH ROW EXECUTE FUNCTION workshops_pricing_revision()`);
}

const TABLES = ['estimate_lines', 'access_tasks', 'approval_requests', 'approval_decisions'] as const;

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`DROP TRIGGER IF EXISTS workshops_pricing_revision ON workshops`);
  await q(`DROP FUNCTION IF EXISTS workshops_pricing_revision()`);
  for (const table of TABLES) {
    for (const t of ['ins', 'upd', 'del']) await q(`DROP TRIGGER IF EXISTS ${table}_rev_${t} ON ${table}`);
  }
  await q(`DROP FUNCTION IF EXISTS estimate_rows_changed()`);
  await q(`DROP FUNCTION IF EXISTS estimate_revision_bump(uuid[])`);
  await q(`DROP TRIGGER IF EXISTS estimates_new_revision ON estimates`);
  await q(`DROP FUNCTION IF EXISTS estimates_new_revision()`);
  await q(`ALTER TABLE workshops DROP COLUMN IF EXISTS pricing_revision`);
  await q(`ALTER TABLE estimates DROP COLUMN IF EXISTS revision`);
  await q(`DROP SEQUENCE IF EXISTS estimate_revision_seq`);
}
