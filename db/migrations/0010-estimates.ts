import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

// Allowed values are written out, never imported from the code: this migration must create the
// same schema forever, whatever the code's lists say later (a later change is a new migration).

/*
 * Column widths follow the shared decimalString: up to 12 whole digits, with 2 decimals for money
 * and 4 for unit costs and measurements. Rows that belong to a job reference it as
 * (workshop_id, job_id), and rows that point at each other within a job do so as (job_id, id), so
 * the database itself refuses a line naming another job's finding or access task.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`ALTER TABLE jobs ADD CONSTRAINT jobs_workshop_id_key UNIQUE (workshop_id, id)`);
  await q(`
    CREATE TABLE suppliers (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      name text NOT NULL,
      kind text NOT NULL CHECK (kind IN ('parts', 'sail_loft', 'propeller_shop', 'engine_shop', 'other')),
      email text NOT NULL DEFAULT '',
      phone text NOT NULL DEFAULT '',
      notes text NOT NULL DEFAULT '',
      active boolean NOT NULL DEFAULT true,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (workshop_id, id)
    )`);
  await q(`
    CREATE TABLE parts (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      part_number text NOT NULL,
      description text NOT NULL,
      unit_cost numeric(16,4) NOT NULL CHECK (unit_cost >= 0),
      unit_price numeric(14,2) CHECK (unit_price >= 0),
      markup_percent numeric(14,2) CHECK (markup_percent >= 0),
      vat_rate text NOT NULL DEFAULT 'standard' CHECK (vat_rate IN ('standard', 'reduced', 'zero', 'exempt', 'outside')),
      supplier_id uuid,
      lead_time_days integer NOT NULL DEFAULT 0 CHECK (lead_time_days BETWEEN 0 AND 365),
      active boolean NOT NULL DEFAULT true,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, supplier_id) REFERENCES suppliers (workshop_id, id),
      CONSTRAINT parts_workshop_number_key UNIQUE (workshop_id, part_number),
      UNIQUE (workshop_id, id),
      CHECK (unit_price IS NULL OR markup_percent IS NULL)
    )`);
  await q(`
    CREATE TABLE job_templates (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      name text NOT NULL,
      job_type text NOT NULL CHECK (job_type IN ('annual_permit_inspection', 'engine_service_100h', 'engine_service_200h', 'wing_strip_recover', 'gearbox_inspection', 'repair', 'other')),
      description text NOT NULL DEFAULT '',
      -- Ordered arrays validated by the shared schemas; a template is always read and saved whole.
      lines jsonb NOT NULL DEFAULT '[]'::jsonb CHECK (jsonb_typeof(lines) = 'array'),
      checklist jsonb NOT NULL DEFAULT '[]'::jsonb CHECK (jsonb_typeof(checklist) = 'array'),
      active boolean NOT NULL DEFAULT true,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX job_templates_workshop_idx ON job_templates (workshop_id, lower(name))`);
  await q(`
    CREATE TABLE estimates (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL,
      job_id uuid NOT NULL UNIQUE,
      last_finding_number integer NOT NULL DEFAULT 0,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE
    )`);
  await q(`
    CREATE TABLE job_checklist_items (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL,
      job_id uuid NOT NULL,
      sort_order integer NOT NULL,
      section text NOT NULL DEFAULT '',
      text text NOT NULL,
      "limit" jsonb,
      result text CHECK (result IN ('pass', 'fail', 'na', 'measured')),
      measured_value numeric(12,4),
      note text NOT NULL DEFAULT '',
      recorded_by uuid REFERENCES users(id) ON DELETE SET NULL,
      recorded_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      UNIQUE (job_id, id),
      CHECK ((result = 'measured') = (measured_value IS NOT NULL))
    )`);
  await q(`CREATE INDEX job_checklist_items_job_idx ON job_checklist_items (job_id, sort_order)`);
  await q(`
    CREATE TABLE findings (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL,
      job_id uuid NOT NULL,
      seq integer NOT NULL CHECK (seq > 0),
      title text NOT NULL,
      location text NOT NULL,
      category text NOT NULL CHECK (category IN ('airworthiness', 'recommended', 'advisory')),
      seen text NOT NULL,
      checklist_item_id uuid,
      measured_value numeric(12,4),
      "limit" jsonb,
      state text NOT NULL DEFAULT 'draft' CHECK (state IN ('draft', 'priced', 'sent', 'approved', 'approved_within_limit', 'declined', 'withdrawn')),
      remedy jsonb NOT NULL DEFAULT '{}'::jsonb,
      raised_by uuid REFERENCES users(id) ON DELETE SET NULL,
      raised_at timestamptz NOT NULL DEFAULT now(),
      rectified_at timestamptz,
      rectified_by uuid REFERENCES users(id) ON DELETE SET NULL,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      FOREIGN KEY (job_id, checklist_item_id) REFERENCES job_checklist_items (job_id, id),
      UNIQUE (job_id, seq),
      UNIQUE (job_id, id),
      CHECK (rectified_at IS NULL OR state IN ('approved', 'approved_within_limit'))
    )`);
  await q(`
    CREATE TABLE access_tasks (
      job_id uuid NOT NULL,
      id uuid NOT NULL,
      workshop_id uuid NOT NULL,
      name text NOT NULL,
      hours numeric(14,2) NOT NULL CHECK (hours >= 0),
      labour_rate_code text,
      rate_per_hour numeric(14,2) NOT NULL CHECK (rate_per_hour >= 0),
      vat_rate text NOT NULL DEFAULT 'standard' CHECK (vat_rate IN ('standard', 'reduced', 'zero', 'exempt', 'outside')),
      sort_order integer NOT NULL DEFAULT 0,
      PRIMARY KEY (job_id, id),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE
    )`);
  await q(`
    CREATE TABLE estimate_lines (
      job_id uuid NOT NULL,
      id uuid NOT NULL,
      workshop_id uuid NOT NULL,
      stage text NOT NULL CHECK (stage IN ('inspection', 'discovered', 'approved', 'declined')),
      kind text NOT NULL CHECK (kind IN ('labour', 'part', 'subcontract', 'fee')),
      description text NOT NULL,
      quantity numeric(14,2) NOT NULL DEFAULT 1 CHECK (quantity >= 0),
      labour_rate_code text,
      rate_per_hour numeric(14,2) CHECK (rate_per_hour >= 0),
      part_id uuid,
      supplier_id uuid,
      unit_cost numeric(16,4) CHECK (unit_cost >= 0),
      unit_price numeric(14,2) CHECK (unit_price >= 0),
      markup_percent numeric(14,2) CHECK (markup_percent >= 0),
      amount numeric(14,2) CHECK (amount >= 0),
      vat_rate text NOT NULL DEFAULT 'standard' CHECK (vat_rate IN ('standard', 'reduced', 'zero', 'exempt', 'outside')),
      finding_id uuid,
      access_task_id uuid,
      discount_percent numeric(5,2) CHECK (discount_percent BETWEEN 0 AND 100),
      sort_order integer NOT NULL DEFAULT 0,
      PRIMARY KEY (job_id, id),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      FOREIGN KEY (job_id, finding_id) REFERENCES findings (job_id, id),
      FOREIGN KEY (job_id, access_task_id) REFERENCES access_tasks (job_id, id),
      FOREIGN KEY (workshop_id, part_id) REFERENCES parts (workshop_id, id),
      FOREIGN KEY (workshop_id, supplier_id) REFERENCES suppliers (workshop_id, id),
      CHECK (kind <> 'labour' OR rate_per_hour IS NOT NULL),
      CHECK (kind NOT IN ('subcontract', 'fee') OR amount IS NOT NULL),
      CHECK (kind <> 'part' OR unit_cost IS NOT NULL OR unit_price IS NOT NULL)
    )`);
  await q(`CREATE INDEX estimate_lines_finding_idx ON estimate_lines (job_id, finding_id)`);
  await q(`
    CREATE TABLE time_logs (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL,
      job_id uuid NOT NULL,
      user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      hours numeric(14,2) NOT NULL CHECK (hours > 0),
      worked_on date NOT NULL,
      note text NOT NULL DEFAULT '',
      finding_id uuid,
      created_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      FOREIGN KEY (job_id, finding_id) REFERENCES findings (job_id, id)
    )`);
  await q(`CREATE INDEX time_logs_job_idx ON time_logs (job_id, worked_on)`);
  // Every job has exactly one estimate; jobs booked before this migration get an empty one.
  await q(`INSERT INTO estimates (workshop_id, job_id) SELECT workshop_id, id FROM jobs ON CONFLICT (job_id) DO NOTHING`);
}

export async function down({ context }: Ctx): Promise<void> {
  for (const table of ['time_logs', 'estimate_lines', 'access_tasks', 'findings', 'job_checklist_items', 'estimates', 'job_templates', 'parts', 'suppliers']) {
    await context.sequelize.query(`DROP TABLE IF EXISTS ${table} CASCADE`);
  }
  await context.sequelize.query(`ALTER TABLE jobs DROP CONSTRAINT IF EXISTS jobs_workshop_id_key`);
}
