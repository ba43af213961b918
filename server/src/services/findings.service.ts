import Decimal from 'decimal.js';
import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  CHECKLIST_RESULT_LABELS,
  FINDING_CATEGORY_LABELS,
  FINDING_STATE_LABELS,
  assertFindingMove,
  checkLimit,
  describeLimit,
  isOpenAirworthiness,
  type FindingDto,
  type FindingPhotoDto,
  type FindingState,
  type JobChecklistItemDto,
  type JobState,
  type TimeLogDto,
  type checklistRecordSchema,
  type findingActionSchema,
  type findingCreateSchema,
  type findingUpdateSchema,
  type timeLogCreateSchema,
  type timeLogRemoveSchema,
  type timeLogUpdateSchema,
  HOURS_IN_A_DAY,
} from '@wingstage/shared';
import { AppError, conflict, notFound, staleVersion } from '../errors/app-error.js';
import { EstimateLine, Finding, JobChecklistItem, TimeLog, User, boundSequelize } from '../models/index.js';
import { recordAudit } from './audit.js';
import { moveFindings } from './findings.repository.js';
import { loadParts } from './catalogue.service.js';
import { assertEstimateEditable, ensureEstimate } from './estimates.service.js';
import { inTransaction } from '../db/transaction.js';
import { findJob, lockJob, lockOpenRequests, viewJob, type JobRow } from './job-access.js';
import { loadWorkshop } from './pricing.js';
import { photosByFinding } from './photos.service.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';

type FindingCreate = z.output<typeof findingCreateSchema>;
type FindingUpdate = z.output<typeof findingUpdateSchema>;
type FindingAction = z.output<typeof findingActionSchema>;
type ChecklistRecord = z.output<typeof checklistRecordSchema>;
type TimeLogCreate = z.output<typeof timeLogCreateSchema>;
type TimeLogUpdate = z.output<typeof timeLogUpdateSchema>;
type TimeLogRemove = z.output<typeof timeLogRemoveSchema>;

/** The hangar works on a job between starting the inspection and finishing the work. */
const WORKING: readonly JobState[] = ['inspecting', 'awaiting_owner', 'in_work'];

function assertWorking(job: JobRow, what: string): void {
  if (job.state === 'booked_in') throw conflict(`Start the inspection before ${what}.`);
  if (!WORKING.includes(job.state)) throw conflict(`This job is ${job.state.replace(/_/g, ' ')}; ${what} is no longer possible.`);
}

const findingInclude = [
  { model: User, as: 'raiser', required: false, attributes: ['name'] },
  { model: User, as: 'rectifier', required: false, attributes: ['name'] },
];

function findingDto(f: Finding, photos: FindingPhotoDto[]): FindingDto {
  return {
    id: f.id,
    jobId: f.jobId,
    number: `F-${f.seq}`,
    title: f.title,
    location: f.location,
    category: f.category,
    seen: f.seen,
    checklistItemId: f.checklistItemId,
    measuredValue: f.measuredValue,
    limit: f.limit,
    state: f.state,
    remedy: f.remedy,
    raisedByName: f.raiser?.name ?? '',
    raisedAt: f.raisedAt.toISOString(),
    rectifiedAt: f.rectifiedAt ? f.rectifiedAt.toISOString() : null,
    rectifiedByName: f.rectifier?.name ?? null,
    photos,
    version: f.version,
  };
}

async function findFinding(scope: Scope, jobId: string, id: string, t?: Transaction, lock = false): Promise<Finding> {
  const f = await Finding.findOne({ where: inWorkshop(scope, { jobId, id }), transaction: t, lock: lock && t ? t.LOCK.UPDATE : undefined });
  if (!f) throw notFound('That finding');
  return f;
}

async function findingOut(scope: Scope, jobId: string, id: string, t?: Transaction): Promise<FindingDto> {
  const f = await Finding.findOne({ where: inWorkshop(scope, { jobId, id }), include: findingInclude, transaction: t });
  if (!f) throw notFound('That finding');
  const photos = await photosByFinding(scope, jobId, [f.id], t);
  return findingDto(f, photos.get(f.id) ?? []);
}

export async function listFindings(scope: Scope, jobId: string): Promise<FindingDto[]> {
  const job = await viewJob(scope, jobId);
  const where: Record<string, unknown> = { jobId: job.id };
  // Drafts are the workshop's working notes until priced.
  const rows = await Finding.findAll({ where: inWorkshop(scope, where), include: findingInclude, order: [['seq', 'ASC']] });
  // Every photo of the job in one query, not one per finding.
  const photos = await photosByFinding(scope, job.id);
  return rows.filter((f) => scope.role !== 'owner' || f.state !== 'draft').map((f) => findingDto(f, photos.get(f.id) ?? []));
}

async function checkRemedy(scope: Scope, remedy: FindingCreate['remedy'], t: Transaction): Promise<void> {
  await loadParts(scope, remedy.parts.map((p) => p.partId), (i) => `remedy.parts.${i}.partId`, t);
  if (remedy.labourRateCode) {
    const w = await loadWorkshop(scope, t);
    if (!(w.labourRates ?? []).some((r) => r.code === remedy.labourRateCode)) {
      throw new AppError('validation_failed', 400, 'Some fields need attention.', { 'remedy.labourRateCode': 'Choose one of the workshop’s labour rates.' });
    }
  }
}

export async function createFinding(scope: Scope, jobId: string, input: FindingCreate): Promise<FindingDto> {
  requireStaff(scope);
  const id = await inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    assertWorking(job, 'raising a finding');
    let item: JobChecklistItem | null = null;
    if (input.checklistItemId) {
      item = await JobChecklistItem.findOne({ where: inWorkshop(scope, { jobId: job.id, id: input.checklistItemId }), transaction: t });
      if (!item) throw new AppError('validation_failed', 400, 'Some fields need attention.', { checklistItemId: 'That checklist item is not on this job.' });
    }
    await checkRemedy(scope, input.remedy, t);
    const est = await ensureEstimate(scope, job.id, t);
    // The counter row is locked by the UPDATE and rolls back with a failed create: numbers have no gaps.
    const [row] = await boundSequelize().query<{ last_finding_number: number }>(
      `UPDATE estimates SET last_finding_number = last_finding_number + 1 WHERE id = $1 RETURNING last_finding_number`,
      { bind: [est.id], transaction: t, type: QueryTypes.SELECT },
    );
    const seq = Number(row!.last_finding_number);
    const f = await Finding.create(
      {
        workshopId: scope.workshopId,
        jobId: job.id,
        seq,
        title: input.title,
        location: input.location,
        category: input.category,
        seen: input.seen,
        checklistItemId: item?.id ?? null,
        measuredValue: input.measuredValue ?? item?.measuredValue ?? null,
        limit: item?.limit ?? null,
        state: 'draft',
        remedy: input.remedy,
        raisedBy: scope.userId,
      },
      { transaction: t },
    );
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'finding.raised',
      summary: `Raised F-${seq} (${FINDING_CATEGORY_LABELS[f.category]}): ${f.title}, ${f.location}`,
      detail: { findingId: f.id, number: `F-${seq}`, category: f.category, checklistItemId: f.checklistItemId, measuredValue: f.measuredValue },
    });
    return f.id;
  });
  return findingOut(scope, jobId, id);
}

export async function updateFinding(scope: Scope, jobId: string, findingId: string, input: FindingUpdate): Promise<FindingDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    const f = await findFinding(scope, job.id, findingId, t, true);
    if (f.version !== input.version) throw staleVersion();
    if (f.state !== 'draft' && f.state !== 'priced') {
      throw new AppError('invalid_transition', 409, `F-${f.seq} is ${FINDING_STATE_LABELS[f.state].toLowerCase()}; only a draft or priced finding can be edited.`);
    }
    const { version: _v, ...changes } = input;
    if (changes.remedy) await checkRemedy(scope, changes.remedy, t);
    const changed = Object.entries(changes).filter(([k, v]) => v !== undefined && JSON.stringify(f.get(k as keyof Finding)) !== JSON.stringify(v)).map(([k]) => k);
    await f.update(changes, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'finding.updated',
      summary: `Edited F-${f.seq}${changed.length ? `: ${changed.join(', ')}` : ' without changes'}`,
      detail: { findingId: f.id, fields: changed },
    });
  });
  return findingOut(scope, jobId, findingId);
}

export async function withdrawFinding(
  scope: Scope,
  jobId: string,
  findingId: string,
  input: FindingAction,
  /** Runs in the same transaction (a sent request holding the finding is replaced without it). */
  afterWithdraw?: (job: JobRow, t: Transaction) => Promise<void>,
): Promise<FindingDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    assertEstimateEditable(job);
    // The server's one lock order (job-access.ts): job, its open requests (one may be replaced), estimate, finding.
    await lockOpenRequests(job.id, t);
    const est = await ensureEstimate(scope, job.id, t, true);
    const f = await findFinding(scope, job.id, findingId, t, true);
    if (f.version !== input.version) throw staleVersion();
    assertFindingMove(f.state, 'withdrawn');
    const removed = await EstimateLine.destroy({ where: inWorkshop(scope, { jobId: job.id, findingId: f.id, stage: 'discovered' }), transaction: t });
    await moveFindings(job.id, [f.id], 'withdrawn', t);
    if (removed > 0) await est.update({ version: est.version + 1 }, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'finding.withdrawn',
      summary: `Withdrew F-${f.seq} ${f.title}${removed ? ` and its ${removed} estimate ${removed === 1 ? 'line' : 'lines'}` : ''}${input.reason ? `: ${input.reason}` : ''}`,
      detail: { findingId: f.id, linesRemoved: removed, reason: input.reason },
    });
    if (afterWithdraw) await afterWithdraw(job, t);
  });
  return findingOut(scope, jobId, findingId);
}

export async function markRectified(scope: Scope, jobId: string, findingId: string, input: FindingAction): Promise<FindingDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    const f = await findFinding(scope, job.id, findingId, t, true);
    if (f.version !== input.version) throw staleVersion();
    if (f.state !== 'approved' && f.state !== 'approved_within_limit') {
      throw new AppError('invalid_transition', 409, `F-${f.seq} is ${FINDING_STATE_LABELS[f.state].toLowerCase()}; only approved work can be recorded as rectified.`);
    }
    if (f.rectifiedAt) throw new AppError('invalid_transition', 409, `F-${f.seq} is already recorded as rectified.`);
    await f.update({ rectifiedAt: new Date(), rectifiedBy: scope.userId }, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'finding.rectified',
      summary: `Recorded F-${f.seq} ${f.title} as rectified${input.reason ? `: ${input.reason}` : ''}`,
      detail: { findingId: f.id, reason: input.reason },
    });
  });
  return findingOut(scope, jobId, findingId);
}

function openReason(state: FindingState): string {
  switch (state) {
    case 'declined':
      return 'declined by the owner';
    case 'approved':
    case 'approved_within_limit':
      return 'approved, not yet recorded as rectified';
    case 'sent':
      return 'waiting for the owner’s decision';
    default:
      return 'not yet decided';
  }
}

/**
 * Why a job cannot be marked ready for release, or null if nothing blocks it. An airworthiness
 * finding stays open until it is rectified or withdrawn; declining it does not close it.
 */
export async function releaseBlockers(scope: Scope, jobId: string, t: Transaction): Promise<string | null> {
  const rows = await Finding.findAll({ where: inWorkshop(scope, { jobId, category: 'airworthiness' }), order: [['seq', 'ASC']], transaction: t });
  const open = rows.filter((f) => isOpenAirworthiness({ category: f.category, state: f.state, rectifiedAt: f.rectifiedAt ? f.rectifiedAt.toISOString() : null }));
  if (!open.length) return null;
  const names = open.map((f) => `F-${f.seq} ${f.title} (${openReason(f.state)})`).join('; ');
  const one = open.length === 1;
  return (
    `The aircraft cannot be marked ready for release while ${one ? 'an airworthiness finding is' : 'airworthiness findings are'} open: ${names}. ` +
    `${one ? 'It has' : 'They have'} to be put right and recorded as rectified first (or withdrawn, if raised in error). The inspector decides whether the aircraft is fit to release; Wingstage only records it.`
  );
}

// ─── Checklist ───────────────────────────────────────────────────────────────

function checklistDto(i: JobChecklistItem, findingId: string | null): JobChecklistItemDto {
  return {
    id: i.id,
    section: i.section,
    text: i.text,
    limit: i.limit,
    caution: i.caution,
    result: i.result,
    measuredValue: i.measuredValue,
    limitCheck: i.measuredValue !== null && i.limit ? checkLimit(i.measuredValue, i.limit) : null,
    note: i.note,
    recordedByName: i.recorder?.name ?? null,
    recordedAt: i.recordedAt ? i.recordedAt.toISOString() : null,
    findingId,
    version: i.version,
  };
}

async function raisedFrom(scope: Scope, jobId: string, t?: Transaction): Promise<Map<string, string>> {
  const rows = await Finding.findAll({ where: inWorkshop(scope, { jobId }), attributes: ['id', 'checklistItemId', 'state', 'seq'], order: [['seq', 'ASC']], transaction: t });
  const map = new Map<string, string>();
  for (const f of rows) if (f.checklistItemId && f.state !== 'withdrawn') map.set(f.checklistItemId, f.id);
  return map;
}

export async function listChecklist(scope: Scope, jobId: string): Promise<JobChecklistItemDto[]> {
  requireStaff(scope);
  const job = await findJob(scope, jobId);
  const [items, raised] = await Promise.all([
    JobChecklistItem.findAll({ where: inWorkshop(scope, { jobId: job.id }), include: [{ model: User, as: 'recorder', required: false, attributes: ['name'] }], order: [['sortOrder', 'ASC']] }),
    raisedFrom(scope, job.id),
  ]);
  return items.map((i) => checklistDto(i, raised.get(i.id) ?? null));
}

export async function recordChecklist(scope: Scope, jobId: string, itemId: string, input: ChecklistRecord): Promise<JobChecklistItemDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    const item = await JobChecklistItem.findOne({ where: inWorkshop(scope, { jobId: job.id, id: itemId }), transaction: t, lock: t.LOCK.UPDATE });
    if (!item) throw notFound('That checklist item');
    if (item.version !== input.version) throw staleVersion();
    assertWorking(job, 'recording the checklist');
    await item.update(
      { result: input.result, measuredValue: input.result === 'measured' ? input.measuredValue : null, note: input.note, recordedBy: scope.userId, recordedAt: new Date() },
      { transaction: t },
    );
    await item.reload({ include: [{ model: User, as: 'recorder', required: false, attributes: ['name'] }], transaction: t });
    const dto = checklistDto(item, (await raisedFrom(scope, job.id, t)).get(item.id) ?? null);
    let what = CHECKLIST_RESULT_LABELS[input.result];
    if (input.result === 'measured') {
      what = `${input.measuredValue}${item.limit ? ` ${item.limit.unit}` : ''}`;
      if (item.limit && dto.limitCheck) what += dto.limitCheck === 'within' ? ` (within ${describeLimit(item.limit)})` : ` (${dto.limitCheck} the limit ${describeLimit(item.limit)})`;
    }
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'checklist.recorded',
      summary: `Checklist "${item.text}": ${what}`,
      detail: { itemId: item.id, result: input.result, measuredValue: dto.measuredValue, limitCheck: dto.limitCheck },
    });
    return dto;
  });
}

// ─── Time ────────────────────────────────────────────────────────────────────

function timeDto(l: TimeLog): TimeLogDto {
  return {
    id: l.id,
    userName: l.user?.name ?? '',
    hours: l.hours,
    workedOn: l.workedOn,
    note: l.note,
    findingId: l.findingId,
    createdAt: l.createdAt.toISOString(),
    userId: l.userId,
    version: l.version,
  };
}

const trimHours = (h: string) => new Decimal(h).toString();

/**
 * A day has 24 hours: one person's entries on one day (on any job of the workshop) may not add up
 * to more. `except` leaves out the entry being corrected.
 */
async function assertDayHasRoom(scope: Scope, userId: string | null, workedOn: string, hours: string, except: string | null, t: Transaction): Promise<void> {
  if (!userId) return;
  const [row] = await boundSequelize().query<{ total: string | null }>(
    `SELECT sum(hours)::text AS total FROM time_logs WHERE workshop_id = $1 AND user_id = $2 AND worked_on = $3 AND ($4::uuid IS NULL OR id <> $4::uuid)`,
    { bind: [scope.workshopId, userId, workedOn, except], type: QueryTypes.SELECT, transaction: t },
  );
  const already = new Decimal(row?.total ?? '0');
  if (already.plus(hours).gt(HOURS_IN_A_DAY)) {
    const room = Decimal.max(0, new Decimal(HOURS_IN_A_DAY).minus(already));
    const message = room.isZero()
      ? `${trimHours(already.toString())} hours are already logged for ${workedOn}, and a day has ${HOURS_IN_A_DAY} hours. Check the date, or correct the earlier entries.`
      : `${trimHours(already.toString())} hours are already logged for ${workedOn}, and a day has ${HOURS_IN_A_DAY} hours: at most ${trimHours(room.toString())} more can be logged for that day.`;
    throw new AppError('validation_failed', 400, message, { hours: message });
  }
}

async function findingNumber(scope: Scope, jobId: string, findingId: string | null, t: Transaction): Promise<string> {
  if (!findingId) return '';
  const f = await Finding.findOne({ where: inWorkshop(scope, { jobId, id: findingId }), transaction: t });
  if (!f) throw new AppError('validation_failed', 400, 'Some fields need attention.', { findingId: 'That finding is not on this job.' });
  return `F-${f.seq}`;
}

/** An engineer corrects their own entries; a manager or admin anyone's. Closed and cancelled jobs keep theirs. */
async function loadOwnEntry(scope: Scope, jobId: string, timeId: string, version: number, t: Transaction): Promise<{ job: JobRow; log: TimeLog }> {
  const job = await lockJob(scope, jobId, t);
  if (job.state === 'closed' || job.state === 'cancelled') throw conflict(`This job is ${job.state}; its time entries can no longer be changed.`);
  const log = await TimeLog.findOne({
    where: inWorkshop(scope, { jobId: job.id, id: timeId }),
    include: [{ model: User, as: 'user', required: false, attributes: ['name'] }],
    transaction: t,
    lock: { level: t.LOCK.UPDATE, of: TimeLog },
  });
  if (!log) throw notFound('That time entry');
  if (scope.role !== 'admin' && scope.role !== 'manager' && log.userId !== scope.userId) {
    throw new AppError('forbidden', 403, 'Only the person who logged this time, a manager or an admin can change it.');
  }
  if (log.version !== version) throw staleVersion();
  return { job, log };
}

export async function updateTime(scope: Scope, jobId: string, timeId: string, input: TimeLogUpdate): Promise<TimeLogDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const { job, log } = await loadOwnEntry(scope, jobId, timeId, input.version, t);
    const before = { hours: log.hours, workedOn: log.workedOn, note: log.note, findingId: log.findingId };
    const after = {
      hours: input.hours ?? log.hours,
      workedOn: input.workedOn ?? log.workedOn,
      note: input.note ?? log.note,
      findingId: input.findingId === undefined ? log.findingId : input.findingId,
    };
    await assertDayHasRoom(scope, log.userId, after.workedOn, after.hours, log.id, t);
    const number = await findingNumber(scope, job.id, after.findingId, t);
    const changes: string[] = [];
    if (!new Decimal(before.hours).eq(after.hours)) changes.push(`${trimHours(before.hours)} h → ${trimHours(after.hours)} h`);
    if (before.workedOn !== after.workedOn) changes.push(`${before.workedOn} → ${after.workedOn}`);
    if (before.findingId !== after.findingId) changes.push(number ? `now on ${number}` : 'no longer on a finding');
    if (before.note !== after.note) changes.push('note changed');
    await log.update(after, { transaction: t });
    // Read back so the figures come as the database keeps them ("1.50"), like every other read.
    await log.reload({ include: [{ model: User, as: 'user', required: false, attributes: ['name'] }], transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'time.changed',
      summary: `Corrected ${log.user?.name ? `${log.user.name}'s` : 'a'} time entry for ${before.workedOn}: ${changes.length ? changes.join(', ') : 'nothing changed'}`,
      detail: { timeLogId: log.id, before, after },
    });
    return timeDto(log);
  });
}

export async function removeTime(scope: Scope, jobId: string, timeId: string, input: TimeLogRemove): Promise<void> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const { job, log } = await loadOwnEntry(scope, jobId, timeId, input.version, t);
    const was = { hours: log.hours, workedOn: log.workedOn, note: log.note, findingId: log.findingId, userName: log.user?.name ?? null };
    await log.destroy({ transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'time.removed',
      summary: `Removed ${was.userName ? `${was.userName}'s` : 'a'} time entry of ${trimHours(was.hours)} h for ${was.workedOn}${input.reason ? `: ${input.reason}` : ''}`,
      detail: { timeLogId: log.id, was, reason: input.reason },
    });
  });
}

export async function listTime(scope: Scope, jobId: string): Promise<TimeLogDto[]> {
  requireStaff(scope);
  const job = await findJob(scope, jobId);
  const rows = await TimeLog.findAll({
    where: inWorkshop(scope, { jobId: job.id }),
    include: [{ model: User, as: 'user', required: false, attributes: ['name'] }],
    order: [['workedOn', 'ASC'], ['createdAt', 'ASC']],
  });
  return rows.map(timeDto);
}

export async function logTime(scope: Scope, jobId: string, input: TimeLogCreate): Promise<TimeLogDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    if (job.state === 'closed' || job.state === 'cancelled') throw conflict(`This job is ${job.state}; time can no longer be logged against it.`);
    const seq = await findingNumber(scope, job.id, input.findingId, t);
    const number = seq ? ` on ${seq}` : '';
    await assertDayHasRoom(scope, scope.userId, input.workedOn, input.hours, null, t);
    const log = await TimeLog.create({ ...input, workshopId: scope.workshopId, jobId: job.id, userId: scope.userId }, { transaction: t });
    await log.reload({ include: [{ model: User, as: 'user', required: false, attributes: ['name'] }], transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'time.logged',
      summary: `Logged ${log.hours} h${number} for ${log.workedOn}${input.note ? `: ${input.note}` : ''}`,
      detail: { timeLogId: log.id, hours: log.hours, workedOn: log.workedOn, findingId: log.findingId },
    });
    return timeDto(log);
  });
}

