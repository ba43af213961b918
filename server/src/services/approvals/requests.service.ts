import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  formatMoney,
  FINDING_CATEGORY_LABELS,
  FINDING_STATE_LABELS,
  assertRequestResendable,
  choiceBasisFrom,
  decidePreAuthorised,
  estimateEngineInput,
  priceEstimate,
  type AccessTaskDto,
  type ApprovalRequestDto,
  type EstimateLineDto,
  type PricedEstimate,
  type SendForApprovalResultDto,
  type approvalRequestCreateSchema,
} from '@wingstage/shared';
import { AppError, conflict, notFound } from '../../errors/app-error.js';
import { approvalRequestMail, withinLimitReportMail } from '../../mail/approval-mails.js';
import { ApprovalRequest, AuditEvent, Finding, JobChecklistItem, type Workshop, boundSequelize } from '../../models/index.js';
import { recordAudit } from '../audit.js';
import type { Deps } from '../deps.js';
import { assertEstimateEditable, ensureEstimate, loadLines, moveFindingLines } from '../estimates.service.js';
import { findingIdsIn, moveFindings } from '../findings.repository.js';
import { findJob, type JobRow } from '../job-access.js';
import { moveJob } from '../job-state.js';
import { snapshotPhotosOf } from '../photos.service.js';
import { loadWorkshop, pricingOf } from '../pricing.js';
import { inWorkshop, requireStaff, type Scope } from '../scope.js';
import { toWorkshopDto } from '../workshop.service.js';
import { canonicalJson, newLink } from './links.js';
import { usedSoFar } from './pre-authorisation.service.js';
import { addRequestFindings, findingIdsOf, jobOwner, moveRequest, supersedeLink, OPEN_REQUEST } from './repository.js';
import { buildSnapshot, findingNumber, workshopContact } from './snapshot.js';
import { snapshotHashOf } from './links.js';
import { inTransaction } from '../../db/transaction.js';

type SendInput = z.output<typeof approvalRequestCreateSchema>;


export function requestDto(r: ApprovalRequest, findingIds: string[]): ApprovalRequestDto {
  return {
    id: r.id,
    jobId: r.jobId,
    state: r.state,
    findingIds,
    includesQuote: r.includesQuote,
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

export async function ownerContact(job: JobRow, t: Transaction): Promise<{ name: string; email: string }> {
  const c = await jobOwner(job.id, t);
  if (!c) throw notFound('The owner');
  return c;
}

export async function pricedJob(scope: Scope, jobId: string, t: Transaction): Promise<{ w: Workshop; lines: EstimateLineDto[]; tasks: AccessTaskDto[]; priced: PricedEstimate }> {
  const w = await loadWorkshop(scope, t);
  const { lines, accessTasks } = await loadLines(scope, jobId, t);
  return { w, lines, tasks: accessTasks, priced: priceEstimate(estimateEngineInput(lines, accessTasks), pricingOf(w)) };
}

/** Every checklist item has a result (pass, fail, n/a or a measured value). */
export async function checklistComplete(jobId: string, t: Transaction): Promise<boolean> {
  return (await JobChecklistItem.count({ where: { jobId, result: null }, transaction: t })) === 0;
}

/**
 * Creates a request for the quote and/or these (priced) findings and queues its e-mail, inside the
 * caller's transaction: the request, the findings' new state and the e-mail commit together.
 */
async function createRequest(
  deps: Deps,
  scope: Scope,
  job: JobRow,
  items: { includeQuote: boolean; findings: Finding[] },
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
  const { findings, includeQuote } = items;
  const quoteChange = lines.some((l) => l.stage === 'inspection' && l.agreedAt !== null);
  const snapshot = buildSnapshot({
    requestId: id, job, w, owner, message, sentAt, expiresAt, includeQuote, quoteChange, findings, lines, tasks, priced,
    photos: await snapshotPhotosOf(findings.map((f) => f.id), t),
  });
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
      gross: snapshot.totals.approvingNow.gross,
      includesQuote: includeQuote,
      sentAt,
      expiresAt,
      sentByUserId: scope.userId,
    },
    { transaction: t },
  );
  await addRequestFindings(job.id, id, findings.map((f) => f.id), t);
  await moveFindings(job.id, findings.map((f) => f.id), 'sent', t);
  const list = [...(includeQuote ? [quoteChange ? 'the changed quote' : 'the quote'] : []), ...findings.map((f) => findingNumber(f.seq))].join(', ');
  await recordAudit(scope, t, {
    jobId: job.id,
    action: kind === 'new' ? 'approval.sent' : 'approval.replacement_sent',
    summary: `${kind === 'new' ? 'Sent' : 'Sent a replacement request for'} ${list} to ${owner.name} for approval: ${formatMoney(r.gross, w.currency)} incl. VAT if all approved; the link works until ${expiresAt.toISOString().slice(0, 10)}`,
    detail: { requestId: id, includesQuote: includeQuote, findingIds: findings.map((f) => f.id), gross: r.gross, snapshotHash: r.snapshotHash },
  });
  await deps.mail.enqueue(approvalRequestMail({ to: owner.email, ownerName: owner.name, snapshot, link: link.url, replacement: kind === 'replacement' }), t);
  return r;
}

/**
 * A job waits for the owner only once its inspection is finished: while the checklist is
 * unfinished it stays inspecting and the request simply waits. Work found while in work pauses it.
 */
async function moveJobToAwaiting(scope: Scope, job: JobRow, t: Transaction): Promise<void> {
  if (job.state === 'in_work') return moveJob(scope, job, 'awaiting_owner', 'findings sent for approval', t);
  if (job.state === 'inspecting' && (await checklistComplete(job.id, t))) {
    return moveJob(scope, job, 'awaiting_owner', 'inspection finished and the owner asked to decide', t);
  }
}

export async function sendForApproval(deps: Deps, scope: Scope, jobId: string, input: SendInput): Promise<SendForApprovalResultDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await findJob(scope, jobId, t, true);
    assertEstimateEditable(job);
    const est = await ensureEstimate(scope, job.id, t, true);
    if (est.version !== input.estimateVersion) {
      throw new AppError('stale_version', 409, 'The estimate changed since you opened it. Check the new prices, then send again.', { version: String(est.version) });
    }
    const { w, lines, priced } = await pricedJob(scope, job.id, t);
    if (input.includeQuote) {
      if (!lines.some((l) => l.stage === 'inspection' && l.agreedAt === null)) throw conflict('Nothing in the quote waits for the owner: every inspection line is already agreed.');
      const open = await ApprovalRequest.findOne({ where: inWorkshop(scope, { jobId: job.id, state: OPEN_REQUEST, includesQuote: true }), transaction: t });
      if (open) throw conflict(`The quote is already with the owner in the request sent ${open.sentAt.toISOString().slice(0, 10)}. Revoke that request to send it again.`);
    }
    const ids = [...new Set(input.findingIds)];
    const rows = ids.length ? await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: ids }), transaction: t, lock: t.LOCK.UPDATE }) : [];
    if (rows.length !== ids.length) throw notFound('A chosen finding');
    const byId = new Map(rows.map((f) => [f.id, f]));
    const ordered = ids.map((id) => byId.get(id)!);
    const notPriced = ordered.filter((f) => f.state !== 'priced');
    if (notPriced.length) {
      throw conflict(`Only priced findings can be sent: ${notPriced.map((f) => `${findingNumber(f.seq)} is ${FINDING_STATE_LABELS[f.state].toLowerCase()}`).join('; ')}.`);
    }
    // The standing go-ahead covers findings only, never the quote.
    const grossOf = new Map(priced.findings.map((f) => [f.findingId, f.price.gross]));
    const limit = decidePreAuthorised(
      { perFinding: job.preAuthPerFinding, perJob: job.preAuthPerJob, usedSoFar: await usedSoFar(job.id, t) },
      ordered.map((f) => ({ id: f.id, gross: grossOf.get(f.id) ?? '0' })),
      w.currency,
    );
    const inside = limit.decisions.filter((d) => d.inside);
    const approvedWithinLimit: SendForApprovalResultDto['approvedWithinLimit'] = [];
    for (const d of inside) {
      await moveFindings(job.id, [d.id], 'approved_within_limit', t, { withinLimitGross: d.gross });
      approvedWithinLimit.push({ findingId: d.id, number: findingNumber(byId.get(d.id)!.seq), gross: d.gross });
    }
    if (inside.length) {
      await moveFindingLines(job.id, inside.map((d) => d.id), 'discovered', 'approved', t);
      await recordAudit(scope, t, {
        jobId: job.id,
        action: 'finding.approved_within_limit',
        summary: `Approved under the owner's standing go-ahead: ${approvedWithinLimit.map((a) => `${a.number} ${formatMoney(a.gross, w.currency)}`).join(', ')} incl. VAT`,
        detail: { findings: approvedWithinLimit, headroom: limit.headroom },
      });
      const owner = await ownerContact(job, t);
      await deps.mail.enqueue(
        withinLimitReportMail({
          to: owner.email,
          ownerName: owner.name,
          workshopName: w.name,
          ...workshopContact(w),
          registration: job.aircraft.registration,
          jobTitle: job.title,
          findings: approvedWithinLimit.map((a) => ({ ...a, title: byId.get(a.findingId)!.title, category: FINDING_CATEGORY_LABELS[byId.get(a.findingId)!.category] })),
          currency: w.currency,
          headroom: limit.headroom,
          link: `${deps.config.APP_URL.replace(/\/$/, '')}/my-aircraft`,
        }),
        t,
      );
    }
    const rest = ordered.filter((f) => !inside.some((d) => d.id === f.id));
    let request: ApprovalRequestDto | null = null;
    if (rest.length || input.includeQuote) {
      const fresh = await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: rest.map((f) => f.id) }), transaction: t });
      const r = await createRequest(deps, scope, job, { includeQuote: input.includeQuote, findings: rest.map((f) => fresh.find((x) => x.id === f.id)!) }, input.message, t, 'new');
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
  return inTransaction(async (t) => {
    const { r, job } = await lockRequest(scope, id, t);
    const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
    await moveRequest(r, 'revoked', t, { revokedAt: new Date() });
    await moveFindings(job.id, ids, 'priced', t);
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'approval.revoked',
      summary: `Revoked the approval link sent ${r.sentAt.toISOString().slice(0, 10)}; its findings are back to priced${r.includesQuote ? ' and the quote waits to be sent again' : ''}`,
      detail: { requestId: r.id },
    });
    return requestDto(r, ids);
  });
}

/**
 * A new link for the same snapshot, for a request still waiting for the owner: the old link stops
 * working and the expiry restarts. An expired, revoked, replaced or decided request is final (the
 * request table); the workshop sends a new request instead.
 */
export async function resendRequest(deps: Deps, scope: Scope, id: string): Promise<ApprovalRequestDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const { r, job } = await lockRequest(scope, id, t);
    await expireIfDue(r, new Date(), t);
    assertRequestResendable(r.state);
    const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
    const w = await loadWorkshop(scope, t);
    const link = newLink(deps, r.id);
    const expiresAt = new Date(Date.now() + toWorkshopDto(w).settings.approvalLinkDays * 86_400_000);
    // Only the old token's hash is kept, so an older e-mail's link can say a newer one was sent.
    await supersedeLink(r.tokenHash, r.id, t);
    await r.update({ linkNonce: link.nonce, tokenHash: link.tokenHash, expiresAt, lastRemindedAt: null }, { transaction: t });
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
 * Called inside an estimate save (and a withdrawal, and a phone agreement): a sent request whose
 * items (the quote or findings) the engine now prices differently from the snapshot is replaced by
 * a new request for the items still awaiting the owner, at the new prices; one with none left is revoked.
 */
export async function replaceChangedRequests(deps: Deps, scope: Scope, job: JobRow, t: Transaction): Promise<void> {
  const open = await ApprovalRequest.findAll({ where: inWorkshop(scope, { jobId: job.id, state: OPEN_REQUEST }), transaction: t, lock: t.LOCK.UPDATE });
  if (!open.length) return;
  const { w, priced } = await pricedJob(scope, job.id, t);
  const ids = await findingIdsOf(open.map((r) => r.id), t);
  const quoteWaits = priced.lines.some((l) => l.stage === 'inspection' && !l.agreed);
  const hasDiscovered = new Set(priced.lines.filter((l) => l.stage === 'discovered' && l.findingId).map((l) => l.findingId!));
  for (const r of open) {
    const all = ids.get(r.id) ?? [];
    // A finding withdrawn since sending leaves the request as it is (withdrawn).
    const sent = new Set((await findingIdsIn(job.id, 'sent', t)).filter((id) => all.includes(id)));
    const stillIds = all.filter((id) => sent.has(id) && hasDiscovered.has(id));
    const quote = r.includesQuote && quoteWaits;
    const now = stillIds.length || quote ? choiceBasisFrom(priced, { quote, findingIds: stillIds }, pricingOf(w).vatRates, () => '') : null;
    const was = r.snapshot.basis;
    const strip = (b: typeof was | null) => (b ? { items: b.items, accessTasks: b.accessTasks.map((x) => ({ id: x.id, net: x.net, vatRate: x.vatRate })) } : null);
    if (now && canonicalJson(strip(now)) === canonicalJson(strip(was))) continue;
    const changed = was.items.filter((i) => canonicalJson(now?.items.find((n) => n.id === i.id) ?? null) !== canonicalJson(i)).map((i) => (i.kind === 'quote' ? 'the quote' : (r.snapshot.findings.find((f) => f.findingId === i.id)?.number ?? i.id)));
    const sentIds = all.filter((id) => sent.has(id));
    await moveFindings(job.id, sentIds, 'priced', t);
    const dropped = sentIds.filter((id) => !hasDiscovered.has(id));
    if (dropped.length) await moveFindings(job.id, dropped, 'draft', t);
    if (!now) {
      await moveRequest(r, 'revoked', t, { revokedAt: new Date() });
      await recordAudit(scope, t, { jobId: job.id, action: 'approval.revoked', summary: 'Revoked an approval request: nothing in it still waits for the owner at the price sent', detail: { requestId: r.id } });
      continue;
    }
    const findings = await Finding.findAll({ where: inWorkshop(scope, { jobId: job.id, id: stillIds }), transaction: t });
    // Keep the order the manager sent them in: the owner meets the items in the same order again.
    const next = await createRequest(deps, scope, job, { includeQuote: quote, findings: stillIds.map((id) => findings.find((f) => f.id === id)!) }, r.snapshot.message, t, 'replacement');
    await moveRequest(r, 'replaced', t, { replacedById: next.id });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'approval.replaced',
      summary: `The approval request sent ${r.sentAt.toISOString().slice(0, 10)} was replaced: the price of ${changed.join(', ') || 'its opening-up work'} changed after sending`,
      detail: { requestId: r.id, replacedById: next.id, changed },
    });
  }
}

// ─── Expiry ──────────────────────────────────────────────────────────────────

/** Marks a request expired if its time has passed; its findings go back to priced for the workshop to re-send. */
export async function expireIfDue(r: ApprovalRequest, now: Date, t: Transaction): Promise<void> {
  if (r.state !== 'sent' || r.expiresAt > now) return;
  const ids = (await findingIdsOf([r.id], t)).get(r.id) ?? [];
  await moveRequest(r, 'expired', t);
  await moveFindings(r.jobId, ids, 'priced', t);
  await AuditEvent.create(
    { workshopId: r.workshopId, jobId: r.jobId, actorUserId: null, action: 'approval.expired', summary: `The approval link sent ${r.sentAt.toISOString().slice(0, 10)} expired without a decision`, detail: { requestId: r.id } },
    { transaction: t },
  );
}

export async function expireDue(now: Date, where: { jobId?: string } = {}): Promise<number> {
  const due = await ApprovalRequest.findAll({ where: { state: OPEN_REQUEST, ...where }, attributes: ['id', 'expiresAt'] });
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
