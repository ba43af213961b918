import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Indexes for the staff lists at a busy workshop's scale (npm run seed:scale; EXPLAIN ANALYZE of
 * each list's query in the README's performance notes). The lists search with ILIKE '%text%',
 * which a b-tree cannot serve: trigram indexes (pg_trgm, a trusted extension since PostgreSQL 13,
 * so a database owner may create it) let a selective search (a registration, an owner's name)
 * read only the matching rows; with every searched column of a table indexed the planner ORs them.
 * The jobs list's other sort orders get (workshop_id, column) so the first page is an index walk.
 */
const INDEXES: [name: string, sql: string][] = [
  ['customers_name_trgm_idx', 'customers USING gin (name gin_trgm_ops)'],
  ['customers_email_trgm_idx', 'customers USING gin (email gin_trgm_ops)'],
  ['customers_phone_trgm_idx', 'customers USING gin (phone gin_trgm_ops)'],
  ['aircraft_registration_trgm_idx', 'aircraft USING gin (registration gin_trgm_ops)'],
  ['aircraft_type_trgm_idx', 'aircraft USING gin (type gin_trgm_ops)'],
  ['jobs_number_trgm_idx', 'jobs USING gin (number gin_trgm_ops)'],
  ['jobs_title_trgm_idx', 'jobs USING gin (title gin_trgm_ops)'],
  ['jobs_workshop_due_idx', 'jobs (workshop_id, due_on)'],
  ['jobs_workshop_booked_idx', 'jobs (workshop_id, booked_in_on)'],
  ['jobs_workshop_updated_idx', 'jobs (workshop_id, updated_at)'],
];

export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q('CREATE EXTENSION IF NOT EXISTS pg_trgm');
  for (const [name, on] of INDEXES) await q(`CREATE INDEX IF NOT EXISTS ${name} ON ${on}`);
}

export async function down({ context }: Ctx): Promise<void> {
  for (const [name] of INDEXES) await context.sequelize.query(`DROP INDEX IF EXISTS ${name}`);
  // The extension stays: other objects may use it, and it holds no data.
}
