import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  QUOTE_ITEM_ID,
  canStartWork,
  priceChoice,
  workshopContactWords,
  type ApprovalSnapshot,
  type Decision,
  type DecisionPageDto,
  type JobDto,
  type decisionSubmitSchema,
  formatMoment,
} from '@wingstage/shared';
import { AppError, conflict } from '../../errors/app-error.js';
import { approvalReceiptMail, decisionToStaffMail } from '../../mail/approval-mails.js';
import { ApprovalRequest, AuditEvent, Job, User } from '../../models/index.js';
import type { Deps } from '../deps.js';
import { agreeQuoteLines, moveFindingLines, unagreedQuoteLines } from '../estimates.service.js';
import { moveFindings } from '../findings.repository.js';
import { findJob, lockJobById } from '../job-access.js';
import { moveJob } from '../job-state.js';
import { withPhotos } from '../photos.service.js';
import { requireStaff, type Scope } from '../scope.js';
import { linkOf, sameHash, sha256 } from './links.js';
import { bySupersededHash, decisionsOf, insertDecision, jobOwner, markDecisionsSeen, moveRequest, OPEN_REQUEST } from './repository.js';
import { checklistComplete, expireIfDue } from './requests.service.js';
import { itemIdsOf, itemName } from './snapshot.js';
import { raiseDepositsForDecision } from '../deposits.service.js';
import { inTransaction } from '../../db/transaction.js';

type DecisionInput = z.output<typeof decisionSubmitSchema>;

const day = (d: Date) => formatMoment(d, 'day-month');

function closedReason(r: ApprovalRequest): string | null {
  const contact = workshopContactWords(r.snapshot);
  switch (r.state) {
    case 'sent':
      return null;
    case 'decided':
      return `This request was already decided${r.decidedByName ? ` by ${r.decidedByName}` : ''} on ${day(r.decidedAt!)}. Your decisions are shown below; to change anything, contact ${contact}.`;
    case 'expired':
      return `This link expired on ${day(r.expiresAt)}. Ask the workshop to send the request again: ${contact}.`;
    case 'revoked':
      return `The workshop revoked this link on ${day(r.revokedAt ?? r.updatedAt)}. If you expected to decide here, contact ${contact}.`;
    case 'replaced':
      return `This request was replaced by a newer one on ${day(r.updatedAt)}: the workshop changed a price. Use the link in the newest e-mail.`;
  }
  return null;
}

async function pageOf(r: ApprovalRequest, t?: Transaction): Promise<DecisionPageDto> {
  return {
    state: r.state,
    closedReason: closedReason(r),
    snapshot: withPhotos(r.snapshot),
    snapshotHash: r.snapshotHash,
    expiresAt: r.expiresAt.toISOString(),
    decisions: r.state === 'decided' ? await decisionsOf(r.id, t) : null,
    decidedByName: r.decidedByName ?? null,
    decidedAt: r.decidedAt ? r.decidedAt.toISOString() : null,
    newerLinkSentAt: null,
  };
}

/** What an older e-mail's link says: a newer link exists, and what has happened to the request since. */
function supersededReason(r: ApprovalRequest, newestAt: Date): string {
  const first = `A newer link was sent to you on ${day(newestAt)}`;
  const contact = workshopContactWords(r.snapshot);
  switch (r.state) {
    case 'decided':
      return `${first}, and the request has since been decided. To change anything, contact ${contact}.`;
    case 'expired':
      return `${first}, and that link has since run out. Ask the workshop to send the request again: ${contact}.`;
    case 'revoked':
      return `${first}, and the workshop has since revoked the request. If you expected to decide it, contact ${contact}.`;
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
    expiresAt: r.expiresAt.toISOString(),
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

export async function getDecisionPage(token: string): Promise<DecisionPageDto> {
  return inTransaction(async (t) => {
    const r = await byToken(token, t, true);
    if (!r) {
      const old = await bySupersededHash(sha256(token), t);
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

/** The job's managers (admins when it has none): they hear about every owner's decision. */
async function staffToTell(workshopId: string, t: Transaction): Promise<{ name: string; email: string }[]> {
  const active = await User.findAll({ where: { workshopId, active: true, role: ['manager', 'admin'] }, attributes: ['name', 'email', 'role'], order: [['name', 'ASC']], transaction: t });
  const managers = active.filter((u) => u.role === 'manager');
  return (managers.length ? managers : active).map((u) => ({ name: u.name, email: u.email }));
}

export async function submitDecision(deps: Deps, token: string, input: DecisionInput, from: { ip: string; userAgent: string }): Promise<DecisionPageDto> {
  const result = await inTransaction(async (t) => {
    const peek = await byToken(token, t);
    if (!peek) {
      const old = await bySupersededHash(sha256(token), t);
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
    const snap: ApprovalSnapshot = r.snapshot;
    const ids = itemIdsOf(snap);
    const given = new Map(input.decisions.map((d) => [d.itemId, d]));
    if (given.size !== input.decisions.length || ids.length !== given.size || ids.some((id) => !given.has(id))) {
      throw new AppError('validation_failed', 400, 'Decide every item in this request, each once.', { decisions: 'Approve or decline each item shown.' });
    }
    const choice = Object.fromEntries(ids.map((id) => [id, given.get(id)!.decision]));
    const figures = priceChoice(snap.basis, choice);
    const findingIds = snap.findings.map((f) => f.findingId);
    const approve = findingIds.filter((id) => choice[id] === 'approve');
    const decline = findingIds.filter((id) => choice[id] === 'decline');
    const now = new Date();
    for (const id of ids) {
      const d = given.get(id)!;
      await insertDecision(r, { itemId: id, findingId: id === QUOTE_ITEM_ID ? null : id, decision: d.decision, note: d.note }, t);
    }
    if (choice[QUOTE_ITEM_ID] === 'approve') await agreeQuoteLines(r.jobId, { how: 'owner_link', by: input.typedName, at: now, ref: r.id }, t);
    // A declined quote stays unagreed in the inspection scope: it never counts as agreed.
    await moveFindingLines(r.jobId, approve, 'discovered', 'approved', t);
    await moveFindingLines(r.jobId, decline, 'discovered', 'declined', t);
    await moveFindings(r.jobId, approve, 'approved', t);
    await moveFindings(r.jobId, decline, 'declined', t);
    await moveRequest(r, 'decided', t, { decidedAt: now, decidedByName: input.typedName, decidedIp: from.ip.slice(0, 100), decidedUserAgent: from.userAgent.slice(0, 500) });
    await raiseDepositsForDecision(deps, { workshopId: r.workshopId, jobId: r.jobId, approvalRequestId: r.id, figures }, t);

    const named = (want: Decision) => ids.filter((id) => choice[id] === want).map((id) => itemName(snap, id)).join(', ') || 'none';
    const audit = (action: string, summary: string, detail: Record<string, unknown>) =>
      AuditEvent.create({ workshopId: r.workshopId, jobId: r.jobId, actorUserId: null, action, summary, detail }, { transaction: t });
    await audit('approval.decided', `${input.typedName} decided the approval request: approved ${named('approve')}; declined ${named('decline')}`, {
      requestId: r.id,
      snapshotHash: r.snapshotHash,
      typedName: input.typedName,
      ip: from.ip,
      userAgent: from.userAgent,
      decisions: input.decisions,
      approvingNow: figures.approvingNow.gross,
      newTotal: figures.newTotal.gross,
    });
    // Work starts by itself only when nothing waits for the owner, the quote is agreed and the inspection is finished.
    const job = (await Job.findOne({ where: { id: r.jobId }, transaction: t }))!;
    if (job.state === 'awaiting_owner') {
      const open = await ApprovalRequest.count({ where: { jobId: r.jobId, state: OPEN_REQUEST }, transaction: t });
      const quoteAgreed = canStartWork({ unagreedLines: await unagreedQuoteLines(r.jobId, t) }).ok;
      if (open === 0 && quoteAgreed && (await checklistComplete(r.jobId, t))) {
        await moveJob(null, job, 'in_work', 'the owner has decided everything sent and the quote is agreed', t);
      }
    }
    const declinedAirworthiness = snap.findings.filter((f) => decline.includes(f.findingId) && f.category === 'airworthiness').map((f) => `${f.number} ${f.title}`);
    const decisions = ids.map((id) => ({ itemId: id, name: itemName(snap, id), decision: choice[id]!, note: given.get(id)!.note, gross: figures.items.find((i) => i.id === id)!.gross }));
    const owner = await jobOwner(r.jobId, t);
    if (owner) {
      await deps.mail.enqueue(approvalReceiptMail({ to: owner.email, typedName: input.typedName, snapshot: snap, decidedAt: now, decisions, figures, declinedAirworthiness, link: linkOf(deps, r) }), t);
    }
    const jobLink = `${deps.config.APP_URL.replace(/\/$/, '')}/jobs/${r.jobId}`;
    for (const s of await staffToTell(r.workshopId, t)) {
      await deps.mail.enqueue(decisionToStaffMail({ to: s.email, staffName: s.name, typedName: input.typedName, snapshot: snap, decidedAt: now, decisions, figures, declinedAirworthiness, link: jobLink }), t);
    }
    return { refused: null, page: await pageOf(r, t) };
  });
  if (!result.page) throw conflict(result.refused ?? 'This request can no longer be decided.');
  return result.page;
}

/** Staff mark a job's owner decisions seen: the flag on the jobs list and the job page clears. */
export async function markSeen(scope: Scope, jobId: string, getJob: (scope: Scope, id: string) => Promise<JobDto>): Promise<JobDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const job = await findJob(scope, jobId, t);
    await markDecisionsSeen(job.id, scope.userId, t);
  });
  return getJob(scope, jobId);
}
