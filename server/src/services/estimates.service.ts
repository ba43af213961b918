import { randomUUID } from 'node:crypto';
import { QueryTypes, Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  formatMoney,
  ESTIMATE_STAGES,
  quoteStateOf,
  type AgreedHow,
  type EstimateQuoteDto,
  type EstimateStage,
  type quotePhoneAgreementSchema,
  FINDING_STATE_LABELS,
  estimateEngineInput,
  lineFiguresOf,
  priceEstimate,
  type AccessTaskDto,
  type EstimateDto,
  type EstimateLineDto,
  type JobState,
  type PricedEstimate,
  type estimateSaveSchema,
  type WorkshopDto,
  workshopPricingFrom,
  workshopSettingsSchema,
} from '@wingstage/shared';
import { AppError, conflict } from '../errors/app-error.js';
import { AccessTask, Estimate, EstimateLine, Finding, Job, JobChecklistItem, JobTemplate, type Workshop, boundSequelize } from '../models/index.js';
import { preparedRows } from '../db/prepared.js';
import { recordAudit } from './audit.js';
import { quoteFactsSql, quoteRequestFacts } from './approvals/repository.js';
import { SESSION_SQL, type SessionRow } from './session-row.js';
import type { TokenClaims } from '../lib/session-tokens.js';
import { notFound } from '../errors/app-error.js';
import { findingIdsIn, moveFindings } from './findings.repository.js';
import { assertSuppliers, loadParts } from './catalogue.service.js';
import { inTransaction } from '../db/transaction.js';
import { findJob, jobInSessionSql, lockJob, lockOpenRequests, viewJob, type JobRow } from './job-access.js';
import { labourRate, loadWorkshop, pricingOf } from './pricing.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';

type EstimateSave = z.output<typeof estimateSaveSchema>;
type PhoneAgreement = z.output<typeof quotePhoneAgreementSchema>;

/** Once invoiced (or finished), the estimate is the record of what was agreed and stays as it is. */
const FROZEN: readonly JobState[] = ['invoiced', 'paid', 'closed', 'cancelled'];

export function assertEstimateEditable(job: JobRow): void {
  if (FROZEN.includes(job.state)) {
    throw conflict(`This job is ${job.state.replace('_', ' ')}; its estimate can no longer be changed.`);
  }
}

/** Every job has one estimate; a job created outside the service gets its row the first time it is needed. */
export async function ensureEstimate(scope: Scope, jobId: string, t: Transaction, lock = false): Promise<Estimate> {
  await boundSequelize().query(`INSERT INTO estimates (workshop_id, job_id) VALUES ($1, $2) ON CONFLICT (job_id) DO NOTHING`, {
    bind: [scope.workshopId, jobId],
    transaction: t,
  });
  const est = await Estimate.findOne({ where: inWorkshop(scope, { jobId }), transaction: t, lock: lock ? t.LOCK.UPDATE : undefined });
  if (!est) throw new AppError('internal', 500, 'The estimate could not be opened.');
  return est;
}

/** What lineDto reads: a model row (agreedAt a Date) or the one-statement read's JSON (agreedAt text). */
type LineSource = Omit<EstimateLineDto, 'agreedAt' | 'agreedHow'> & { agreedAt: Date | string | null; agreedHow: EstimateLineDto['agreedHow'] | undefined };

/** Written out field by field: a spread followed by more keys is slow, and this runs once per line. */
export function lineDto(l: LineSource): EstimateLineDto {
  return {
    id: l.id,
    stage: l.stage,
    kind: l.kind,
    description: l.description,
    quantity: l.quantity,
    labourRateCode: l.labourRateCode,
    ratePerHour: l.ratePerHour,
    partId: l.partId,
    supplierId: l.supplierId,
    unitCost: l.unitCost,
    unitPrice: l.unitPrice,
    markupPercent: l.markupPercent,
    amount: l.amount,
    vatRate: l.vatRate,
    findingId: l.findingId,
    accessTaskId: l.accessTaskId,
    discountPercent: l.discountPercent,
    agreedAt: l.stage === 'inspection' && l.agreedAt ? new Date(l.agreedAt).toISOString() : null,
    agreedHow: l.stage === 'inspection' ? (l.agreedHow ?? null) : null,
  };
}

function taskDto(a: AccessTask): AccessTaskDto {
  return { id: a.id, name: a.name, hours: a.hours, labourRateCode: a.labourRateCode, ratePerHour: a.ratePerHour, vatRate: a.vatRate };
}

const stageOrder = (s: string) => ESTIMATE_STAGES.indexOf(s as (typeof ESTIMATE_STAGES)[number]);

/** Who agreed an inspection line of the quote, how and when (null while unagreed). */
type Agreement = Pick<EstimateLine, 'agreedAt' | 'agreedHow' | 'agreedBy'>;

export async function loadLines(scope: Scope, jobId: string, t?: Transaction): Promise<{ lines: EstimateLineDto[]; accessTasks: AccessTaskDto[]; agreements: Agreement[] }> {
  const [lines, tasks] = await Promise.all([
    // Plain rows: up to 2,000 lines become DTOs at once, and model instances cost more than the query.
    EstimateLine.findAll({ where: inWorkshop(scope, { jobId }), order: [['sortOrder', 'ASC'], ['id', 'ASC']], transaction: t, raw: true }),
    AccessTask.findAll({ where: inWorkshop(scope, { jobId }), order: [['sortOrder', 'ASC'], ['id', 'ASC']], transaction: t, raw: true }),
  ]);
  const sorted = [...lines].sort((a, b) => stageOrder(a.stage) - stageOrder(b.stage));
  const agreements = lines.filter((l) => l.stage === 'inspection').map((l) => ({ agreedAt: l.agreedAt, agreedHow: l.agreedHow, agreedBy: l.agreedBy }));
  return { lines: sorted.map(lineDto), accessTasks: tasks.map(taskDto), agreements };
}

function priced(w: Workshop, lines: EstimateLineDto[], tasks: AccessTaskDto[]): PricedEstimate {
  return priceEstimate(estimateEngineInput(lines, tasks), pricingOf(w));
}

/** The quote's state, derived from the inspection lines' agreement and the requests that hold it. */
function quoteOf(p: PricedEstimate, rows: Agreement[], facts: { openRequestId: string | null; lastDecision: 'approve' | 'decline' | null }): EstimateQuoteDto {
  const agreed = rows.filter((r) => r.agreedAt !== null);
  const last = agreed.reduce<Agreement | null>((a, r) => (a === null || r.agreedAt! > a.agreedAt! ? r : a), null);
  return {
    state: quoteStateOf({ agreedLines: agreed.length, unagreedLines: rows.length - agreed.length, quoteRequestOpen: facts.openRequestId !== null, lastQuoteDecision: facts.lastDecision }),
    awaitingGross: p.quoteAwaiting.gross,
    agreedBy: last?.agreedBy ?? null,
    agreedAt: last?.agreedAt ? last.agreedAt.toISOString() : null,
    agreedHow: last?.agreedHow ?? null,
    openRequestId: facts.openRequestId,
  };
}

async function quoteDto(jobId: string, p: PricedEstimate, rows: Agreement[], t: Transaction): Promise<EstimateQuoteDto> {
  return quoteOf(p, rows, await quoteRequestFacts(jobId, t));
}

async function estimateDto(scope: Scope, jobId: string, t?: Transaction): Promise<EstimateDto> {
  const run = async (tx: Transaction) => {
    // A read takes the existing row; only a job made outside the service needs its row inserted.
    const est = (await Estimate.findOne({ where: inWorkshop(scope, { jobId }), transaction: tx, raw: true })) ?? (await ensureEstimate(scope, jobId, tx));
    const w = await loadWorkshop(scope, tx);
    // The quote's agreement comes from the lines just read (no second look at them).
    const { lines, accessTasks, agreements } = await loadLines(scope, jobId, tx);
    const p = priced(w, lines, accessTasks);
    return { jobId, version: est.version, currency: w.currency, lines, accessTasks, priced: lineFiguresOf(p), quote: await quoteDto(jobId, p, agreements, tx) };
  };
  // Repeatable read: the version and the lines come from one snapshot, even while someone saves.
  return t ? run(t) : inTransaction(run, { isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ });
}

/** An estimate line as the one-statement read's JSON carries it: numbers as decimal strings, times as text. */
type LineJson = Omit<EstimateLineDto, 'agreedAt'> & { agreedAt: string | null; agreedBy: string | null };

/** What the estimate answer's key is made of (estimateAnswerKey), beside the session row. */
export type EstimateKeyRow = SessionRow & {
  j_id: string | null;
  /** bigint as text; null while the job has no estimate row (the ordinary read makes it). */
  est_revision: string | null;
  pricing_revision: string;
};

/**
 * The key of one estimate answer: the job, who reads it (an owner's answer has buying costs
 * blanked; every staff role reads the same), the estimate's revision and the workshop's pricing
 * revision. PostgreSQL changes one of the two revisions in the transaction of every write that can
 * change the answer (migration 0200), and nothing else goes into the answer: it reads no clock.
 */
export function estimateAnswerKey(r: Pick<EstimateKeyRow, 'j_id' | 'role' | 'est_revision' | 'pricing_revision'>): string | null {
  if (!r.j_id || r.est_revision === null) return null;
  return `${r.j_id}.${r.role === 'owner' ? 'o' : 's'}.${r.est_revision}.${r.pricing_revision}`;
}

/**
 * Only the key of GET /api/jobs/:id/estimate, in one prepared statement: the session row, the job
 * under findJob's access rule, the estimate's revision and the workshop's pricing revision. A read
 * that holds an answer made for this key sends it without reading the lines.
 */
export async function readEstimateKey(claims: TokenClaims, jobId: string): Promise<EstimateKeyRow | undefined> {
  const rows = await preparedRows<EstimateKeyRow>(
    boundSequelize(),
    'estimate-key',
    `WITH s AS (${SESSION_SQL})
     SELECT s.*, jb.id AS j_id, e.revision AS est_revision, w.pricing_revision
       FROM s ${jobInSessionSql('$3')}
       JOIN workshops w ON w.id = s."workshopId"
       LEFT JOIN estimates e ON e.job_id = jb.id AND e.workshop_id = s."workshopId"`,
    [claims.sub, claims.sid, jobId],
  );
  return rows[0];
}

type EstimateReadRow = EstimateKeyRow & {
  est_version: number | null;
  vat_rates: WorkshopDto['vatRates'];
  settings: Record<string, unknown> | null;
  lines: LineJson[];
  tasks: AccessTaskDto[];
  open_id: string | null;
  decision: 'approve' | 'decline' | null;
};

const LINE_JSON = `json_build_object(
  'id', l.id, 'stage', l.stage, 'kind', l.kind, 'description', l.description, 'quantity', l.quantity::text,
  'labourRateCode', l.labour_rate_code, 'ratePerHour', l.rate_per_hour::text, 'partId', l.part_id, 'supplierId', l.supplier_id,
  'unitCost', l.unit_cost::text, 'unitPrice', l.unit_price::text, 'markupPercent', l.markup_percent::text, 'amount', l.amount::text,
  'vatRate', l.vat_rate, 'findingId', l.finding_id, 'accessTaskId', l.access_task_id, 'discountPercent', l.discount_percent::text,
  'agreedAt', l.agreed_at, 'agreedHow', l.agreed_how, 'agreedBy', l.agreed_by)`;
const TASK_JSON = `json_build_object('id', a.id, 'name', a.name, 'hours', a.hours::text, 'labourRateCode', a.labour_rate_code,
  'ratePerHour', a.rate_per_hour::text, 'vatRate', a.vat_rate)`;
// loadLines' order: by stage (ESTIMATE_STAGES; an unknown stage first), then sort order and id.
const STAGE_ORDER = `coalesce(array_position(ARRAY[${ESTIMATE_STAGES.map((x) => `'${x}'`).join(', ')}]::text[], l.stage), 0)`;

/**
 * GET /api/jobs/:id/estimate in ONE statement: the session check, the job under findJob's access
 * rule, the estimate's version, the workshop's pricing settings, every line and access task (as
 * JSON arrays, decimals as strings) and the quote's request facts. One statement reads one
 * snapshot, so the version and the lines agree without a repeatable-read transaction. Priced by
 * ./shared's engine exactly as estimateDto does; the same answer, field by field.
 *
 * Returns null (the caller takes the ordinary path) for a job whose estimate row does not exist
 * yet: that read inserts it. `key` is the answer's key (estimateAnswerKey) read in the same
 * statement, so an answer kept under it was made from exactly the rows that key stands for.
 */
export async function readEstimateSignedIn(
  claims: TokenClaims,
  jobId: string,
): Promise<{ session: SessionRow | undefined; key: string | null; answer: () => EstimateDto } | null> {
  const rows = await preparedRows<EstimateReadRow>(
    boundSequelize(),
    'estimate-read',
    `WITH s AS (${SESSION_SQL})
     SELECT s.*, jb.id AS j_id, e.version AS est_version, e.revision AS est_revision, w.pricing_revision, w.vat_rates, w.settings,
            CASE WHEN jb.id IS NULL THEN '[]'::json ELSE coalesce((SELECT json_agg(${LINE_JSON} ORDER BY ${STAGE_ORDER}, l.sort_order, l.id)
               FROM estimate_lines l WHERE l.job_id = jb.id AND l.workshop_id = s."workshopId"), '[]'::json) END AS lines,
            CASE WHEN jb.id IS NULL THEN '[]'::json ELSE coalesce((SELECT json_agg(${TASK_JSON} ORDER BY a.sort_order, a.id)
               FROM access_tasks a WHERE a.job_id = jb.id AND a.workshop_id = s."workshopId"), '[]'::json) END AS tasks,
            ${quoteFactsSql('jb.id')}
       FROM s ${jobInSessionSql('$3')}
       JOIN workshops w ON w.id = s."workshopId"
       LEFT JOIN estimates e ON e.job_id = jb.id AND e.workshop_id = s."workshopId"`,
    [claims.sub, claims.sid, jobId],
  );
  const r = rows[0];
  // A job without its estimate row yet: the ordinary read makes it (after its own session check).
  if (r?.j_id && r.est_version === null) return null;
  return {
    session: r,
    // The key of this answer, from the same snapshot as its lines.
    key: r ? estimateAnswerKey(r) : null,
    answer: () => {
      if (!r?.j_id || r.est_version === null) throw notFound('That job');
      const lines: EstimateLineDto[] = [];
      const agreements: Agreement[] = [];
      for (const l of r.lines) {
        const line = lineDto(l);
        lines.push(line);
        if (line.stage === 'inspection') agreements.push({ agreedAt: line.agreedAt ? new Date(line.agreedAt) : null, agreedHow: line.agreedHow, agreedBy: l.agreedBy });
      }
      const pricing = workshopPricingFrom({ currency: r.currency, vatRates: r.vat_rates, settings: workshopSettingsSchema.parse(r.settings ?? {}) });
      const p = priceEstimate(estimateEngineInput(lines, r.tasks), pricing);
      const dto: EstimateDto = {
        jobId: r.j_id,
        version: r.est_version,
        currency: r.currency,
        lines,
        accessTasks: r.tasks,
        priced: lineFiguresOf(p),
        quote: quoteOf(p, agreements, { openRequestId: r.open_id, lastDecision: r.decision }),
      };
      return r.role === 'owner' ? forOwner(dto) : dto;
    },
  };
}

/** Inspection lines still awaiting the owner's agreement (work may not start while any does). */
export async function unagreedQuoteLines(jobId: string, t?: Transaction): Promise<number> {
  return EstimateLine.count({ where: { jobId, stage: 'inspection', agreedAt: null }, transaction: t });
}

/**
 * Owners see prices, not the workshop's buying costs or margins: those fields are blanked for them
 * (the totals are unchanged, being worked on the server before this).
 */
function forOwner(dto: EstimateDto): EstimateDto {
  return {
    ...dto,
    lines: dto.lines.map((l) => ({ ...l, unitCost: null, markupPercent: null, supplierId: null, amount: l.kind === 'subcontract' ? null : l.amount })),
    priced: { ...dto.priced, lines: dto.priced.lines.map((l) => ({ ...l, cost: null })) },
  };
}

export async function getEstimate(scope: Scope, jobId: string): Promise<EstimateDto> {
  const job = await viewJob(scope, jobId);
  const dto = await estimateDto(scope, job.id);
  return scope.role === 'owner' ? forOwner(dto) : dto;
}


/** What prices a line: a change to any of these unagrees an agreed inspection line. */
const PRICED_LINE_FIELDS = ['kind', 'quantity', 'labourRateCode', 'ratePerHour', 'unitCost', 'unitPrice', 'markupPercent', 'amount', 'vatRate', 'discountPercent', 'accessTaskId'] as const;
const PRICED_TASK_FIELDS = ['hours', 'ratePerHour', 'vatRate'] as const;

const SAME_FIELDS: (keyof EstimateLineDto)[] = [
  'stage', 'kind', 'description', 'quantity', 'labourRateCode', 'ratePerHour', 'partId', 'supplierId', 'unitCost',
  'unitPrice', 'markupPercent', 'amount', 'vatRate', 'findingId', 'accessTaskId', 'discountPercent',
];

/** Decimal strings compare by value: "1" and "1.00" are the same quantity. */
function sameValue(a: unknown, b: unknown): boolean {
  if (typeof a === 'string' && typeof b === 'string' && /^\d+(\.\d+)?$/.test(a) && /^\d+(\.\d+)?$/.test(b)) {
    return a.replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '') === b.replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
  }
  return a === b;
}

function countChanged(before: EstimateLineDto[], after: EstimateLineDto[]): number {
  const old = new Map(before.map((l) => [l.id, l]));
  let n = 0;
  for (const l of after) {
    const o = old.get(l.id);
    if (!o || SAME_FIELDS.some((f) => !sameValue(o[f], l[f]))) n += 1;
    old.delete(l.id);
  }
  return n + old.size;
}

function invalid(fields: Record<string, string>): AppError {
  return new AppError('validation_failed', 400, 'Some fields need attention.', fields);
}

/**
 * Replaces the inspection-scope and discovered lines and the access tasks. The estimate row is
 * locked and its version compared, so of two editors who loaded the same version exactly one saves.
 * Locks in the server's one order: job, its open approval requests (a price change replaces them),
 * then the estimate.
 */
export async function saveEstimate(
  scope: Scope,
  jobId: string,
  input: EstimateSave,
  /** Runs in the save's transaction after the lines are written (a sent request whose price changed is replaced here). */
  afterSave?: (job: JobRow, t: Transaction) => Promise<void>,
): Promise<EstimateDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    await lockOpenRequests(job.id, t);
    const est = await ensureEstimate(scope, job.id, t, true);
    if (est.version !== input.version) {
      throw new AppError('stale_version', 409, 'Someone else changed this estimate since you opened it. Their version is shown now; make your change again on top of it.', {
        version: String(est.version),
      });
    }
    assertEstimateEditable(job);
    const w = await loadWorkshop(scope, t);
    const current = await loadLines(scope, job.id, t);
    const kept = current.lines.filter((l) => l.stage === 'approved' || l.stage === 'declined');
    const keptIds = new Set(kept.map((l) => l.id));

    const fields: Record<string, string> = {};
    const findingIds = [...new Set(input.lines.map((l) => l.findingId).filter((x): x is string => !!x))];
    const findings = new Map(
      (findingIds.length ? await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: findingIds }), transaction: t }) : []).map((f) => [f.id, f]),
    );
    input.lines.forEach((l, i) => {
      if (keptIds.has(l.id)) fields[`lines.${i}.id`] = 'That id belongs to a line the owner has decided on.';
      if (!l.findingId) return;
      const f = findings.get(l.findingId);
      if (!f) fields[`lines.${i}.findingId`] = 'That finding is not on this job.';
      else if (l.stage === 'inspection') fields[`lines.${i}.findingId`] = 'Inspection-scope lines do not belong to a finding; put the remedy in discovered work.';
      else if (f.state === 'withdrawn' || f.state === 'approved' || f.state === 'approved_within_limit') {
        fields[`lines.${i}.findingId`] = `F-${f.seq} is ${FINDING_STATE_LABELS[f.state].toLowerCase()}; its lines can no longer be changed here.`;
      }
    });
    const newTasks = new Set(input.accessTasks.map((a) => a.id));
    for (const l of kept) {
      if (l.accessTaskId && !newTasks.has(l.accessTaskId)) {
        const name = current.accessTasks.find((a) => a.id === l.accessTaskId)?.name ?? 'An access task';
        fields.accessTasks = `${name} is used by work the owner has decided on and must stay on the estimate.`;
      }
    }
    // An access task id is new or this job's own: the save upserts by id, so another job's id must never reach it.
    if (input.accessTasks.length) {
      const foreign = await boundSequelize().query<{ id: string }>(`SELECT id FROM access_tasks WHERE id = ANY($1::uuid[]) AND job_id <> $2`, {
        bind: [input.accessTasks.map((a) => a.id), job.id],
        type: QueryTypes.SELECT,
        transaction: t,
      });
      const taken = new Set(foreign.map((r) => r.id));
      input.accessTasks.forEach((a, i) => {
        if (taken.has(a.id)) fields[`accessTasks.${i}.id`] = 'That id is already used elsewhere; give this access task a new one.';
      });
    }
    if (Object.keys(fields).length) throw invalid(fields);
    await loadParts(scope, input.lines.map((l) => l.partId), (i) => `lines.${i}.partId`, t);
    await assertSuppliers(scope, input.lines.map((l) => l.supplierId), (i) => `lines.${i}.supplierId`, t);

    const before = priced(w, current.lines, current.accessTasks);
    const editableBefore = current.lines.filter((l) => !keptIds.has(l.id));

    // The agreement each inspection line had, read before the lines are replaced (lines go before the tasks they name).
    const stored = new Map((await EstimateLine.findAll({ where: { jobId: job.id, stage: 'inspection' }, transaction: t })).map((l) => [l.id, l]));
    await EstimateLine.destroy({ where: inWorkshop(scope, { jobId: job.id, stage: ['inspection', 'discovered'] }), transaction: t });
    const keepTasks = [...newTasks];
    await boundSequelize().query(
      `DELETE FROM access_tasks WHERE job_id = $1 AND workshop_id = $2 AND NOT (id = ANY($3::uuid[]))`,
      { bind: [job.id, scope.workshopId, keepTasks], transaction: t },
    );
    if (input.accessTasks.length) {
      await AccessTask.bulkCreate(
        input.accessTasks.map((a, i) => ({ ...a, jobId: job.id, workshopId: scope.workshopId, sortOrder: i })),
        { transaction: t, updateOnDuplicate: ['name', 'hours', 'labourRateCode', 'ratePerHour', 'vatRate', 'sortOrder'] },
      );
    }
    const base = kept.length;
    // Agreement on an inspection line survives a save only while what prices it is unchanged.
    const taskBefore = new Map(current.accessTasks.map((a) => [a.id, a]));
    const taskAfter = new Map(input.accessTasks.map((a) => [a.id, a]));
    const sameTask = (id: string | null) =>
      id === null || (!!taskBefore.get(id) && !!taskAfter.get(id) && PRICED_TASK_FIELDS.every((f) => sameValue(taskBefore.get(id)![f], taskAfter.get(id)![f])));
    let unagreed = 0;
    const rows = input.lines.map((l, i) => {
      const was = l.stage === 'inspection' ? current.lines.find((c) => c.id === l.id && c.stage === 'inspection') : undefined;
      const row = stored.get(l.id);
      const keep = !!was && !!row && row.agreedAt !== null && PRICED_LINE_FIELDS.every((f) => sameValue(was[f], l[f])) && sameTask(l.accessTaskId);
      if (was && row?.agreedAt && !keep) unagreed += 1;
      const agreement = keep
        ? { agreedAt: row!.agreedAt, agreedHow: row!.agreedHow, agreedBy: row!.agreedBy, agreedRef: row!.agreedRef }
        : { agreedAt: null, agreedHow: null, agreedBy: null, agreedRef: null };
      return { ...l, ...agreement, jobId: job.id, workshopId: scope.workshopId, sortOrder: base + i };
    });
    if (rows.length) await EstimateLine.bulkCreate(rows, { transaction: t });
    const added = input.lines.filter((l) => l.stage === 'inspection' && !stored.has(l.id)).length;
    const hadAgreement = [...stored.values()].some((r) => r.agreedAt !== null);
    if (hadAgreement && (unagreed > 0 || added > 0)) {
      await recordAudit(scope, t, {
        jobId: job.id,
        action: 'estimate.quote_changed',
        summary: `Quote changed since the owner agreed it: ${unagreed} agreed ${unagreed === 1 ? 'line' : 'lines'} changed, ${added} added; the changes wait for the owner`,
        detail: { unagreed, added },
      });
    }
    const moved = await syncFindingStates(job.id, t);
    for (const [to, numbers] of [['priced', moved.priced], ['draft', moved.draft]] as const) {
      if (!numbers.length) continue;
      const list = numbers.map((n) => `F-${n}`).join(', ');
      await recordAudit(scope, t, {
        jobId: job.id,
        action: to === 'priced' ? 'finding.priced' : 'finding.unpriced',
        summary: to === 'priced' ? `Priced ${list}` : `${list} back to draft: no estimate lines left`,
        detail: { numbers },
      });
    }
    await est.update({ version: est.version + 1 }, { transaction: t });
    if (afterSave) await afterSave(job, t);

    const after = await estimateDto(scope, job.id, t);
    const changed = countChanged(editableBefore, input.lines as EstimateLineDto[]);
    const from = formatMoney(before.ifAllApproved.gross, w.currency);
    const to = formatMoney(after.priced.ifAllApproved.gross, w.currency);
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'estimate.saved',
      summary: `Estimate saved: ${changed} ${changed === 1 ? 'line' : 'lines'} changed, total ${from} → ${to} incl. VAT`,
      detail: { version: after.version, linesChanged: changed, totalBefore: before.ifAllApproved.gross, totalAfter: after.priced.ifAllApproved.gross },
    });
    return after;
  });
}

/** A draft finding with discovered lines is priced; a priced one whose lines were all removed is a draft again. */
export async function syncFindingStates(jobId: string, t: Transaction): Promise<{ priced: number[]; draft: number[] }> {
  const lines = await EstimateLine.findAll({ where: { jobId }, attributes: ['findingId', 'stage'], transaction: t });
  const withDiscovered = new Set(lines.filter((l) => l.stage === 'discovered' && l.findingId).map((l) => l.findingId!));
  const withAny = new Set(lines.filter((l) => l.findingId).map((l) => l.findingId!));
  const drafts = (await findingIdsIn(jobId, 'draft', t)).filter((id) => withDiscovered.has(id));
  const priced = (await findingIdsIn(jobId, 'priced', t)).filter((id) => !withAny.has(id));
  return { priced: await moveFindings(jobId, drafts, 'priced', t), draft: await moveFindings(jobId, priced, 'draft', t) };
}

// ─── Stage moves (the owner's decisions reach the estimate only through these) ───────────────

/** Moves findings' lines between stages and bumps the estimate's version so an open builder is told. */
export async function moveFindingLines(jobId: string, findingIds: readonly string[], from: EstimateStage, to: EstimateStage, t: Transaction): Promise<number> {
  if (!findingIds.length) return 0;
  const [n] = await EstimateLine.update({ stage: to }, { where: { jobId, findingId: [...findingIds], stage: from }, transaction: t });
  if (n > 0) await bumpEstimateVersion(jobId, t);
  return n;
}

export interface QuoteAgreement {
  how: AgreedHow;
  by: string;
  at: Date;
  /** The request that carried it (owner_link). */
  ref: string | null;
}

/** Marks every unagreed inspection line agreed; returns how many. */
export async function agreeQuoteLines(jobId: string, a: QuoteAgreement, t: Transaction): Promise<number> {
  const [n] = await EstimateLine.update(
    { agreedAt: a.at, agreedHow: a.how, agreedBy: a.by, agreedRef: a.ref },
    { where: { jobId, stage: 'inspection', agreedAt: null }, transaction: t },
  );
  if (n > 0) await bumpEstimateVersion(jobId, t);
  return n;
}

export async function bumpEstimateVersion(jobId: string, t: Transaction): Promise<void> {
  await Estimate.increment('version', { where: { jobId }, transaction: t });
}

/** The workshop records that the owner agreed the quote by phone: who, when. */
export async function agreeQuoteByPhone(
  scope: Scope,
  jobId: string,
  input: PhoneAgreement,
  /** Runs in the same transaction: a request still holding the quote no longer waits for the owner. */
  afterAgree?: (job: JobRow, t: Transaction) => Promise<void>,
): Promise<EstimateDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await findJob(scope, jobId, t, true);
    assertEstimateEditable(job);
    const est = await ensureEstimate(scope, job.id, t, true);
    if (est.version !== input.estimateVersion) {
      throw new AppError('stale_version', 409, 'The estimate changed since you opened it. Check the quote, then record the agreement again.', { version: String(est.version) });
    }
    const w = await loadWorkshop(scope, t);
    const before = await loadLines(scope, job.id, t);
    const awaiting = priced(w, before.lines, before.accessTasks).quoteAwaiting.gross;
    const n = await agreeQuoteLines(job.id, { how: 'phone', by: input.agreedWith, at: new Date(input.agreedAt), ref: null }, t);
    if (n === 0) throw conflict('Nothing in the quote waits for the owner: every inspection line is already agreed.');
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'estimate.quote_agreed',
      summary: `Quote agreed by phone with ${input.agreedWith} on ${input.agreedAt.slice(0, 16).replace('T', ' ')}: ${n} ${n === 1 ? 'line' : 'lines'}, ${formatMoney(awaiting, w.currency)} incl. VAT${input.note ? ` (${input.note})` : ''}`,
      detail: { how: 'phone', agreedWith: input.agreedWith, agreedAt: input.agreedAt, lines: n, gross: awaiting, note: input.note },
    });
    if (afterAgree) await afterAgree(job, t);
    return estimateDto(scope, job.id, t);
  });
}

/**
 * Booking in from a template: its scope lines become the inspection stage, priced with today's
 * labour rates and catalogue costs, and its checklist becomes the job's. Runs in the booking's
 * transaction, so a bad template books nothing.
 */
export async function applyTemplate(scope: Scope, jobId: string, templateId: string, t: Transaction): Promise<{ name: string; lines: number; checks: number }> {
  const template = await JobTemplate.findOne({ where: inWorkshop(scope, { id: templateId }), transaction: t });
  if (!template) throw invalid({ templateId: 'That template was not found.' });
  if (!template.active) throw invalid({ templateId: 'That template is retired; choose a current one.' });
  const w = await loadWorkshop(scope, t);
  const parts = await loadParts(scope, template.lines.map((l) => l.partId), (i) => `templateId.lines.${i}.partId`, t);
  const lines = template.lines.map((l, i) => {
    const common = {
      jobId, workshopId: scope.workshopId, id: randomUUID(), stage: 'inspection' as const, kind: l.kind, description: l.description,
      quantity: l.quantity, labourRateCode: null as string | null, ratePerHour: null as string | null, partId: null as string | null,
      supplierId: l.supplierId, unitCost: null as string | null, unitPrice: null as string | null, markupPercent: null as string | null,
      amount: null as string | null, vatRate: l.vatRate, findingId: null, accessTaskId: null, discountPercent: null, sortOrder: i,
    };
    if (l.kind === 'labour') {
      const rate = labourRate(w, l.labourRateCode);
      if (!rate || rate.code !== l.labourRateCode) throw invalid({ templateId: `The template names a labour rate (${l.labourRateCode ?? 'none'}) the workshop no longer has.` });
      return { ...common, labourRateCode: rate.code, ratePerHour: rate.ratePerHour };
    }
    if (l.kind === 'part') {
      const p = l.partId ? parts.get(l.partId) : undefined;
      if (p) return { ...common, partId: p.id, supplierId: p.supplierId, unitCost: p.unitCost, unitPrice: p.unitPrice, markupPercent: p.markupPercent, vatRate: p.vatRate };
      return { ...common, unitCost: l.amount };
    }
    return { ...common, amount: l.amount };
  });
  if (lines.length) await EstimateLine.bulkCreate(lines, { transaction: t });
  if (template.checklist.length) {
    await JobChecklistItem.bulkCreate(
      template.checklist.map((c, i) => ({ workshopId: scope.workshopId, jobId, sortOrder: i, section: c.section, text: c.text, limit: c.limit, caution: c.caution ?? '' })),
      { transaction: t },
    );
  }
  const cautions = template.lines.filter((l) => (l.caution ?? '').trim() !== '').map((l) => ({ line: l.description, caution: l.caution }));
  if (cautions.length) await Job.update({ scopeCautions: cautions }, { where: inWorkshop(scope, { id: jobId }), transaction: t });
  return { name: template.name, lines: lines.length, checks: template.checklist.length };
}
