import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CreditNote, EstimateLine, Invoice, type Job } from '../src/models/index.js';
import { sendDocumentMail, sweepUnmailedDocuments } from '../src/jobs/payment-receipts.js';
import { issueGoodwillCreditNote } from '../src/services/credit-notes.service.js';
import { issueInvoice } from '../src/services/invoices.service.js';
import type { Scope } from '../src/services/scope.js';
import { makeJob, makeWorkshop, mailsTo, signIn, startTestServer, waitForMail, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/*
 * Invoice and credit-note e-mails survive a process that stops between issuing a document and
 * queueing its e-mail: the document's `mailed_at` stays empty until the sending task queues the
 * e-mail, a sweep queues whatever is still empty, and a task that runs twice sends one e-mail.
 * Read back from maildev.
 */

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
}, 60_000);
afterAll(async () => {
  await server?.close();
});

interface Setup {
  w: WorkshopFixture;
  manager: Client;
  accounts: Client;
  email: string;
  managerScope: Scope;
  accountsScope: Scope;
}
async function setup(label: string): Promise<Setup> {
  const w = await makeWorkshop(label);
  return {
    w,
    manager: await signIn(server.app, w.users.manager.email),
    accounts: await signIn(server.app, w.users.accounts.email),
    email: w.owners[0].customer.email!,
    managerScope: { workshopId: w.workshop.id, userId: w.users.manager.id, role: 'manager', customerId: null },
    accountsScope: { workshopId: w.workshop.id, userId: w.users.accounts.id, role: 'accounts', customerId: null },
  };
}

/** A job ready for release with £100.00 of agreed inspection work at the standard rate: £120.00 with VAT. */
async function readyJob(s: Setup): Promise<Job> {
  const job = await makeJob(s.w.workshop.id, s.w.owners[0].aircraft.id, 'ready_for_release');
  await EstimateLine.create({
    jobId: job.id, id: randomUUID(), workshopId: job.workshopId, stage: 'inspection', kind: 'fee', description: 'Yearly inspection', quantity: '1',
    labourRateCode: null, ratePerHour: null, partId: null, supplierId: null, unitCost: null, unitPrice: null, markupPercent: null, amount: '100.00',
    vatRate: 'standard', findingId: null, accessTaskId: null, discountPercent: null, sortOrder: 0,
    agreedAt: new Date('2026-11-10T10:00:00Z'), agreedHow: 'phone', agreedBy: 'Owner',
  });
  return job;
}

const settle = () => new Promise((r) => setTimeout(r, 1500));
const subjectsTo = async (email: string, part: string) => (await mailsTo(email)).map((m) => m.subject).filter((x) => x.includes(part));

describe('invoice and credit-note e-mails', () => {
  it('when an invoice is issued, then one e-mail arrives and the invoice is marked mailed; the task run again, even several at once, sends nothing more', async () => {
    const s = await setup('Mailed invoice');
    const job = await readyJob(s);
    const issued = await s.manager.post(`/api/jobs/${job.id}/invoice`, {});
    expect(issued.status).toBe(201);
    const number = issued.body.number as string;
    await waitForMail(s.email, (m) => m.subject.includes(`your invoice ${number}`));
    const inv = await Invoice.findByPk(issued.body.id as string);
    expect(inv!.mailedAt).toBeInstanceOf(Date);

    const again = await Promise.all(Array.from({ length: 5 }, () => sendDocumentMail(server.parts, { kind: 'invoice', id: inv!.id })));
    expect(again).toEqual(Array(5).fill('already'));
    await settle();
    expect(await subjectsTo(s.email, `your invoice ${number}`)).toHaveLength(1);
  }, 60_000);

  it('when the process stopped after issuing but before queueing the e-mails, then the sweep mails the invoice and the credit note once each, and a second sweep finds nothing', async () => {
    const s = await setup('Swept documents');
    const job = await readyJob(s);
    // Issued through the services alone: committed, with no e-mail task queued (as if the process stopped there).
    const inv = await issueInvoice(s.managerScope, job.id, {});
    const cn = await issueGoodwillCreditNote(s.accountsScope, inv.id, { amount: '12.00', reason: 'Goodwill: collected a day late' });
    expect((await Invoice.findByPk(inv.id))!.mailedAt).toBeNull();
    expect((await CreditNote.findByPk(cn.id))!.mailedAt).toBeNull();
    await settle();
    expect(await subjectsTo(s.email, inv.number)).toEqual([]);

    // Documents younger than the sweep's age are left to their own task.
    expect(await sweepUnmailedDocuments(server.parts, { workshopId: s.w.workshop.id })).toBe(0);
    expect(await sweepUnmailedDocuments(server.parts, { workshopId: s.w.workshop.id, olderThanMs: 0 })).toBe(2);
    await waitForMail(s.email, (m) => m.subject.includes(`your invoice ${inv.number}`));
    await waitForMail(s.email, (m) => m.subject.includes(`credit note ${cn.number}`));
    await expect.poll(async () => (await CreditNote.findByPk(cn.id))!.mailedAt, { timeout: 20_000 }).toBeInstanceOf(Date);
    expect((await Invoice.findByPk(inv.id))!.mailedAt).toBeInstanceOf(Date);

    expect(await sweepUnmailedDocuments(server.parts, { workshopId: s.w.workshop.id, olderThanMs: 0 })).toBe(0);
    // The route's task for the same credit note, arriving late, finds it mailed.
    expect(await sendDocumentMail(server.parts, { kind: 'credit_note', id: cn.id })).toBe('already');
    await settle();
    expect(await subjectsTo(s.email, `your invoice ${inv.number}`)).toHaveLength(1);
    expect(await subjectsTo(s.email, `credit note ${cn.number}`)).toHaveLength(1);
  }, 90_000);

  it('when the sweep and the task race for a document not yet mailed, then exactly one e-mail is queued', async () => {
    const s = await setup('Raced document');
    const job = await readyJob(s);
    const inv = await issueInvoice(s.managerScope, job.id, {});
    const outcomes = await Promise.all(Array.from({ length: 6 }, () => sendDocumentMail(server.parts, { kind: 'invoice', id: inv.id })));
    expect(outcomes.filter((o) => o === 'sent')).toHaveLength(1);
    expect(outcomes.filter((o) => o === 'already')).toHaveLength(5);
    await waitForMail(s.email, (m) => m.subject.includes(`your invoice ${inv.number}`));
    await settle();
    expect(await subjectsTo(s.email, `your invoice ${inv.number}`)).toHaveLength(1);
  }, 60_000);

  it('when a document id is not known, then the task says so and sends nothing', async () => {
    expect(await sendDocumentMail(server.parts, { kind: 'invoice', id: randomUUID() })).toBe('gone');
    expect(await sendDocumentMail(server.parts, { kind: 'credit_note', id: randomUUID() })).toBe('gone');
  });
});
