import type { Includeable, Transaction } from 'sequelize';
import { notFound } from '../errors/app-error.js';
import { Aircraft, Customer, Job, boundSequelize } from '../models/index.js';
import { inWorkshop, ownedRows, type Scope } from './scope.js';

export type JobRow = Job & { aircraft: Aircraft & { customer: Customer } };

/** Jobs reach owners through their aircraft: the owner filter rides on the required join. */
export function scopedInclude(scope: Scope): Includeable[] {
  return [
    {
      model: Aircraft,
      as: 'aircraft',
      required: true,
      attributes: ['id', 'registration', 'type', 'customerId'],
      where: ownedRows(scope, 'customerId'),
      include: [{ model: Customer, as: 'customer', required: true, attributes: ['id', 'name'] }],
    },
  ];
}

/**
 * The one way to reach a job: in the caller's workshop and, for an owner, through their own
 * aircraft. Everything that hangs off a job (estimate, checklist, findings, time) comes through here.
 */
export async function findJob(scope: Scope, id: string, t?: Transaction, lock = false): Promise<JobRow> {
  const job = await Job.findOne({
    where: inWorkshop(scope, { id }),
    include: scopedInclude(scope),
    transaction: t,
    // Lock only the job row; the joined rows are read, not changed. NO KEY UPDATE, not UPDATE: it
    // still excludes every other writer of the job, but lets inserts that merely reference the job
    // (history, findings, photos) check their foreign key without queueing behind it.
    lock: lock && t ? { level: t.LOCK.NO_KEY_UPDATE, of: Job } : undefined,
  });
  if (!job) throw notFound('That job');
  return job as JobRow;
}

/*
 * LOCK ORDER — the one order for the whole server (DEVELOPERS.md, "Locks"):
 *
 *   1. the job row                (lockJob / lockJobById)
 *   2. its approval requests      (lockOpenRequests, or one request by id)
 *   3. its estimate row           (ensureEstimate(..., lock = true), or UPDATE estimates)
 *   4. lines, findings, photos, checklist items
 *
 * Every transaction that writes anything belonging to a job takes the job row first, so two
 * writers of one job queue at step 1 and never hold anything the other waits for. A transaction
 * that needs a later step without an earlier one (the decision page marking a request expired)
 * simply skips it; it must never go back up the list.
 */

/** Step 1: the job, locked for the rest of the transaction (and checked against the caller's scope). */
export function lockJob(scope: Scope, id: string, t: Transaction): Promise<JobRow> {
  return findJob(scope, id, t, true);
}

/** Step 1 for the owner's decision link, which has no scope: the job of a request, by id. */
export async function lockJobById(id: string, t: Transaction): Promise<void> {
  await boundSequelize().query('SELECT id FROM jobs WHERE id = $1 FOR NO KEY UPDATE', { bind: [id], transaction: t });
}

/**
 * Step 2: every approval request of the job still waiting for the owner, in id order. A save or a
 * withdrawal may replace one of them, so it takes them before the estimate, as the decision does.
 */
export async function lockOpenRequests(jobId: string, t: Transaction): Promise<void> {
  await boundSequelize().query(`SELECT id FROM approval_requests WHERE job_id = $1 AND state = 'sent' ORDER BY id FOR UPDATE`, {
    bind: [jobId],
    transaction: t,
  });
}

/** The job's own columns with its aircraft and owner, for reads that only show it. */
export type JobView = Pick<
  Job,
  'id' | 'number' | 'aircraftId' | 'title' | 'type' | 'state' | 'bookedInOn' | 'dueOn' | 'notes' | 'scopeCautions' | 'version' | 'createdAt' | 'updatedAt'
> & { aircraft: Pick<Aircraft, 'registration' | 'type' | 'customerId'> & { customer: Pick<Customer, 'name'> } };

/**
 * findJob's access rule as a plain row (raw, nested): no model instances are built for a read that
 * only shows the job. Anything that changes the job uses findJob.
 */
export async function viewJob(scope: Scope, id: string): Promise<JobView> {
  const job = await Job.findOne({ where: inWorkshop(scope, { id }), include: scopedInclude(scope), raw: true, nest: true });
  if (!job) throw notFound('That job');
  return job as unknown as JobView;
}

/**
 * findJob's access rule in SQL, for reads that fold the session check into their own statement:
 * a LATERAL subquery over the session CTE `s` (middleware/authorize.ts SESSION_SQL) giving the job
 * `jobParam` names with its aircraft and owner, or nothing. The same rule as scopedInclude: the
 * job and its aircraft in the session's workshop and, for an owner, the aircraft theirs (an owner
 * without a customer record matches nothing: NULL never equals).
 */
export function jobInSessionSql(jobParam: string): string {
  return `LEFT JOIN LATERAL (
      SELECT j.id, j.workshop_id, j.number, j.aircraft_id, j.title, j.type, j.state, j.booked_in_on, j.due_on, j.notes,
             j.scope_cautions, j.version, j.created_at, j.updated_at,
             a.registration, a.type AS aircraft_type, a.customer_id, c.name AS customer_name
        FROM jobs j
        JOIN aircraft a ON a.id = j.aircraft_id AND a.workshop_id = s."workshopId"
        JOIN customers c ON c.id = a.customer_id
       WHERE j.id = ${jobParam} AND j.workshop_id = s."workshopId"
         AND (s.role <> 'owner' OR a.customer_id = s."customerId")
    ) jb ON true`;
}
