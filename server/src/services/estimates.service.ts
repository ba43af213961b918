import { randomUUID } from 'node:crypto';
import { QueryTypes, Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  ESTIMATE_STAGES,
  FINDING_STATE_LABELS,
  estimateEngineInput,
  priceEstimate,
  type AccessTaskDto,
  type EstimateDto,
  type EstimateLineDto,
  type JobState,
  type PricedEstimate,
  type estimateSaveSchema,
} from '@wingstage/shared';
import { AppError, conflict } from '../errors/app-error.js';
import { AccessTask, Estimate, EstimateLine, Finding, JobChecklistItem, JobTemplate, type Workshop, boundSequelize } from '../models/index.js';
import { recordAudit } from './audit.js';
import { assertSuppliers, loadParts } from './catalogue.service.js';
import { findJob, viewJob, type JobRow } from './job-access.js';
import { labourRate, loadWorkshop, pricingOf } from './pricing.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';

type EstimateSave = z.output<typeof estimateSaveSchema>;

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

export function lineDto(l: EstimateLine): EstimateLineDto {
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
  };
}

function taskDto(a: AccessTask): AccessTaskDto {
  return { id: a.id, name: a.name, hours: a.hours, labourRateCode: a.labourRateCode, ratePerHour: a.ratePerHour, vatRate: a.vatRate };
}

const stageOrder = (s: string) => ESTIMATE_STAGES.indexOf(s as (typeof ESTIMATE_STAGES)[number]);

export async function loadLines(scope: Scope, jobId: string, t?: Transaction): Promise<{ lines: EstimateLineDto[]; accessTasks: AccessTaskDto[] }> {
  const [lines, tasks] = await Promise.all([
    // Plain rows: up to 2,000 lines become DTOs at once, and model instances cost more than the query.
    EstimateLine.findAll({ where: inWorkshop(scope, { jobId }), order: [['sortOrder', 'ASC'], ['id', 'ASC']], transaction: t, raw: true }),
    AccessTask.findAll({ where: inWorkshop(scope, { jobId }), order: [['sortOrder', 'ASC'], ['id', 'ASC']], transaction: t, raw: true }),
  ]);
  const sorted = [...lines].sort((a, b) => stageOrder(a.stage) - stageOrder(b.stage));
  return { lines: sorted.map(lineDto), accessTasks: tasks.map(taskDto) };
}

function priced(w: Workshop, lines: EstimateLineDto[], tasks: AccessTaskDto[]): PricedEstimate {
  return priceEstimate(estimateEngineInput(lines, tasks), pricingOf(w));
}

async function estimateDto(scope: Scope, jobId: string, t?: Transaction): Promise<EstimateDto> {
  const run = async (tx: Transaction) => {
    // A read takes the existing row; only a job made outside the service needs its row inserted.
    const est = (await Estimate.findOne({ where: inWorkshop(scope, { jobId }), transaction: tx, raw: true })) ?? (await ensureEstimate(scope, jobId, tx));
    const w = await loadWorkshop(scope, tx);
    const { lines, accessTasks } = await loadLines(scope, jobId, tx);
    return { jobId, version: est.version, currency: w.currency, lines, accessTasks, priced: priced(w, lines, accessTasks) };
  };
  // Repeatable read: the version and the lines come from one snapshot, even while someone saves.
  return t ? run(t) : boundSequelize().transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ }, run);
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

const money = (currency: string, amount: string) => (currency === 'GBP' ? `£${amount}` : `${amount} ${currency}`);

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
 */
export async function saveEstimate(
  scope: Scope,
  jobId: string,
  input: EstimateSave,
  /** Runs in the save's transaction after the lines are written (a sent request whose price changed is replaced here). */
  afterSave?: (job: JobRow, t: Transaction) => Promise<void>,
): Promise<EstimateDto> {
  requireStaff(scope);
  return boundSequelize().transaction(async (t) => {
    const job = await findJob(scope, jobId, t);
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
    if (Object.keys(fields).length) throw invalid(fields);
    await loadParts(scope, input.lines.map((l) => l.partId), (i) => `lines.${i}.partId`, t);
    await assertSuppliers(scope, input.lines.map((l) => l.supplierId), (i) => `lines.${i}.supplierId`, t);

    const before = priced(w, current.lines, current.accessTasks);
    const editableBefore = current.lines.filter((l) => !keptIds.has(l.id));

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
    if (input.lines.length) {
      await EstimateLine.bulkCreate(
        input.lines.map((l, i) => ({ ...l, jobId: job.id, workshopId: scope.workshopId, sortOrder: base + i })),
        { transaction: t },
      );
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
    const from = money(w.currency, before.ifAllApproved.gross);
    const to = money(w.currency, after.priced.ifAllApproved.gross);
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
  const q = boundSequelize();
  const priced = await q.query<{ seq: number }>(
    `UPDATE findings SET state = 'priced', version = version + 1, updated_at = now()
     WHERE job_id = $1 AND state = 'draft'
       AND id IN (SELECT finding_id FROM estimate_lines WHERE job_id = $1 AND stage = 'discovered' AND finding_id IS NOT NULL)
     RETURNING seq`,
    { bind: [jobId], transaction: t, type: QueryTypes.SELECT },
  );
  const draft = await q.query<{ seq: number }>(
    `UPDATE findings SET state = 'draft', version = version + 1, updated_at = now()
     WHERE job_id = $1 AND state = 'priced'
       AND id NOT IN (SELECT finding_id FROM estimate_lines WHERE job_id = $1 AND finding_id IS NOT NULL)
     RETURNING seq`,
    { bind: [jobId], transaction: t, type: QueryTypes.SELECT },
  );
  const seqs = (rows: { seq: number }[]) => rows.map((r) => Number(r.seq)).sort((x, y) => x - y);
  return { priced: seqs(priced), draft: seqs(draft) };
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
      template.checklist.map((c, i) => ({ workshopId: scope.workshopId, jobId, sortOrder: i, section: c.section, text: c.text, limit: c.limit })),
      { transaction: t },
    );
  }
  return { name: template.name, lines: lines.length, checks: template.checklist.length };
}
