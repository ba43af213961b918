import type { Transaction } from 'sequelize';
import { AuditEvent, CreditNote, DepositRequest, Invoice, Payment, type User, type Workshop } from '../../server/src/models/index.js';
import { jobMoney } from '../../server/src/payments/job-balance.js';
import { issueGoodwillCreditNoteIn } from '../../server/src/services/credit-notes.service.js';
import { issueInvoiceIn, recordOfflinePaymentIn } from '../../server/src/services/invoices.service.js';
import type { Scope } from '../../server/src/services/scope.js';
import type { SeededJob } from './demo-estimates.js';

const day = 86_400_000;
const iso = (d: Date) => d.toISOString().slice(0, 10);

/**
 * The demo's invoices, issued through the invoice service so numbers, documents, history and job
 * states are the real ones (invented figures, demo only):
 * - Q-MRLW's exhaust spring job: a card deposit taken when the springs were ordered, then the
 *   invoice issued with that deposit deducted; the balance is still owed (the owner can pay it);
 * - Q-BRKE's fuel hose job: invoiced, a goodwill credit note for a late return, and the rest paid
 *   by bank transfer, so the job is paid.
 */
export async function seedInvoices(w: Workshop, jobs: SeededJob[], staff: Map<string, User>, now: Date, t: Transaction): Promise<void> {
  const manager: Scope = { workshopId: w.id, userId: staff.get('declan')!.id, role: 'manager', customerId: null };
  const clerk = [...staff.values()].find((u) => u.role === 'accounts');
  const accounts: Scope = { workshopId: w.id, userId: clerk?.id ?? manager.userId, role: clerk ? 'accounts' : 'manager', customerId: null };
  const find = (reg: string, title: string) => jobs.find((j) => j.registration === reg && j.job.title === title);

  const springs = find('Q-MRLW', 'Exhaust spring replacement');
  if (springs && springs.job.state === 'ready_for_release') {
    const receivedAt = new Date(now.getTime() - 20 * day);
    const dr = await DepositRequest.create(
      {
        workshopId: w.id, jobId: springs.job.id, origin: 'manual', reason: 'Exhaust springs ordered (not stocked)', amount: '20.00', currency: w.currency,
        vatMix: [{ rate: '20', gross: '20.00' }], state: 'paid', paidAt: receivedAt, createdBy: manager.userId,
      },
      { transaction: t },
    );
    const p = await Payment.create(
      {
        workshopId: w.id, jobId: springs.job.id, kind: 'deposit', method: 'bank_transfer', depositRequestId: dr.id, state: 'succeeded', currency: w.currency,
        expectedAmount: '20.00', amount: '20.00', receivedAt, reference: 'MRLW SPRINGS', recordedBy: accounts.userId,
      },
      { transaction: t },
    );
    await AuditEvent.create(
      { workshopId: w.id, jobId: springs.job.id, actorUserId: accounts.userId, action: 'payment.recorded', summary: `Deposit received by bank transfer on ${iso(receivedAt)} (ref. MRLW SPRINGS)`, detail: { paymentId: p.id }, at: receivedAt },
      { transaction: t },
    );
    await issueInvoiceIn(manager, springs.job.id, {}, t);
  }

  const hoses = find('Q-BRKE', 'Fuel hose and clip renewal');
  if (hoses && hoses.job.state === 'ready_for_release') {
    const inv = await issueInvoiceIn(manager, hoses.job.id, {}, t);
    await issueGoodwillCreditNoteIn(accounts, inv.id, { amount: '10.00', reason: 'Goodwill: the aircraft went back a day later than promised' }, t);
    const money = await jobMoney(hoses.job.id, inv.currency, t);
    if (money.due && money.due !== '0.00') {
      await recordOfflinePaymentIn(accounts, hoses.job.id, { amount: money.due, method: 'bank_transfer', receivedOn: iso(now), reference: 'BRKE HOSES' }, t);
    }
  }
  // The demo's documents count as mailed when they were issued (the demo sends no e-mail for its
  // history); otherwise the app's sweep of unmailed documents would mail them at its first start.
  await Invoice.update({ mailedAt: now }, { where: { workshopId: w.id, mailedAt: null }, transaction: t });
  await CreditNote.update({ mailedAt: now }, { where: { workshopId: w.id, mailedAt: null }, transaction: t });
}
