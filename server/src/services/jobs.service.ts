import { Op, type Transaction, type WhereOptions } from 'sequelize';
import {
  JOB_STATE_LABELS,
  assertJobMove,
  JOB_STATE_BY_MONEY_REASON,
  canStartWork,
  type JobDecisionsToSee,
  type AuditEventDto,
  type JobCreate,
  type JobDto,
  type JobState,
  type Page,
} from '@wingstage/shared';
import type { z } from 'zod';
import type { jobListQuerySchema, jobTransitionSchema, jobUpdateSchema } from '@wingstage/shared';
import { AppError, forbidden, notFound, staleVersion } from '../errors/app-error.js';
import { Aircraft, AuditEvent, Job, User, boundSequelize } from '../models/index.js';
import { preparedRows } from '../db/prepared.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import { likePattern, orderFrom, pageWindow } from './list-helpers.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';
import { findJob, jobInSessionSql, scopedInclude, viewJob, type JobRow, type JobView } from './job-access.js';
import { SESSION_SQL, type SessionRow } from './session-row.js';
import type { TokenClaims } from '../lib/session-tokens.js';
import { applyTemplate, ensureEstimate, unagreedQuoteLines } from './estimates.service.js';
import { decisionsToSee, decisionsToSeeSql } from './approvals/repository.js';
import { JsonText } from '../lib/json-text.js';
import { isoTimestampSql } from '../db/sql-json.js';
import { moveJob } from './job-state.js';
import { releaseBlockers } from './findings.service.js';
import { cancelWaitingDepositsOfJob } from './deposits.service.js';
import type { Deps } from './deps.js';

type JobListQuery = z.output<typeof jobListQuerySchema>;
type JobUpdate = z.output<typeof jobUpdateSchema>;
type JobTransition = z.output<typeof jobTransitionSchema>;

function toDto(j: JobRow | JobView, seen: Map<string, JobDecisionsToSee> = new Map()): JobDto {
  return {
    id: j.id,
    number: j.number,
    aircraftId: j.aircraftId,
    registration: j.aircraft.registration,
    aircraftType: j.aircraft.type,
    customerId: j.aircraft.customerId,
    customerName: j.aircraft.customer.name,
    title: j.title,
    type: j.type,
    state: j.state,
    bookedInOn: j.bookedInOn,
    dueOn: j.dueOn,
    notes: j.notes,
    scopeCautions: j.scopeCautions ?? [],
    version: j.version,
    createdAt: j.createdAt.toISOString(),
    updatedAt: j.updatedAt.toISOString(),
    decisionsToSee: seen.get(j.id) ?? null,
  };
}

/** Staff see which owners' decisions nobody has marked seen; owners never get the flag. */
async function unseenFor(scope: Scope, ids: string[]): Promise<Map<string, JobDecisionsToSee>> {
  return scope.role === 'owner' ? new Map() : decisionsToSee(ids);
}

export async function listJobs(scope: Scope, q: JobListQuery): Promise<Page<JobDto>> {
  const where: Record<string | symbol, unknown> = {};
  if (q.state) where.state = q.state;
  if (q.aircraftId) where.aircraftId = q.aircraftId;
  if (q.q) {
    const like = likePattern(q.q);
    where[Op.or] = [
      { number: { [Op.iLike]: like } },
      { title: { [Op.iLike]: like } },
      { '$aircraft.registration$': { [Op.iLike]: like } },
      { '$aircraft.customer.name$': { [Op.iLike]: like } },
    ];
  }
  const order = orderFrom(
    q,
    {
      number: '"Job"."number"',
      title: 'lower("Job"."title")',
      type: '"Job"."type"',
      bookedInOn: '"Job"."booked_in_on"',
      dueOn: '"Job"."due_on"',
      state: '"Job"."state"',
      registration: '"aircraft"."registration"',
      updatedAt: '"Job"."updated_at"',
    },
    'number',
  );
  const { rows, count } = await Job.findAndCountAll({
    where: inWorkshop(scope, where as WhereOptions<Job>),
    include: scopedInclude(scope),
    order: boundSequelize().literal(`${order} NULLS LAST, "Job"."id" ASC`),
    ...pageWindow(q),
    subQuery: false,
    distinct: true,
    // Plain nested rows: a list page only shows them.
    raw: true,
    nest: true,
  });
  const seen = await unseenFor(scope, rows.map((r) => r.id));
  return { items: rows.map((r) => toDto(r as unknown as JobView, seen)), total: count, page: q.page, pageSize: q.pageSize };
}

export async function getJob(scope: Scope, id: string): Promise<JobDto> {
  const job = await viewJob(scope, id);
  return toDto(job, await unseenFor(scope, [job.id]));
}

type JobReadRow = SessionRow & { j_id: string | null; answer: string | null };

/**
 * The job answer (JobDto) written by PostgreSQL as JSON text, so Node neither parses its columns nor
 * serialises it again: the route sends these bytes. Field for field what getJob answers
 * (reads-one-statement.test.ts compares the two); dates as toISOString writes them.
 */
const JOB_ANSWER_SQL = `json_build_object(
    'id', jb.id, 'number', jb.number, 'aircraftId', jb.aircraft_id, 'registration', jb.registration,
    'aircraftType', jb.aircraft_type, 'customerId', jb.customer_id, 'customerName', jb.customer_name,
    'title', jb.title, 'type', jb.type, 'state', jb.state, 'bookedInOn', jb.booked_in_on, 'dueOn', jb.due_on,
    'notes', jb.notes, 'scopeCautions', coalesce(jb.scope_cautions, '[]'::jsonb), 'version', jb.version,
    'createdAt', ${isoTimestampSql('jb.created_at')}, 'updatedAt', ${isoTimestampSql('jb.updated_at')},
    'decisionsToSee', CASE WHEN s.role <> 'owner' THEN ${decisionsToSeeSql('jb.id')} END
  )::text`;

/**
 * GET /api/jobs/:id in one statement: the session check (SESSION_SQL), the job under findJob's
 * access rule with its aircraft and owner, and for staff the decisions nobody has marked seen.
 * The same answer as getJob, as JSON text made by PostgreSQL; it is sent only after the session is accepted.
 */
export async function readJobSignedIn(claims: TokenClaims, id: string): Promise<{ session: SessionRow | undefined; answer: () => JsonText }> {
  const rows = await preparedRows<JobReadRow>(
    boundSequelize(),
    'job-read',
    `WITH s AS (${SESSION_SQL})
     SELECT s.*, jb.id AS j_id, CASE WHEN jb.id IS NOT NULL THEN ${JOB_ANSWER_SQL} END AS answer
       FROM s ${jobInSessionSql('$3')}`,
    [claims.sub, claims.sid, id],
  );
  const r = rows[0];
  return {
    session: r,
    answer: () => {
      if (!r?.j_id || r.answer === null) throw notFound('That job');
      return new JsonText(r.answer);
    },
  };
}

/** Gap-free per workshop: the counter row is locked by the UPDATE and rolls back with a failed create. */
async function nextJobNumber(scope: Scope, t: Transaction): Promise<string> {
  const [rows] = await boundSequelize().query(
    `INSERT INTO job_counters (workshop_id, last_number) VALUES ($1, 1)
     ON CONFLICT (workshop_id) DO UPDATE SET last_number = job_counters.last_number + 1
     RETURNING last_number`,
    { bind: [scope.workshopId], transaction: t },
  );
  const n = Number((rows as { last_number: number }[])[0]!.last_number);
  return `J-${String(n).padStart(4, '0')}`;
}

export async function createJob(scope: Scope, input: JobCreate): Promise<JobDto> {
  requireStaff(scope);
  const id = await inTransaction(async (t) => {
    const aircraft = await Aircraft.findOne({ where: inWorkshop(scope, { id: input.aircraftId }), transaction: t });
    if (!aircraft) throw new AppError('not_found', 404, 'That aircraft was not found.', { aircraftId: 'That aircraft was not found.' });
    const number = await nextJobNumber(scope, t);
    const { templateId, ...fields } = input;
    const job = await Job.create({ ...fields, workshopId: scope.workshopId, number, state: 'booked_in' }, { transaction: t });
    await ensureEstimate(scope, job.id, t);
    const template = templateId ? await applyTemplate(scope, job.id, templateId, t) : null;
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'job.booked_in',
      summary: `Booked in ${aircraft.registration} as ${number}: ${job.title}${template ? ` (from template ${template.name}: ${template.lines} scope lines, ${template.checks} checks)` : ''}`,
      detail: { number, aircraftId: aircraft.id, type: job.type, bookedInOn: job.bookedInOn, dueOn: job.dueOn, templateId },
    });
    return job.id;
  });
  return getJob(scope, id);
}

export async function updateJob(scope: Scope, id: string, input: JobUpdate): Promise<JobDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const job = await findJob(scope, id, t, true);
    if (job.version !== input.version) throw staleVersion();
    const state: JobState = job.state;
    if (state === 'closed' || state === 'cancelled') {
      throw new AppError('invalid_transition', 409, `A ${JOB_STATE_LABELS[state].toLowerCase()} job cannot be changed.`);
    }
    const { version: _v, ...changes } = input;
    const bookedInOn = changes.bookedInOn ?? job.bookedInOn;
    const dueOn = changes.dueOn === undefined ? job.dueOn : changes.dueOn;
    if (dueOn && dueOn < bookedInOn) {
      throw new AppError('validation_failed', 400, 'Some fields need attention.', { dueOn: 'The due date cannot be before booking in.' });
    }
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(changes)) {
      const old = job.get(k as keyof Job);
      if (v !== undefined && old !== v) {
        before[k] = old;
        after[k] = v;
      }
    }
    await job.update(changes, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'job.updated',
      summary: Object.keys(after).length ? `Changed ${Object.keys(after).join(', ')}` : 'Saved without changes',
      detail: { before, after },
    });
  });
  return getJob(scope, id);
}

/** Engineers may only start an inspection; every other move is a manager's or admin's. */
function mayMove(scope: Scope, from: JobState, to: JobState): boolean {
  if (scope.role === 'admin' || scope.role === 'manager') return true;
  return scope.role === 'engineer' && from === 'booked_in' && to === 'inspecting';
}

export async function transitionJob(deps: Deps, scope: Scope, id: string, input: JobTransition): Promise<JobDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const job = await findJob(scope, id, t, true);
    if (!mayMove(scope, job.state, input.to)) throw forbidden('Your role cannot make this change to a job.');
    if (job.version !== input.version) throw staleVersion();
    assertJobMove(job.state, input.to);
    // Invoiced and paid follow from the invoice and the money (services/invoices), never from a button.
    const byMoney = JOB_STATE_BY_MONEY_REASON[input.to];
    if (byMoney) throw new AppError('invalid_transition', 409, byMoney);
    if (input.to === 'ready_for_release') {
      const blocker = await releaseBlockers(scope, job.id, t);
      if (blocker) throw new AppError('invalid_transition', 409, blocker);
    }
    if (input.to === 'in_work') {
      // "Start work" needs the owner's agreement to the quote (online, by phone, or recorded before).
      const check = canStartWork({ unagreedLines: await unagreedQuoteLines(job.id, t) });
      if (!check.ok) throw new AppError('invalid_transition', 409, check.reason);
    }
    await moveJob(scope, job, input.to, input.reason ?? '', t);
    if (input.to === 'cancelled') await cancelWaitingDepositsOfJob(deps, scope, job.id, t);
  });
  return getJob(scope, id);
}

export async function jobHistory(scope: Scope, id: string): Promise<AuditEventDto[]> {
  requireStaff(scope);
  const job = await findJob(scope, id);
  const events = await AuditEvent.findAll({
    where: inWorkshop(scope, { jobId: job.id }),
    include: [{ model: User, as: 'actor', required: false, attributes: ['name', 'role'] }],
    order: [['at', 'ASC'], ['id', 'ASC']],
  });
  return events.map((e) => ({
    id: e.id,
    at: e.at.toISOString(),
    actorName: e.actor?.name ?? null,
    actorRole: e.actor?.role ?? null,
    action: e.action,
    summary: e.summary,
    detail: e.detail,
  }));
}
