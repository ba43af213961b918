import { createHash, createHmac, randomBytes, randomUUID, timingSafeEqual } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  Dec,
  FINDING_CATEGORY_LABELS,
  FINDING_STATE_LABELS,
  decidePreAuthorised,
  estimateEngineInput,
  formatAmount,
  minorUnits,
  priceEstimate,
  priceFinding,
  type AccessTaskDto,
  type ApprovalRequestDto,
  type ApprovalSnapshot,
  type DecisionPageDto,
  type EstimateLineDto,
  type PreAuthorisationDto,
  type PricedEstimate,
  type SendForApprovalResultDto,
  type approvalRequestCreateSchema,
  type decisionSubmitSchema,
  type preAuthorisationSchema,
} from '@wingstage/shared';
import { AppError, conflict, notFound, staleVersion } from '../errors/app-error.js';
import { approvalReceiptMail, approvalRequestMail, approvalReminderMail, withinLimitReportMail } from '../mail/approval-mails.js';
import { ApprovalRequest, AuditEvent, Customer, Finding, Job, Workshop, boundSequelize } from '../models/index.js';
import { recordAudit } from './audit.js';
import type { Deps } from './deps.js';
import { assertEstimateEditable, ensureEstimate, loadLines } from './estimates.service.js';
import { findJob, lockJobById, type JobRow } from './job-access.js';
import { loadWorkshop, pricingOf } from './pricing.js';
import { snapshotPhotosOf, withPhotos } from './photos.service.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';
import { toWorkshopDto } from './workshop.service.js';

type PreAuthInput = z.output<typeof preAuthorisationSchema>;
type SendInput = z.output<typeof approvalRequestCreateSchema>;
type DecisionInput = z.output<typeof decisionSubmitSchema>;

// ─── Hashes and links ────────────────────────────────────────────────────────

/** JSON with object keys sorted at every depth, so the same snapshot always hashes the same. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj).filter((k) => obj[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`).join(',')}}`;
}

export const sha256 = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

export function snapshotHashOf(snapshot: ApprovalSnapshot): string {
  return sha256(canonicalJson(snapshot));
}

/** The link token is signed with the server's secret, so a reminder can repeat the link without storing it. */
function linkToken(secret: string, requestId: string, nonce: string): string {
  return createHmac('sha256', secret).update(`approval-link:${requestId}:${nonce}`).digest('base64url');
}

function newLink(deps: Deps, requestId: string): { nonce: string; token: string; tokenHash: string; url: string } {
  const nonce = randomBytes(16).toString('hex');
  const token = linkToken(deps.config.JWT_SECRET, requestId, nonce);
  return { nonce, token, tokenHash: sha256(token), url: linkUrl(deps, token) };
}

const linkUrl = (deps: Deps, token: string) => `${deps.config.APP_URL.replace(/\/$/, '')}/decide/${token}`;

function linkOf(deps: Deps, r: ApprovalRequest): string {
  return linkUrl(deps, linkToken(deps.config.JWT_SECRET, r.id, r.linkNonce));
}

// ─── Shared helpers ──────────────────────────────────────────────────────────

const money = (currency: string, amount: string) => (currency === 'GBP' ? `£${amount}` : `${amount} ${currency}`);
const num = (seq: number) => `F-${seq}`;

export function requestDto(r: ApprovalRequest, findingIds: string[]): ApprovalRequestDto {
  return {
    id: r.id,
    jobId: r.jobId,
    state: r.state,
    findingIds,
    sentAt: r.sentAt.toISOString(),
    expiresAt: r.expiresAt.toISOString(),
    decidedAt: r.decidedAt ? r.decidedAt.toISOString() : null,
    decidedByName: r.decidedByName ?? null,
    revokedAt: r.revokedAt ? r.revokedAt.toISOString() : null,
    replacedById: r.replacedById ?? null,
    lastRemindedAt: r.lastRemindedAt ? r.lastRemindedAt.toISOString() : null,
    snapshotHash: r.snapshotHash,
    gross: r.gross,
  };
}

async function findingIdsOf(requestIds: string[], t?: Transaction): Promise<Map<string, string[]>> {
  const map = new Map<string, string[]>();
  if (!requestIds.length) return map;
  const rows = await boundSequelize().query<{ request_id: string; finding_id: string }>(
    `SELECT request_id, finding_id FROM approval_request_findings WHERE request_id = ANY($1::uuid[]) ORDER BY position`,
    { bind: [requestIds], type: QueryTypes.SELECT, transaction: t },
  );
  for (const r of rows) map.set(r.request_id, [...(map.get(r.request_id) ?? []), r.finding_id]);
  return map;
}

async function dtoOf(r: ApprovalRequest, t?: Transaction): Promise<ApprovalRequestDto> {
  return requestDto(r, (await findingIdsOf([r.id], t)).get(r.id) ?? []);
}

async function ownerContact(job: JobRow, t: Transaction): Promise<{ name: string; email: string }> {
  const c = await Customer.findOne({ where: { id: job.aircraft.customerId, workshopId: job.workshopId }, transaction: t });
  if (!c) throw notFound('The owner');
  return { name: c.name, email: c.email };
}

async function pricedJob(scope: Scope, jobId: string, t: Transaction): Promise<{ w: Workshop; lines: EstimateLineDto[]; tasks: AccessTaskDto[]; priced: PricedEstimate }> {
  const w = await loadWorkshop(scope, t);
  const { lines, accessTasks } = await loadLines(scope, jobId, t);
  return { w, lines, tasks: accessTasks, priced: priceEstimate(estimateEngineInput(lines, accessTasks), pricingOf(w)) };
}

/** Moves a finding's lines between stages; the estimate's version moves too so an open builder is told. */
async function moveLines(jobId: string, findingIds: string[], from: string, to: string, t: Transaction): Promise<number> {
  if (!findingIds.length) return 0;
  const [, count] = await boundSequelize().query(
    `UPDATE estimate_lines SET stage = $4 WHERE job_id = $1 AND finding_id = ANY($2::uuid[]) AND stage = $3`,
    { bind: [jobId, findingIds, from, to], transaction: t },
  );
  return Number((count as { rowCount?: number })?.rowCount ?? count ?? 0);
}

async function bumpEstimate(jobId: string, t: Transaction): Promise<void> {
  await boundSequelize().query(`UPDATE estimates SET version = version + 1, updated_at = now() WHERE job_id = $1`, { bind: [jobId], transaction: t });
}

async function setFindingState(jobId: string, ids: string[], to: string, t: Transaction, extra = ''): Promise<void> {
  if (!ids.length) return;
  await boundSequelize().query(`UPDATE findings SET state = $3, version = version + 1, updated_at = now()${extra} WHERE job_id = $1 AND id = ANY($2::uuid[])`, {
    bind: [jobId, ids, to],
    transaction: t,
  });
}

// ─── Pre-authorised limit ────────────────────────────────────────────────────

async function usedSoFar(jobId: string, t?: Transaction): Promise<string> {
  const [row] = await boundSequelize().query<{ used: string | null }>(
    `SELECT COALESCE(SUM(within_limit_gross), 0)::numeric(14,2)::text AS used FROM findings WHERE job_id = $1 AND state = 'approved_within_limit'`,
    { bind: [jobId], type: QueryTypes.SELECT, transaction: t },
  );
  return row?.used ?? '0.00';
}

function preAuthDto(job: Job, currency: string, used: string): PreAuthorisationDto {
  // The engine works out the headroom, so this file carries no money formula of its own.
  const limit = decidePreAuthorised({ perFinding: job.preAuthPerFinding, perJob: job.preAuthPerJob, usedSoFar: used }, [], currency);
  return { perFinding: job.preAuthPerFinding ?? null, perJob: job.preAuthPerJob ?? null, agreedHow: job.preAuthAgreedHow ?? '', usedSoFar: used, headroom: limit.headroom };
}

export async function getPreAuthorisation(scope: Scope, jobId: string): Promise<PreAuthorisationDto> {
  const job = await findJob(scope, jobId);
  const w = await loadWorkshop(scope);
  return preAuthDto(job, w.currency, await usedSoFar(job.id));
}

export async function putPreAuthorisation(scope: Scope, jobId: string, input: PreAuthInput): Promise<PreAuthorisationDto & { version: number }> {
  requireStaff(scope);
  return boundSequelize().transaction(async (t) => {
    const job = await findJob(scope, jobId, t, true);
    if (job.version !== input.version) throw staleVersion();
    const w = await loadWorkshop(scope, t);
    const fmt = (v: string | null) => (v === null ? null : formatAmount(new Dec(v), minorUnits(w.currency)));
    await job.update({ preAuthPerFinding: fmt(input.perFinding), preAuthPerJob: fmt(input.perJob), preAuthAgreedHow: input.agreedHow }, { transaction: t });
    const describe = (v: string | null) => (v === null ? 'none' : money(w.currency, v));
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'job.pre_authorisation_set',
      summary: `Pre-authorised limit: per finding ${describe(fmt(input.perFinding))}, per job ${describe(fmt(input.perJob))} incl. VAT${input.agreedHow ? ` (${input.agreedHow})` : ''}`,
      detail: { perFinding: fmt(input.perFinding), perJob: fmt(input.perJob), agreedHow: input.agreedHow },
    });
    return { ...preAuthDto(job, w.currency, await usedSoFar(job.id, t)), version: job.version };
  });
}

// ─── Snapshot ────────────────────────────────────────────────────────────────

function totalsOnly(lines: EstimateLineDto[], tasks: AccessTaskDto[], w: Workshop, keepDiscovered: (findingId: string | null) => boolean) {
  const kept = lines.filter((l) => l.stage !== 'discovered' || keepDiscovered(l.findingId));
  return priceEstimate(estimateEngineInput(kept, tasks), pricingOf(w)).stages.discovered;
}

/** Built only from the engine's results, so the owner sees exactly the figures the estimate shows. */
export function buildSnapshot(p: {
  requestId: string;
  job: JobRow;
  w: Workshop;
  owner: { name: string };
  message: string;
  sentAt: Date;
  expiresAt: Date;
  findings: Finding[];
  lines: EstimateLineDto[];
  tasks: AccessTaskDto[];
  priced: PricedEstimate;
  /** Each finding's current photos (photos.service snapshotPhotosOf); a finding missing here has none. */
  photos?: Map<string, ApprovalSnapshot['findings'][number]['photos']>;
}): ApprovalSnapshot {
  const { w, lines, tasks, priced } = p;
  const pricing = pricingOf(w);
  const inRequest = new Set(p.findings.map((f) => f.id));
  const pricedLine = new Map(priced.lines.map((l) => [l.id, l]));
  // The access tasks this request's lines need, with the engine's own price for each.
  const named = new Set(lines.filter((l) => l.stage === 'discovered' && l.findingId !== null && inRequest.has(l.findingId) && l.accessTaskId !== null).map((l) => l.accessTaskId));
  const needed = priced.accessTasks.filter((t) => named.has(t.id));
  return {
    requestId: p.requestId,
    jobId: p.job.id,
    jobNumber: p.job.number,
    jobTitle: p.job.title,
    registration: p.job.aircraft.registration,
    aircraftType: p.job.aircraft.type,
    ownerName: p.owner.name,
    workshopName: w.name,
    currency: priced.currency,
    rounding: priced.rounding,
    message: p.message,
    sentAt: p.sentAt.toISOString(),
    expiresAt: p.expiresAt.toISOString(),
    findings: p.findings.map((f) => {
      const own = priceFinding(estimateEngineInput(lines, tasks), pricing, f.id);
      // Priced on its own, with no committed work to share access with: the difference is the saving.
      const mine = lines.filter((l) => l.findingId === f.id);
      const alone = priceFinding(estimateEngineInput(mine, tasks), pricing, f.id);
      const saving = formatAmount(Dec.max(new Dec(alone.price.gross).minus(own.price.gross), 0), minorUnits(priced.currency));
      return {
        findingId: f.id,
        number: num(f.seq),
        title: f.title,
        category: f.category,
        location: f.location,
        seen: f.seen,
        measuredValue: f.measuredValue,
        limit: f.limit,
        photos: p.photos?.get(f.id) ?? [],
        lines: mine
          .filter((l) => l.stage === 'discovered')
          .map((l) => ({ description: l.description, kind: l.kind, quantity: l.quantity, net: pricedLine.get(l.id)?.net ?? '0.00', vatRate: l.vatRate, accessTaskId: l.accessTaskId })),
        price: own.price,
        accessCovered: own.accessCovered.map((id) => tasks.find((t) => t.id === id)?.name ?? id),
        accessSavingGross: saving,
      };
    }),
    pricingBasis: {
      vatRates: { ...pricing.vatRates },
      accessTasks: needed.map((t) => ({ id: t.id, name: tasks.find((x) => x.id === t.id)?.name ?? t.id, net: t.net, vatRate: t.vatRate })),
      // Inspection scope and approved work are charged first (the engine's stage order), so these never count here.
      accessPaid: needed.filter((t) => t.chargedIn === 'inspection' || t.chargedIn === 'approved').map((t) => t.id),
      // The page prices the whole estimate after the owner's choice from these, so its new total is the
      // estimate's own committed total (VAT on the invoice total is not the sum of two parts' VAT).
      committed: {
        lines: priced.lines
          .filter((l): l is typeof l & { stage: 'inspection' | 'approved' } => l.stage === 'inspection' || l.stage === 'approved')
          .map((l) => ({ stage: l.stage, kind: l.kind, net: l.net, vatRate: l.vatRate, accessTaskId: l.accessTaskId })),
        accessTasks: priced.accessTasks
          .filter((t) => t.chargedIn === 'inspection' || t.chargedIn === 'approved')
          .map((t) => ({ id: t.id, net: t.net, vatRate: t.vatRate })),
      },
    },
    totals: {
      quoted: priced.quoted,
      approvedSoFar: priced.committed,
      thisRequest: totalsOnly(lines, tasks, w, (id) => id !== null && inRequest.has(id)),
      undecidedElsewhere: totalsOnly(lines, tasks, w, (id) => id === null || !inRequest.has(id)),
    },
  };
}

/**
 * Creates a request for these (priced) findings and queues its e-mail, inside the caller's
 * transaction: the request, the findings' new state and the e-mail commit together.
 */
async function createRequest(
  deps: Deps,
  scope: Scope,
  job: JobRow,
  findings: Finding[],
  message: string,
  t: Transaction,
  kind: 'new' | 'replacement',
): Promise<ApprovalRequest> {
  const { w, lines, tasks, priced } = await pricedJob(scope, job.id, t);
  const settings = toWorkshopDto(w).settings;
  const owner = await ownerContact(job, t);
  const id = randomUUID();
  const sentAt = new Date();
  const expiresAt = new Date(sentAt.getTime() + settings.approvalLinkDays * 86_400_000);
  const snapshot = buildSnapshot({ requestId: id, job, w, owner, message, sentAt, expiresAt, findings, lines, tasks, priced, photos: await snapshotPhotosOf(findings.map((f) => f.id), t) });
  const link = newLink(deps, id);
  const r = await ApprovalRequest.create(
    {
      id,
      workshopId: scope.workshopId,
      jobId: job.id,
      snapshot,
      snapshotHash: snapshotHashOf(snapshot),
      linkNonce: link.nonce,
      tokenHash: link.tokenHash,
      gross: snapshot.totals.thisRequest.gross,
      sentAt,
      expiresAt,
      sentByUserId: scope.userId,
    },
    { transaction: t },
  );
  await boundSequelize().query(
    `INSERT INTO approval_request_findings (job_id, request_id, finding_id, position) SELECT $1, $2, f, i FROM unnest($3::uuid[]) WITH ORDINALITY AS x(f, i)`,
    { bind: [job.id, id, findings.map((f) => f.id)], transaction: t },
  );
  await setFindingState(job.id, findings.map((f) => f.id), 'sent', t);
  const list = findings.map((f) => num(f.seq)).join(', ');
  await recordAudit(scope, t, {
    jobId: job.id,
    action: kind === 'new' ? 'approval.sent' : 'approval.replacement_sent',
    summary: `${kind === 'new' ? 'Sent' : 'Sent a replacement request for'} ${list} to ${owner.name} for approval: ${money(w.currency, r.gross)} incl. VAT; the link works until ${expiresAt.toISOString().slice(0, 10)}`,
    detail: { requestId: id, findingIds: findings.map((f) => f.id), gross: r.gross, snapshotHash: r.snapshotHash },
  });
  await deps.mail.enqueue(
    approvalRequestMail({ to: owner.email, ownerName: owner.name, snapshot, link: link.url, replacement: kind === 'replacement' }),
    t,
  );
  return r;
}

async function moveJobToAwaiting(scope: Scope, job: JobRow, t: Transaction): Promise<void> {
  if (job.state !== 'inspecting' && job.state !== 'in_work') return;
  const from = job.state;
  await job.update({ state: 'awaiting_owner' }, { transaction: t });
  await recordAudit(scope, t, {
    jobId: job.id,
    action: 'job.state_changed',
    summary: `${from === 'inspecting' ? 'Inspecting' : 'In work'} → Awaiting owner: findings sent for approval`,
    detail: { from, to: 'awaiting_owner' },
  });
}

// ─── Send for approval ───────────────────────────────────────────────────────

export async function sendForApproval(deps: Deps, scope: Scope, jobId: string, input: SendInput): Promise<SendForApprovalResultDto> {
  requireStaff(scope);
  return boundSequelize().transaction(async (t) => {
    const job = await findJob(scope, jobId, t, true);
    assertEstimateEditable(job);
    const est = await ensureEstimate(scope, job.id, t, true);
    if (est.version !== input.estimateVersion) {
      throw new AppError('stale_version', 409, 'The estimate changed since you opened it. Check the new prices, then send again.', { version: String(est.version) });
    }
    const ids = [...new Set(input.findingIds)];
    const rows = await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: ids }), transaction: t, lock: t.LOCK.UPDATE });
    if (rows.length !== ids.length) throw notFound('A chosen finding');
    const byId = new Map(rows.map((f) => [f.id, f]));
    const ordered = ids.map((id) => byId.get(id)!);
    const notPriced = ordered.filter((f) => f.state !== 'priced');
    if (notPriced.length) {
      throw conflict(
        `Only priced findings can be sent: ${notPriced.map((f) => `${num(f.seq)} is ${FINDING_STATE_LABELS[f.state].toLowerCase()}`).join('; ')}.`,
      );
    }
    const { w, priced } = await pricedJob(scope, job.id, t);
    const grossOf = new Map(priced.findings.map((f) => [f.findingId, f.price.gross]));
    const limit = decidePreAuthorised(
      { perFinding: job.preAuthPerFinding, perJob: job.preAuthPerJob, usedSoFar: await usedSoFar(job.id, t) },
      ordered.map((f) => ({ id: f.id, gross: grossOf.get(f.id) ?? '0' })),
      w.currency,
    );
    const inside = limit.decisions.filter((d) => d.inside);
    const approvedWithinLimit: SendForApprovalResultDto['approvedWithinLimit'] = [];
    for (const d of inside) {
      const f = byId.get(d.id)!;
      await f.update({ state: 'approved_within_limit', withinLimitGross: d.gross }, { transaction: t });
      approvedWithinLimit.push({ findingId: f.id, number: num(f.seq), gross: d.gross });
    }
    if (inside.length) {
      await moveLines(job.id, inside.map((d) => d.id), 'discovered', 'approved', t);
      await bumpEstimate(job.id, t);
      await recordAudit(scope, t, {
        jobId: job.id,
        action: 'finding.approved_within_limit',
        summary: `Approved within the owner's pre-authorised limit: ${approvedWithinLimit.map((a) => `${a.number} ${money(w.currency, a.gross)}`).join(', ')} incl. VAT`,
        detail: { findings: approvedWithinLimit, headroom: limit.headroom },
      });
      const owner = await ownerContact(job, t);
      await deps.mail.enqueue(
        withinLimitReportMail({
          to: owner.email,
          ownerName: owner.name,
          workshopName: w.name,
          registration: job.aircraft.registration,
          jobTitle: job.title,
          findings: approvedWithinLimit.map((a) => ({ ...a, title: byId.get(a.findingId)!.title, category: FINDING_CATEGORY_LABELS[byId.get(a.findingId)!.category] })),
          currency: w.currency,
          headroom: limit.headroom,
          link: `${deps.config.APP_URL.replace(/\/$/, '')}/jobs/${job.id}`,
        }),
        t,
      );
    }
    const rest = ordered.filter((f) => !inside.some((d) => d.id === f.id));
    let request: ApprovalRequestDto | null = null;
    if (rest.length) {
      const r = await createRequest(deps, scope, job, rest, input.message, t, 'new');
      await moveJobToAwaiting(scope, job, t);
      request = requestDto(r, rest.map((f) => f.id));
    }
    return { request, approvedWithinLimit };
  });
}

// ─── Staff: list, revoke, resend ─────────────────────────────────────────────

export async function listRequests(scope: Scope, jobId: string): Promise<ApprovalRequestDto[]> {
  const job = await findJob(scope, jobId);
  await expireDue(new Date(), { jobId: job.id });
  const rows = await ApprovalRequest.findAll({ where: inWorkshop(scope, { jobId: job.id }), order: [['sentAt', 'DESC'], ['createdAt', 'DESC']] });
  const ids = await findingIdsOf(rows.map((r) => r.id));
  return rows.map((r) => requestDto(r, ids.get(r.id) ?? []));
}

async function lockRequest(scope: Scope, id: string, t: Transaction): Promise<{ r: ApprovalRequest; job: JobRow }> {
  const found = await ApprovalRequest.findOne({ where: inWorkshop(scope, { id }), transaction: t });
  if (!found) throw notFound('That approval request');
  // The job first, then the request: the same order as a save or a decision, so none deadlock.
  const job = await findJob(scope, found.jobId, t, true);
  const r = await ApprovalRequest.findOne({ where: inWorkshop(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
  return { r: r!, job };
}

export async function revokeRequest(scope: Scope, id: string): Promise<ApprovalRequestDto> {
  requireStaff(scope);
  return boundSequelize().transaction(async (t) => {
    const { r, job } = await lockRequest(scope, id, t);
    if (r.state !== 'sent') throw new AppError('invalid_transition', 409, `This request is ${r.state}; only a request waiting for the owner can be revoked.`);
    const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
    await r.update({ state: 'revoked', revokedAt: new Date() }, { transaction: t });
    await setFindingState(job.id, ids, 'priced', t);
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'approval.revoked',
      summary: `Revoked the approval link sent ${r.sentAt.toISOString().slice(0, 10)}; its findings are back to priced`,
      detail: { requestId: r.id },
    });
    return requestDto(r, ids);
  });
}

/**
 * A new link for the same snapshot: the old link stops working and the expiry restarts. A revoked
 * or expired request can be re-sent only while its findings still carry the prices the owner saw.
 */
export async function resendRequest(deps: Deps, scope: Scope, id: string): Promise<ApprovalRequestDto> {
  requireStaff(scope);
  return boundSequelize().transaction(async (t) => {
    const { r, job } = await lockRequest(scope, id, t);
    if (r.state === 'decided' || r.state === 'replaced') {
      throw new AppError('invalid_transition', 409, `This request is ${r.state}; send a new request instead.`);
    }
    const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
    if (r.state !== 'sent') {
      const findings = await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: ids }), transaction: t, lock: t.LOCK.UPDATE });
      const moved = findings.filter((f) => f.state !== 'priced');
      if (moved.length) throw conflict(`${moved.map((f) => num(f.seq)).join(', ')} changed since this request was sent; send a new request instead.`);
      const { priced } = await pricedJob(scope, job.id, t);
      const now = new Map(priced.findings.map((f) => [f.findingId, f.price.gross]));
      if (r.snapshot.findings.some((f) => now.get(f.findingId) !== f.price.gross)) {
        throw conflict('A price in this request has changed since it was sent; send a new request so the owner sees the new price.');
      }
      await setFindingState(job.id, ids, 'sent', t);
      await moveJobToAwaiting(scope, job, t);
    }
    const w = await loadWorkshop(scope, t);
    const link = newLink(deps, r.id);
    const expiresAt = new Date(Date.now() + toWorkshopDto(w).settings.approvalLinkDays * 86_400_000);
    // Only the old token's hash is kept, so an older e-mail's link can say a newer one was sent.
    await boundSequelize().query(`INSERT INTO approval_superseded_links (token_hash, request_id, superseded_at) VALUES ($1, $2, now()) ON CONFLICT DO NOTHING`, {
      bind: [r.tokenHash, r.id],
      transaction: t,
    });
    await r.update({ state: 'sent', linkNonce: link.nonce, tokenHash: link.tokenHash, expiresAt, revokedAt: null, lastRemindedAt: null }, { transaction: t });
    const owner = await ownerContact(job, t);
    await deps.mail.enqueue(approvalRequestMail({ to: owner.email, ownerName: owner.name, snapshot: r.snapshot, link: link.url, replacement: false, expiresAt }), t);
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'approval.resent',
      summary: `Re-sent the approval request to ${owner.name} with a new link (the earlier link no longer works); it works until ${expiresAt.toISOString().slice(0, 10)}`,
      detail: { requestId: r.id },
    });
    return requestDto(r, ids);
  });
}

// ─── Replacement on a price change ───────────────────────────────────────────

/**
 * Called inside an estimate save: a sent request whose findings' engine prices no longer match the
 * snapshot is replaced by a new request for the same findings at the new prices.
 */
export async function replaceChangedRequests(deps: Deps, scope: Scope, job: JobRow, t: Transaction): Promise<void> {
  const open = await ApprovalRequest.findAll({ where: inWorkshop(scope, { jobId: job.id, state: 'sent' }), transaction: t, lock: t.LOCK.UPDATE });
  if (!open.length) return;
  const { priced } = await pricedJob(scope, job.id, t);
  const now = new Map(priced.findings.map((f) => [f.findingId, f.price.gross]));
  const ids = await findingIdsOf(open.map((r) => r.id), t);
  for (const r of open) {
    const changed = r.snapshot.findings.filter((f) => now.get(f.findingId) !== f.price.gross);
    if (!changed.length) continue;
    const all = ids.get(r.id) ?? [];
    // A finding withdrawn since sending leaves the request as it is (withdrawn).
    const sent = new Set((await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: all, state: 'sent' }), attributes: ['id'], transaction: t })).map((f) => f.id));
    // Keep the order the manager sent them in: the owner meets the findings in the same order again.
    const findingIds = all.filter((id) => sent.has(id));
    await setFindingState(job.id, findingIds, 'priced', t);
    const findings = await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: findingIds }), transaction: t });
    const byId = new Map(findings.map((f) => [f.id, f]));
    // A finding whose lines were all removed cannot be priced for the owner: it drops out.
    const still = findingIds.map((id) => byId.get(id)!).filter((f) => now.has(f.id));
    const dropped = findingIds.filter((id) => !now.has(id));
    if (dropped.length) await setFindingState(job.id, dropped, 'draft', t);
    if (!still.length) {
      await r.update({ state: 'revoked', revokedAt: new Date() }, { transaction: t });
      await recordAudit(scope, t, { jobId: job.id, action: 'approval.revoked', summary: 'Revoked an approval request: none of its findings is still priced for the owner', detail: { requestId: r.id } });
      continue;
    }
    const next = await createRequest(deps, scope, job, still, r.snapshot.message, t, 'replacement');
    await r.update({ state: 'replaced', replacedById: next.id }, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'approval.replaced',
      summary: `The approval request sent ${r.sentAt.toISOString().slice(0, 10)} was replaced: the price of ${changed.map((f) => f.number).join(', ')} changed after sending`,
      detail: { requestId: r.id, replacedById: next.id, changed: changed.map((f) => ({ findingId: f.findingId, was: f.price.gross, now: now.get(f.findingId) ?? null })) },
    });
  }
}

// ─── The owner's decision ────────────────────────────────────────────────────

const day = (d: Date) => d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' });

function closedReason(r: ApprovalRequest): string | null {
  switch (r.state) {
    case 'sent':
      return null;
    case 'decided':
      return `This request was already decided${r.decidedByName ? ` by ${r.decidedByName}` : ''} on ${day(r.decidedAt!)}. Your decisions are shown below; contact the workshop to change anything.`;
    case 'expired':
      return `This link expired on ${day(r.expiresAt)}. Ask the workshop to send it again.`;
    case 'revoked':
      return `The workshop withdrew this link on ${day(r.revokedAt ?? r.updatedAt)}. Contact the workshop if you expected to decide here.`;
    case 'replaced':
      return `This request was replaced by a newer one on ${day(r.updatedAt)}: the workshop changed a price. Use the link in the newest e-mail.`;
  }
  return null;
}

async function decisionsOf(requestId: string, t?: Transaction): Promise<DecisionPageDto['decisions']> {
  const rows = await boundSequelize().query<{ finding_id: string; decision: 'approve' | 'decline'; note: string }>(
    `SELECT d.finding_id, d.decision, d.note FROM approval_decisions d JOIN approval_request_findings f USING (request_id, finding_id)
     WHERE d.request_id = $1 ORDER BY f.position`,
    { bind: [requestId], type: QueryTypes.SELECT, transaction: t },
  );
  return rows.length ? rows.map((r) => ({ findingId: r.finding_id, decision: r.decision, note: r.note })) : null;
}

async function pageOf(r: ApprovalRequest, t?: Transaction): Promise<DecisionPageDto> {
  return {
    state: r.state,
    closedReason: closedReason(r),
    snapshot: withPhotos(r.snapshot),
    snapshotHash: r.snapshotHash,
    decisions: r.state === 'decided' ? await decisionsOf(r.id, t) : null,
    decidedByName: r.decidedByName ?? null,
    decidedAt: r.decidedAt ? r.decidedAt.toISOString() : null,
    newerLinkSentAt: null,
  };
}

/** The request a superseded link belonged to, and when its newest link was sent; null if the link was never issued. */
async function bySupersededToken(token: string, t: Transaction): Promise<{ requestId: string; newestAt: Date } | null> {
  const [row] = await boundSequelize().query<{ request_id: string; newest_at: Date }>(
    `SELECT s.request_id, (SELECT max(x.superseded_at) FROM approval_superseded_links x WHERE x.request_id = s.request_id) AS newest_at
       FROM approval_superseded_links s WHERE s.token_hash = $1`,
    { bind: [sha256(token)], type: QueryTypes.SELECT, transaction: t },
  );
  return row ? { requestId: row.request_id, newestAt: new Date(row.newest_at) } : null;
}

/** What an older e-mail's link says: a newer link exists, and what has happened to the request since. */
function supersededReason(r: ApprovalRequest, newestAt: Date): string {
  const first = `A newer link was sent to you on ${day(newestAt)}`;
  switch (r.state) {
    case 'decided':
      return `${first}, and the request has since been decided. Contact the workshop to change anything.`;
    case 'expired':
      return `${first}, and that link has since run out. Ask the workshop to send the request again.`;
    case 'revoked':
      return `${first}, and the workshop has since withdrawn the request. Contact the workshop if you expected to decide it.`;
    case 'replaced':
      return `${first}, and the request has since been replaced by a newer one: use the link in the newest e-mail.`;
    default:
      return `${first}: use the link in the newest e-mail.`;
  }
}

/**
 * The closed page for a superseded link: the request's state and plain words, but none of its
 * decisions and no photos (the photo route knows only the current link), and nothing to decide.
 */
function supersededPageOf(r: ApprovalRequest, newestAt: Date): DecisionPageDto {
  const snap = withPhotos(r.snapshot);
  return {
    state: r.state,
    closedReason: supersededReason(r, newestAt),
    snapshot: { ...snap, findings: snap.findings.map((f) => ({ ...f, photos: [] })) },
    snapshotHash: r.snapshotHash,
    decisions: null,
    decidedByName: null,
    decidedAt: null,
    newerLinkSentAt: newestAt.toISOString(),
  };
}

/** Same answer for a malformed and an unknown token, so the route says nothing about other links. */
function byToken(token: string, t?: Transaction, lock = false): Promise<ApprovalRequest | null> {
  return ApprovalRequest.findOne({ where: { tokenHash: sha256(token) }, transaction: t, lock: lock && t ? t.LOCK.UPDATE : undefined });
}

const unknownLink = () => new AppError('not_found', 404, 'This approval link is not valid. Use the link in the newest e-mail from the workshop.');

/** Marks a request expired if its time has passed; its findings go back to priced for the workshop to re-send. */
async function expireIfDue(r: ApprovalRequest, now: Date, t: Transaction): Promise<void> {
  if (r.state !== 'sent' || r.expiresAt > now) return;
  const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
  await r.update({ state: 'expired' }, { transaction: t });
  await setFindingState(r.jobId, ids, 'priced', t);
  await AuditEvent.create(
    { workshopId: r.workshopId, jobId: r.jobId, actorUserId: null, action: 'approval.expired', summary: `The approval link sent ${r.sentAt.toISOString().slice(0, 10)} expired without a decision`, detail: { requestId: r.id } },
    { transaction: t },
  );
}

async function expireDue(now: Date, where: { jobId?: string } = {}): Promise<number> {
  const due = await ApprovalRequest.findAll({ where: { state: 'sent', ...where }, attributes: ['id', 'expiresAt'] });
  let n = 0;
  for (const d of due.filter((x) => x.expiresAt <= now)) {
    await boundSequelize().transaction(async (t) => {
      const r = await ApprovalRequest.findOne({ where: { id: d.id }, transaction: t, lock: t.LOCK.UPDATE });
      if (r && r.state === 'sent' && r.expiresAt <= now) {
        await expireIfDue(r, now, t);
        n += 1;
      }
    });
  }
  return n;
}

export async function getDecisionPage(token: string): Promise<DecisionPageDto> {
  return boundSequelize().transaction(async (t) => {
    const r = await byToken(token, t, true);
    if (!r) {
      const old = await bySupersededToken(token, t);
      if (!old) throw unknownLink();
      const req = await ApprovalRequest.findOne({ where: { id: old.requestId }, transaction: t, lock: t.LOCK.UPDATE });
      if (!req) throw unknownLink();
      await expireIfDue(req, new Date(), t);
      return supersededPageOf(req, old.newestAt);
    }
    await expireIfDue(r, new Date(), t);
    return pageOf(r, t);
  });
}

function sameHash(a: string, b: string): boolean {
  return a.length === b.length && timingSafeEqual(Buffer.from(a), Buffer.from(b));
}

export async function submitDecision(deps: Deps, token: string, input: DecisionInput, from: { ip: string; userAgent: string }): Promise<DecisionPageDto> {
  const result = await boundSequelize().transaction(async (t) => {
    const peek = await byToken(token, t);
    if (!peek) {
      const old = await bySupersededToken(token, t);
      const req = old ? await ApprovalRequest.findOne({ where: { id: old.requestId }, transaction: t }) : null;
      if (!old || !req) throw unknownLink();
      return { refused: supersededReason(req, old.newestAt), page: null };
    }
    // The job first, as every staff change does; then the request row, which serialises two submissions.
    await lockJobById(peek.jobId, t);
    const r = await byToken(token, t, true);
    if (!r) throw unknownLink();
    await expireIfDue(r, new Date(), t);
    if (r.state !== 'sent') return { refused: closedReason(r) ?? 'This request can no longer be decided.', page: null };
    if (!sameHash(input.snapshotHash, r.snapshotHash)) {
      throw conflict('This page is out of date: what you saw differs from the request the workshop sent. Reload the page and decide again.');
    }
    const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
    const given = new Map(input.decisions.map((d) => [d.findingId, d]));
    if (given.size !== input.decisions.length || ids.length !== given.size || ids.some((id) => !given.has(id))) {
      throw new AppError('validation_failed', 400, 'Decide every finding in this request, each once.', { decisions: 'Approve or decline each finding shown.' });
    }
    const approve = ids.filter((id) => given.get(id)!.decision === 'approve');
    const decline = ids.filter((id) => given.get(id)!.decision === 'decline');
    const now = new Date();
    for (const id of ids) {
      const d = given.get(id)!;
      await boundSequelize().query(`INSERT INTO approval_decisions (job_id, request_id, finding_id, decision, note) VALUES ($1, $2, $3, $4, $5)`, {
        bind: [r.jobId, r.id, id, d.decision, d.note],
        transaction: t,
      });
    }
    await moveLines(r.jobId, approve, 'discovered', 'approved', t);
    await moveLines(r.jobId, decline, 'discovered', 'declined', t);
    await setFindingState(r.jobId, approve, 'approved', t);
    await setFindingState(r.jobId, decline, 'declined', t);
    await bumpEstimate(r.jobId, t);
    await r.update({ state: 'decided', decidedAt: now, decidedByName: input.typedName, decidedIp: from.ip.slice(0, 100), decidedUserAgent: from.userAgent.slice(0, 500) }, { transaction: t });

    const snap = r.snapshot;
    const numbers = (list: string[]) => list.map((id) => snap.findings.find((f) => f.findingId === id)?.number ?? id).join(', ') || 'none';
    const audit = (action: string, summary: string, detail: Record<string, unknown>) =>
      AuditEvent.create({ workshopId: r.workshopId, jobId: r.jobId, actorUserId: null, action, summary, detail }, { transaction: t });
    await audit('approval.decided', `${input.typedName} decided the approval request: approved ${numbers(approve)}; declined ${numbers(decline)}`, {
      requestId: r.id,
      snapshotHash: r.snapshotHash,
      typedName: input.typedName,
      ip: from.ip,
      userAgent: from.userAgent,
      decisions: input.decisions,
    });
    // Once nothing waits for the owner, the work can go on.
    const job = (await Job.findOne({ where: { id: r.jobId }, transaction: t }))!;
    const open = await ApprovalRequest.count({ where: { jobId: r.jobId, state: 'sent' }, transaction: t });
    if (job.state === 'awaiting_owner' && open === 0) {
      await job.update({ state: 'in_work' }, { transaction: t });
      await audit('job.state_changed', 'Awaiting owner → In work: the owner has decided every finding sent', { from: 'awaiting_owner', to: 'in_work' });
    }
    const declinedAirworthiness = snap.findings.filter((f) => decline.includes(f.findingId) && f.category === 'airworthiness');
    const customer = await boundSequelize().query<{ email: string }>(
      `SELECT c.email FROM jobs j JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id WHERE j.id = $1`,
      { bind: [r.jobId], type: QueryTypes.SELECT, transaction: t },
    );
    if (customer[0]) {
      await deps.mail.enqueue(
        approvalReceiptMail({
          to: customer[0].email,
          typedName: input.typedName,
          snapshot: snap,
          decidedAt: now,
          decisions: ids.map((id) => ({ finding: snap.findings.find((f) => f.findingId === id)!, decision: given.get(id)!.decision, note: given.get(id)!.note })),
          declinedAirworthiness: declinedAirworthiness.map((f) => `${f.number} ${f.title}`),
          link: linkOf(deps, r),
        }),
        t,
      );
    }
    return { refused: null, page: await pageOf(r, t) };
  });
  if (!result.page) throw conflict(result.refused ?? 'This request can no longer be decided.');
  return result.page;
}

// ─── Reminders and expiry ────────────────────────────────────────────────────

/**
 * The scheduled work, callable with any clock: marks past-expiry requests expired, then e-mails
 * one reminder per open request once chaseAfterHours have passed since sending or the last reminder.
 */
export async function chaseUndecided(deps: Deps, now: Date = new Date()): Promise<{ expired: number; reminded: number }> {
  const expired = await expireDue(now);
  const open = await ApprovalRequest.findAll({ where: { state: 'sent' }, attributes: ['id', 'workshopId'] });
  let reminded = 0;
  for (const o of open) {
    await boundSequelize().transaction(async (t) => {
      const r = await ApprovalRequest.findOne({ where: { id: o.id }, transaction: t, lock: t.LOCK.UPDATE, skipLocked: true });
      if (!r || r.state !== 'sent' || r.expiresAt <= now) return;
      const w = await Workshop.findByPk(r.workshopId, { transaction: t });
      if (!w) return;
      const hours = toWorkshopDto(w).settings.chaseAfterHours;
      const since = r.lastRemindedAt ?? r.sentAt;
      if (now.getTime() - since.getTime() < hours * 3_600_000) return;
      const [c] = await boundSequelize().query<{ email: string; name: string }>(
        `SELECT c.email, c.name FROM jobs j JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id WHERE j.id = $1`,
        { bind: [r.jobId], type: QueryTypes.SELECT, transaction: t },
      );
      if (!c) return;
      await r.update({ lastRemindedAt: now }, { transaction: t });
      await deps.mail.enqueue(approvalReminderMail({ to: c.email, ownerName: c.name, snapshot: r.snapshot, link: linkOf(deps, r), expiresAt: r.expiresAt }), t);
      await AuditEvent.create(
        { workshopId: r.workshopId, jobId: r.jobId, actorUserId: null, action: 'approval.reminded', summary: `Reminded ${c.name} by e-mail: the approval request sent ${r.sentAt.toISOString().slice(0, 10)} is still undecided`, detail: { requestId: r.id } },
        { transaction: t },
      );
      reminded += 1;
    });
  }
  return { expired, reminded };
}
