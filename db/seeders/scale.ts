import type { Sequelize } from 'sequelize';
import { seedScaleDocuments } from './scale-documents.js';
import { seedScalePayments } from './scale-payments.js';

/**
 * A busy workshop's worth of rows for the benchmark, added to the demo workshop in bulk: a few
 * set-based INSERT … SELECT generate_series statements, no row-by-row round trips. Everything is
 * invented: owners "Scale owner 0001", registrations Q-Zxxx (the demo uses Q-B…), job numbers
 * from J-10001 on. The benchmark database is separate from the demo's (wingstage_scale).
 *
 * Sizes: 500 owners, 2,000 aircraft, 10,000 jobs (each with an estimate), 200,000 estimate lines
 * (the first bulk job carries 200 of them, the rest 20 each), 30,000 findings (3 per job), and for
 * every job an approval request naming its findings, with a decision on each of the decided ones;
 * then 100,000 payments (scale-payments.ts) and invoices, credit notes and deposits in proportion
 * (scale-documents.ts).
 */
export const SCALE = { owners: 500, aircraft: 2_000, jobs: 10_000, lines: 200_000, findingsPerJob: 3 } as const;

/** The one job the estimate benchmark reads: 200 lines. */
export const SCALE_BIG_JOB_NUMBER = 'J-10001';

export async function scaleAlreadySeeded(sequelize: Sequelize, workshopId: string): Promise<boolean> {
  const [rows] = await sequelize.query(`SELECT count(*)::int AS n FROM jobs WHERE workshop_id = $1 AND number = $2`, { bind: [workshopId, SCALE_BIG_JOB_NUMBER] });
  return (rows as { n: number }[])[0]!.n > 0;
}

export async function seedScale(sequelize: Sequelize, workshopId: string, log: (msg: string) => void = () => {}): Promise<void> {
  await sequelize.transaction(async (t) => {
    const step = async (what: string, sql: string) => {
      const began = Date.now();
      await sequelize.query(sql, { bind: sql.includes('$1') ? [workshopId] : [], transaction: t });
      log(`${what} (${((Date.now() - began) / 1000).toFixed(1)} s)`);
    };
    // A throwaway map from a bulk index to the generated ids, so later statements join on integers.
    await step('owners', `
      INSERT INTO customers (workshop_id, name, kind, email, phone, notes)
      SELECT $1, 'Scale owner ' || lpad(g::text, 4, '0'), CASE WHEN g % 10 = 0 THEN 'group' ELSE 'private' END,
             'scale-owner-' || g || '@owners.example', '01632 96' || lpad((g % 10000)::text, 4, '0'), 'Bulk row for the benchmark.'
      FROM generate_series(1, ${SCALE.owners}) g`);
    await step('aircraft', `
      INSERT INTO aircraft (workshop_id, customer_id, registration, type, serial, airframe_hours, engine, engine_hours)
      SELECT $1, c.id,
             'Q-Z' || chr(65 + (g / 676) % 26) || chr(65 + (g / 26) % 26) || chr(65 + g % 26),
             (ARRAY['Two-seat flex-wing trike', 'Three-axis high-wing microlight', 'Single-seat deregulated microlight', 'Two-seat low-wing permit aircraft'])[1 + g % 4],
             'SC-' || lpad(g::text, 5, '0'), (100 + g % 3000)::numeric(12,1), (ARRAY['80 hp flat-four four-stroke', '64 hp two-stroke twin'])[1 + g % 2], (50 + g % 1500)::numeric(12,1)
      FROM generate_series(0, ${SCALE.aircraft - 1}) g
      JOIN LATERAL (SELECT id FROM customers WHERE workshop_id = $1 AND name = 'Scale owner ' || lpad((1 + g % ${SCALE.owners})::text, 4, '0')) c ON true`);
    await step('jobs', `
      INSERT INTO jobs (workshop_id, number, aircraft_id, title, type, state, booked_in_on, due_on, notes)
      SELECT $1, 'J-' || (10000 + g), a.id,
             (ARRAY['Annual permit inspection', '100-hour engine service', '200-hour engine service', 'Wing strip-down and re-cover', 'Gearbox inspection'])[1 + g % 5],
             (ARRAY['annual_permit_inspection', 'engine_service_100h', 'engine_service_200h', 'wing_strip_recover', 'gearbox_inspection'])[1 + g % 5],
             (ARRAY['booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release', 'closed', 'cancelled'])[1 + g % 7],
             DATE '2020-01-01' + (g / 5), DATE '2020-01-01' + (g / 5) + 14, ''
      FROM generate_series(1, ${SCALE.jobs}) g
      JOIN LATERAL (SELECT id FROM aircraft WHERE workshop_id = $1 AND serial = 'SC-' || lpad((g % ${SCALE.aircraft})::text, 5, '0')) a ON true`);
    await step('estimates', `
      INSERT INTO estimates (workshop_id, job_id, last_finding_number)
      SELECT workshop_id, id, ${SCALE.findingsPerJob} FROM jobs WHERE workshop_id = $1 AND number ~ '^J-1\\d{4}$'
      ON CONFLICT (job_id) DO NOTHING`);
    await step('job index', `CREATE TEMP TABLE scale_jobs ON COMMIT DROP AS
      SELECT (substring(number from 3)::int - 10000) AS k, id FROM jobs WHERE workshop_id = $1 AND number ~ '^J-1\\d{4}$'`);
    await sequelize.query(`CREATE UNIQUE INDEX ON scale_jobs (k)`, { transaction: t });
    await sequelize.query(`ANALYZE scale_jobs`, { transaction: t });
    await step('findings', `
      INSERT INTO findings (workshop_id, job_id, seq, title, location, category, seen, state, remedy, raised_at)
      SELECT $1, j.id, s, (ARRAY['Perished fuel hose', 'Worn spark plugs', 'Chafed control cable', 'Cracked exhaust clamp', 'Loose sail batten'])[1 + (j.k + s) % 5],
             (ARRAY['Engine bay', 'Cockpit', 'Wing', 'Undercarriage'])[1 + (j.k + s) % 4],
             (ARRAY['airworthiness', 'recommended', 'advisory'])[1 + (j.k + s) % 3],
             'Seen at inspection (bulk row).',
             -- Even jobs' requests are decided (approved or declined), odd ones still wait.
             CASE WHEN j.k % 2 = 1 THEN 'sent' WHEN (j.k + s) % 4 = 0 THEN 'declined' ELSE 'approved' END,
             '{"description": "Replace", "hours": "1.00", "labourRateCode": null, "parts": [], "accessTask": null}'::jsonb,
             DATE '2020-01-01' + (j.k / 5)
      FROM scale_jobs j CROSS JOIN generate_series(1, ${SCALE.findingsPerJob}) s`);
    // Line g belongs to job 1 when g <= 200, else spreads 20 a job over the other jobs.
    await step('estimate lines', `
      INSERT INTO estimate_lines (job_id, id, workshop_id, stage, kind, description, quantity, labour_rate_code, rate_per_hour, unit_cost, markup_percent, amount, vat_rate, sort_order)
      SELECT j.id, gen_random_uuid(), $1,
             (ARRAY['inspection', 'inspection', 'discovered', 'approved'])[1 + g % 4],
             (ARRAY['labour', 'part', 'fee'])[1 + g % 3],
             'Bulk line ' || g,
             (1 + g % 4)::numeric(14,2),
             CASE WHEN g % 3 = 0 THEN 'standard' END,
             CASE WHEN g % 3 = 0 THEN 65.00 END,
             CASE WHEN g % 3 = 1 THEN (10 + g % 90)::numeric(16,4) END,
             CASE WHEN g % 3 = 1 THEN 20.00 END,
             CASE WHEN g % 3 = 2 THEN (5 + g % 50)::numeric(14,2) END,
             'standard', g
      FROM generate_series(1, ${SCALE.lines}) g
      JOIN scale_jobs j ON j.k = CASE WHEN g <= 200 THEN 1 ELSE 2 + (g - 201) % (${SCALE.jobs} - 1) END`);
    await step('approval requests', `
      INSERT INTO approval_requests (workshop_id, job_id, state, snapshot, snapshot_hash, link_nonce, token_hash, gross, sent_at, expires_at, decided_at, decided_by_name)
      SELECT $1, j.id, CASE WHEN j.k % 2 = 0 THEN 'decided' ELSE 'sent' END,
             '{"bulk": true}'::jsonb, md5(j.id::text) || md5(j.k::text), md5(random()::text), md5('t' || j.id::text) || md5('u' || j.id::text),
             (100 + j.k % 900)::numeric(14,2),
             -- Decided requests are history; open ones were sent in the last ten days and still run, so the
             -- expiry sweep has nothing to do inside a benchmark run.
             CASE WHEN j.k % 2 = 0 THEN DATE '2020-01-02' + (j.k / 5) ELSE now() - make_interval(days => j.k % 10) END,
             CASE WHEN j.k % 2 = 0 THEN DATE '2020-01-16' + (j.k / 5) ELSE now() + make_interval(days => 14 - j.k % 10) END,
             CASE WHEN j.k % 2 = 0 THEN DATE '2020-01-03' + (j.k / 5) END, CASE WHEN j.k % 2 = 0 THEN 'Scale owner' END
      FROM scale_jobs j`);
    await step('request findings', `
      INSERT INTO approval_request_findings (job_id, request_id, finding_id, position)
      SELECT f.job_id, r.id, f.id, f.seq FROM findings f JOIN scale_jobs j ON j.id = f.job_id JOIN approval_requests r ON r.job_id = f.job_id`);
    await step('decisions', `
      INSERT INTO approval_decisions (job_id, request_id, finding_id, item_id, decision, note)
      SELECT arf.job_id, arf.request_id, arf.finding_id, arf.finding_id::text, CASE WHEN f.state = 'declined' THEN 'decline' ELSE 'approve' END, ''
      FROM approval_request_findings arf JOIN approval_requests r ON r.id = arf.request_id AND r.state = 'decided'
      JOIN findings f ON f.id = arf.finding_id JOIN scale_jobs j ON j.id = arf.job_id`);
    // The money rows go in with the day-totals triggers off (one upsert per row would double the
    // seed's time) and the workshop's day totals are rebuilt from them once at the end.
    await sequelize.query(`ALTER TABLE payments DISABLE TRIGGER payments_ledger_day_totals; ALTER TABLE refunds DISABLE TRIGGER refunds_ledger_day_totals`, { transaction: t });
    await seedScalePayments(step);
    await seedScaleDocuments(step);
    await sequelize.query(`ALTER TABLE payments ENABLE TRIGGER payments_ledger_day_totals; ALTER TABLE refunds ENABLE TRIGGER refunds_ledger_day_totals`, { transaction: t });
    await step('ledger day totals', `SELECT ledger_day_totals_rebuild($1)`);
    await step('job counter', `
      INSERT INTO job_counters (workshop_id, last_number) VALUES ($1, ${10000 + SCALE.jobs})
      ON CONFLICT (workshop_id) DO UPDATE SET last_number = GREATEST(job_counters.last_number, EXCLUDED.last_number)`);
  });
  // VACUUM too: it marks the bulk rows all-visible, so index-only reads need not visit the table.
  await sequelize.query('VACUUM ANALYZE');
}
