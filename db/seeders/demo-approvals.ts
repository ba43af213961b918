import { randomBytes, randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { estimateEngineInput, formatMoney, priceEstimate } from '../../shared/src/index.js';
import { ApprovalRequest, AuditEvent, Customer, Finding, User, Workshop } from '../../server/src/models/index.js';
import { buildSnapshot, sha256, snapshotHashOf } from '../../server/src/services/approvals/index.js';
import { agreeQuoteLines, loadLines } from '../../server/src/services/estimates.service.js';
import { findJob } from '../../server/src/services/job-access.js';
import { snapshotPhotosOf } from '../../server/src/services/photos.service.js';
import { pricingOf } from '../../server/src/services/pricing.js';
import type { Scope } from '../../server/src/services/scope.js';
import type { SeededJob } from './demo-estimates.js';

const day = 86_400_000;

/** Jobs whose work has started: their quotes were agreed before the work began. */
const WORK_STARTED = ['in_work', 'ready_for_release', 'invoiced', 'paid', 'closed'];

/**
 * The demo's quotes and approval requests. Every job whose work has started has its quote agreed
 * by phone (who, when); Q-BRKE's 100-hour service has its quote agreed by phone and findings waiting
 * for Elspeth; Q-BRKA's permit inspection has its quote sent and waiting; Q-SALT's decided request
 * is behind its approved and declined findings. The seed knows no server secret, so its links open
 * nothing; the manager re-sends a waiting one to get a working link by e-mail.
 */
export async function seedApprovals(w: Workshop, jobs: SeededJob[], staff: Map<string, User>, now: Date, t: Transaction): Promise<void> {
  const manager = staff.get('declan')!;
  const scope: Scope = { workshopId: w.id, userId: manager.id, role: 'manager', customerId: null };
  const pricing = pricingOf(w);
  const settings = { approvalLinkDays: 14, ...(w.settings as { approvalLinkDays?: number }) };

  const agreeByPhone = async (seeded: SeededJob, at: Date) => {
    const job = await findJob(scope, seeded.job.id, t);
    const owner = await Customer.findByPk(job.aircraft.customerId, { transaction: t });
    const n = await agreeQuoteLines(job.id, { how: 'phone', by: owner!.name, at, ref: null }, t);
    if (!n) return;
    await AuditEvent.create(
      {
        workshopId: w.id, jobId: job.id, actorUserId: manager.id, action: 'estimate.quote_agreed', at, detail: { how: 'phone', agreedWith: owner!.name, lines: n },
        summary: `Quote agreed by phone with ${owner!.name}: ${n} ${n === 1 ? 'line' : 'lines'}`,
      },
      { transaction: t },
    );
  };
  for (const seeded of jobs) {
    if (WORK_STARTED.includes(seeded.job.state)) await agreeByPhone(seeded, seeded.at);
  }

  const make = async (seeded: SeededJob, findingStates: string[], sentAt: Date, message: string, includeQuote = false) => {
    const job = await findJob(scope, seeded.job.id, t);
    const findings = (await Finding.findAll({ where: { jobId: job.id }, order: [['seq', 'ASC']], transaction: t })).filter((f) => findingStates.includes(f.state));
    const ids = new Set(findings.map((f) => f.id));
    const { lines, accessTasks } = await loadLines(scope, job.id, t);
    // As the owner saw it when sent: the decided lines were still awaiting a decision then.
    const asSent = lines.map((l) => (l.findingId && ids.has(l.findingId) ? { ...l, stage: 'discovered' as const } : l));
    const priced = priceEstimate(estimateEngineInput(asSent, accessTasks), pricing);
    const owner = await Customer.findByPk(job.aircraft.customerId, { transaction: t });
    const id = randomUUID();
    const expiresAt = new Date(sentAt.getTime() + settings.approvalLinkDays * day);
    const snapshot = buildSnapshot({
      requestId: id, job, w, owner: { name: owner!.name }, message, sentAt, expiresAt, includeQuote, quoteChange: false, findings, lines: asSent, tasks: accessTasks, priced,
      photos: await snapshotPhotosOf(findings.map((f) => f.id), t),
    });
    const r = await ApprovalRequest.create(
      {
        id, workshopId: w.id, jobId: job.id, snapshot, snapshotHash: snapshotHashOf(snapshot), linkNonce: randomBytes(16).toString('hex'),
        tokenHash: sha256(randomBytes(32).toString('hex')), gross: snapshot.totals.approvingNow.gross, includesQuote: includeQuote, sentAt, expiresAt, sentByUserId: manager.id,
      },
      { transaction: t },
    );
    await w.sequelize.query(
      `INSERT INTO approval_request_findings (job_id, request_id, finding_id, position) SELECT $1, $2, f, i FROM unnest($3::uuid[]) WITH ORDINALITY AS x(f, i)`,
      { bind: [job.id, id, findings.map((f) => f.id)], transaction: t },
    );
    await AuditEvent.create(
      {
        workshopId: w.id, jobId: job.id, actorUserId: manager.id, action: 'approval.sent', at: sentAt, detail: { requestId: id },
        summary: `Sent ${[...(includeQuote ? ['the quote'] : []), ...findings.map((f) => `F-${f.seq}`)].join(', ')} to ${owner!.name} for approval: ${formatMoney(r.gross, w.currency)} incl. VAT if all approved`,
      },
      { transaction: t },
    );
    return { r, findings, owner: owner! };
  };

  const brke = jobs.find((j) => j.registration === 'Q-BRKE' && j.job.title === '100-hour engine service');
  if (brke) {
    await agreeByPhone(brke, new Date(now.getTime() - 5 * day));
    const { findings } = await make(brke, ['priced'], new Date(now.getTime() - day), 'We found these during the 100-hour service. The exhaust gasket and the coolant hose can share the exhaust access work, so that opening-up is charged once.');
    await Finding.update({ state: 'sent' }, { where: { id: findings.map((f) => f.id) }, transaction: t });
  }

  const salt = jobs.find((j) => j.registration === 'Q-SALT' && j.job.title === 'Wing strip inspection and re-cover');
  if (salt) {
    const sentAt = new Date(now.getTime() - 3 * day);
    const { r, findings } = await make(salt, ['approved', 'declined'], sentAt, 'Two findings from the wing strip inspection.');
    const decidedAt = new Date(sentAt.getTime() + day / 3);
    for (const f of findings) {
      await w.sequelize.query(`INSERT INTO approval_decisions (job_id, request_id, item_id, finding_id, decision, note) VALUES ($1, $2, $3, $6, $4, $5)`, {
        bind: [r.jobId, r.id, f.id, f.state === 'approved' ? 'approve' : 'decline', f.state === 'declined' ? 'The group will source a fitting from the type club first.' : '', f.id],
        transaction: t,
      });
    }
    await r.update({ state: 'decided', decidedAt, decidedByName: 'Hazel Brambury', decidedIp: '127.0.0.1', decidedUserAgent: 'demo seed' }, { transaction: t });
    await AuditEvent.create(
      {
        workshopId: w.id, jobId: r.jobId, actorUserId: null, action: 'approval.decided', at: decidedAt, detail: { requestId: r.id, snapshotHash: r.snapshotHash },
        summary: `Hazel Brambury decided the approval request: approved ${findings.filter((f) => f.state === 'approved').map((f) => `F-${f.seq}`).join(', ')}; declined ${findings.filter((f) => f.state === 'declined').map((f) => `F-${f.seq}`).join(', ')}`,
      },
      { transaction: t },
    );
  }

  const brka = jobs.find((j) => j.registration === 'Q-BRKA' && j.job.title === 'Annual permit inspection');
  if (brka) await make(brka, [], new Date(now.getTime() - day / 2), 'Here is the quote for the annual permit inspection. Please agree it so we can carry on once the checks are done.', true);
}
