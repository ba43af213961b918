import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * A finding's photos. The files live in the photo store; a row holds only their keys and sizes.
 * The row references its job as (workshop_id, job_id) and its finding as (job_id, finding_id), as
 * estimate lines do, so the database itself refuses a photo filed against another job's finding.
 * Removing a photo only stamps removed_at/removed_by: a sent approval request may still show it.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`
    CREATE TABLE finding_photos (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid NOT NULL,
      finding_id uuid NOT NULL,
      storage_key text NOT NULL UNIQUE,
      thumb_key text NOT NULL UNIQUE,
      width integer NOT NULL CHECK (width > 0),
      height integer NOT NULL CHECK (height > 0),
      thumb_width integer NOT NULL CHECK (thumb_width > 0),
      thumb_height integer NOT NULL CHECK (thumb_height > 0),
      bytes integer NOT NULL CHECK (bytes > 0),
      uploaded_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      removed_at timestamptz,
      removed_by uuid REFERENCES users(id) ON DELETE SET NULL,
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      FOREIGN KEY (job_id, finding_id) REFERENCES findings (job_id, id) ON DELETE CASCADE,
      CHECK (removed_by IS NULL OR removed_at IS NOT NULL)
    )`);
  await q(`CREATE INDEX finding_photos_finding_idx ON finding_photos (finding_id, created_at)`);
  // A job's findings list reads every current photo of the job in one query.
  await q(`CREATE INDEX finding_photos_job_idx ON finding_photos (job_id, created_at) WHERE removed_at IS NULL`);
}

export async function down({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`DROP TABLE IF EXISTS finding_photos CASCADE`);
}
