import { approvalReminderMail } from '../mail/approval-mails.js';
import { ApprovalRequest, AuditEvent, Workshop, boundSequelize } from '../models/index.js';
import { expireDue } from '../services/approvals/index.js';
import { linkOf } from '../services/approvals/links.js';
import { OPEN_REQUEST, jobOwner } from '../services/approvals/repository.js';
import type { Deps } from '../services/deps.js';
import { toWorkshopDto } from '../services/workshop.service.js';

/**
 * The scheduled work, callable with any clock: marks past-expiry requests expired, then e-mails
 * one reminder per open request once chaseAfterHours have passed since sending or the last reminder.
 */
export async function chaseUndecided(deps: Deps, now: Date = new Date()): Promise<{ expired: number; reminded: number }> {
  const expired = await expireDue(now);
  const open = await ApprovalRequest.findAll({ where: { state: OPEN_REQUEST }, attributes: ['id', 'workshopId'] });
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
      const c = await jobOwner(r.jobId, t);
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
