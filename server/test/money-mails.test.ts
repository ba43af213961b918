import { execFileSync } from 'node:child_process';
import http, { type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startStripeFake, type RunningFake } from '@wingstage/stripe-fake';
import { AuditEvent, DepositRequest, Invoice, Payment } from '../src/models/index.js';
import { queuePaymentReceipt, sendPaymentReceipt } from '../src/jobs/payment-receipts.js';
import { recordOfflinePayment } from '../src/services/invoices.service.js';
import { MAILDEV_API, mailsTo, startTestServer, TEST_STRIPE_KEY, TEST_WEBHOOK_SECRET, waitForMail, type TestServer } from './helpers.js';
import { readyJob, staffClients } from './support/money-mail-fixtures.js';

/*
 * The e-mails money sends, read back from maildev with their PDFs (poppler's pdftotext), and what a
 * cancelled job does to the deposits it was still waiting for. Card payments go through the real SDK
 * against the local fake, whose signed webhooks come back to a listening app.
 */
const SUCCESS = '4242424242424242';

let server: TestServer;
let listener: Server;
let live: RunningFake;

beforeAll(async () => {
  listener = http.createServer();
  await new Promise<void>((r) => listener.listen(0, '127.0.0.1', () => r()));
  const { port } = listener.address() as AddressInfo;
  live = await startStripeFake({ apiKey: TEST_STRIPE_KEY, port: 0, webhookUrl: `http://127.0.0.1:${port}/api/webhooks/stripe`, webhookSecret: TEST_WEBHOOK_SECRET, retryDelaysMs: [50, 100] });
  server = await startTestServer({ STRIPE_API_URL: live.url });
  listener.on('request', server.app);
}, 60_000);
afterAll(async () => {
  await live?.stop();
  listener?.closeAllConnections();
  await new Promise((r) => listener?.close(r));
  await server?.close();
});

interface Attachment {
  filename?: string;
  generatedFileName?: string;
  contentType?: string;
}

/** The one PDF attached to a maildev message, as text (whitespace collapsed). */
async function pdfOf(mail: { id: string }): Promise<{ name: string; text: string }> {
  const full = (await (await fetch(`${MAILDEV_API}/api/email/${mail.id}`)).json()) as { attachments?: Attachment[] };
  const pdfs = (full.attachments ?? []).filter((a) => a.contentType === 'application/pdf');
  expect(pdfs).toHaveLength(1);
  const a = pdfs[0]!;
  const res = await fetch(`${MAILDEV_API}/api/email/${mail.id}/attachment/${encodeURIComponent(a.generatedFileName ?? a.filename!)}`);
  expect(res.status).toBe(200);
  const bytes = Buffer.from(await res.arrayBuffer());
  expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
  const text = execFileSync('pdftotext', ['-layout', '-enc', 'UTF-8', '-', '-'], { input: bytes }).toString('utf8').replace(/\s+/g, ' ');
  return { name: a.filename ?? '', text };
}

async function payOnPage(url: string): Promise<void> {
  const res = await fetch(url, { method: 'POST', body: new URLSearchParams({ card: SUCCESS, expiry: '12/34', cvc: '123', action: 'pay' }), redirect: 'manual' });
  expect(res.status).toBe(303);
}
const sessionOf = (url: string) => /\/pay\/(cs_[A-Za-z0-9_]+)/.exec(url)![1]!;

const setup = (label: string) => staffClients(server.app, label);

describe('receipts for card payments', () => {
  it('when the owner pays a deposit by card, then one e-mail arrives: the receipt with its PDF, stating the VAT the deposit carries; a second run of the task sends nothing more', async () => {
    const s = await setup('Receipts');
    const jobId = s.w.owners[0].job.id;
    const asked = await s.manager.post(`/api/jobs/${jobId}/deposits`, { amount: '300.00', reason: 'Cylinder parts ordered' });
    expect(asked.status).toBe(201);
    // The job's VAT mix when the deposit was asked: all of it at the standard rate.
    await DepositRequest.update({ vatMix: [{ rate: '20', gross: '1440.00' }] }, { where: { id: asked.body.id } });
    const url = (await s.owner.post(`/api/jobs/${jobId}/payments/checkout`, { for: 'deposit', depositRequestId: asked.body.id })).body.url as string;
    await payOnPage(url);
    await live.idle();

    const mail = await waitForMail(s.email, (m) => m.subject.includes('receipt for your payment of £300.00'));
    expect(mail.text).toContain('What it is for: Deposit: Cylinder parts ordered.');
    expect(mail.text).toContain('This deposit will be taken off the final invoice.');
    const pdf = await pdfOf(mail);
    expect(pdf.text).toContain('This is not a VAT invoice');
    expect(pdf.text).toContain('£300.00');
    // £300 received on a job all at 20%: VAT fraction 1/6 → £50.00 [VAT Act 1994 s6(4); HMRC VAT Notice 700 §4.3, sources.md deposits vector].
    expect(pdf.text).toContain('£50.00');
    expect(pdf.text).toContain('Cylinder parts ordered');

    const payment = await Payment.findOne({ where: { depositRequestId: asked.body.id, state: 'succeeded' } });
    expect(payment!.receiptMailedAt).toBeInstanceOf(Date);
    // The task run again (a retry after a crash) finds the receipt already queued.
    expect(await sendPaymentReceipt(server.parts, payment!.id)).toBe('already');
    await new Promise((r) => setTimeout(r, 1500));
    const toOwner = await mailsTo(s.email);
    // One e-mail per payment: the deposit request and the receipt, no separate "received" message.
    expect(toOwner.map((m) => m.subject).filter((x) => !x.includes('a deposit of'))).toEqual([mail.subject]);
  }, 60_000);

  it('when the owner pays the balance by card, then the receipt names the invoice and carries its PDF; the invoice e-mail carried the invoice PDF', async () => {
    const s = await setup('Balance receipts');
    const job = await readyJob(s);
    const issued = await s.manager.post(`/api/jobs/${job.id}/invoice`, {});
    expect(issued.status).toBe(201);
    const number = issued.body.number as string;
    // The history line shows the due date as dates read elsewhere in the app ("1 Jan 2027"), not as an ISO date.
    const line = await AuditEvent.findOne({ where: { jobId: job.id, action: 'invoice.issued' } });
    expect(line!.summary).toMatch(/ by \d{1,2} [A-Z][a-z]{2} \d{4}$/);
    expect(line!.summary).not.toMatch(/\d{4}-\d{2}-\d{2}/);

    const invoiceMail = await waitForMail(s.email, (m) => m.subject.includes(`your invoice ${number}`));
    const invoicePdf = await pdfOf(invoiceMail);
    expect(invoicePdf.name).toBe(`${number}.pdf`);
    expect(invoicePdf.text).toContain(number);
    // £100.00 at the standard rate 20% → £20.00 VAT, £120.00 in all [HMRC VAT Notice 700 §8.1].
    expect(invoicePdf.text).toContain('£120.00');

    const url = (await s.owner.post(`/api/jobs/${job.id}/payments/checkout`, { for: 'balance' })).body.url as string;
    await payOnPage(url);
    await live.idle();
    const receipt = await waitForMail(s.email, (m) => m.subject.includes('receipt for your payment of £120.00'));
    expect(receipt.text).toContain(`towards invoice ${number}`);
    const pdf = await pdfOf(receipt);
    expect(pdf.text).toContain('This is not a VAT invoice');
    expect(pdf.text).toContain('£120.00');
    expect(pdf.text).toContain(number);
    expect(await Invoice.findOne({ where: { jobId: job.id } })).toMatchObject({ state: 'paid' });
  }, 60_000);

  it('when accounts issues a credit note, then the owner’s e-mail carries the credit note PDF with its number and amount', async () => {
    const s = await setup('Credit mails');
    const job = await readyJob(s);
    const inv = (await s.manager.post(`/api/jobs/${job.id}/invoice`, {})).body;
    const cn = await s.accounts.post(`/api/invoices/${inv.id}/credit-notes`, { amount: '24.00', reason: 'Goodwill: collected a day late' });
    expect(cn.status).toBe(201);
    const mail = await waitForMail(s.email, (m) => m.subject.includes(`credit note ${cn.body.number}`));
    const pdf = await pdfOf(mail);
    expect(pdf.name).toBe(`${cn.body.number}.pdf`);
    expect(pdf.text).toContain(cn.body.number);
    expect(pdf.text).toContain(inv.number);
    // £24.00 with VAT at 20%: £4.00 VAT (fraction 1/6) [HMRC VAT Notice 700 §4.3].
    expect(pdf.text).toContain('£24.00');
    expect(pdf.text).toContain('£4.00');
  }, 60_000);
});

describe('receipts for offline payments', () => {
  it('when accounts records a bank transfer, then the answer does not wait for the PDF and the owner gets one receipt e-mail with it', async () => {
    const s = await setup('Offline receipts');
    const job = await readyJob(s);
    const inv = (await s.manager.post(`/api/jobs/${job.id}/invoice`, {})).body;
    const paid = await s.accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '50.00', method: 'bank_transfer', receivedOn: '2026-12-01', reference: 'WREN 0412' });
    expect(paid.status).toBe(201);
    const mail = await waitForMail(s.email, (m) => m.subject.includes('receipt for your payment of £50.00'));
    expect(mail.text).toContain(`on 1 Dec 2026 for ${s.w.owners[0].aircraft.registration} towards invoice ${inv.number}`);
    const pdf = await pdfOf(mail);
    expect(pdf.text).toContain('This is not a VAT invoice');
    expect(pdf.text).toContain('£50.00');
    expect(pdf.text).toContain('WREN 0412');
    expect(await Payment.findByPk(paid.body.paymentId)).toMatchObject({ receiptMailedAt: expect.any(Date) });
  }, 60_000);

  it('when the process stops after the payment is written but before its transaction commits, then neither the payment nor its receipt task exists; committed, both do and one receipt goes', async () => {
    const s = await setup('Offline receipt crash');
    const job = await readyJob(s);
    await s.manager.post(`/api/jobs/${job.id}/invoice`, {});
    const input = { amount: '40.00', method: 'cash' as const, receivedOn: '2026-12-01', reference: 'TILL 7' };
    // The receipt task is queued in the payment's transaction, then the process "stops" before the commit.
    await expect(
      recordOfflinePayment(s.accountsScope, job.id, input, async (id, t) => {
        await queuePaymentReceipt(server.parts, id, t);
        throw new Error('process stopped');
      }),
    ).rejects.toThrow('process stopped');
    expect(await Payment.count({ where: { jobId: job.id, kind: 'balance' } })).toBe(0);
    // Recorded again for real: one payment, one receipt, and the rolled-back task never ran.
    const paid = await s.accounts.post(`/api/jobs/${job.id}/payments/offline`, input);
    expect(paid.status).toBe(201);
    await waitForMail(s.email, (m) => m.subject.includes('receipt for your payment of £40.00'));
    await new Promise((r) => setTimeout(r, 1500));
    expect((await mailsTo(s.email)).filter((m) => m.subject.includes('receipt for your payment of £40.00'))).toHaveLength(1);
    expect(await Payment.count({ where: { jobId: job.id, kind: 'balance' } })).toBe(1);
  }, 60_000);
});

describe('cancelling a job', () => {
  it('when a job with waiting deposits is cancelled, then each is cancelled with a history line and its open payment page is expired through the processor; a paid one stays paid', async () => {
    const s = await setup('Cancel deposits');
    const jobId = s.w.owners[0].job.id;
    const first = (await s.manager.post(`/api/jobs/${jobId}/deposits`, { amount: '80.00', reason: 'Magneto parts ordered' })).body.id as string;
    const second = (await s.manager.post(`/api/jobs/${jobId}/deposits`, { amount: '40.00', reason: 'Hose kit ordered' })).body.id as string;
    const paidOne = (await s.manager.post(`/api/jobs/${jobId}/deposits`, { amount: '25.00', reason: 'Gasket set ordered' })).body.id as string;
    const paidUrl = (await s.owner.post(`/api/jobs/${jobId}/payments/checkout`, { for: 'deposit', depositRequestId: paidOne })).body.url as string;
    await payOnPage(paidUrl);
    await live.idle();
    expect(await DepositRequest.findByPk(paidOne)).toMatchObject({ state: 'paid' });
    const openUrl = (await s.owner.post(`/api/jobs/${jobId}/payments/checkout`, { for: 'deposit', depositRequestId: first })).body.url as string;

    const job = (await s.manager.get(`/api/jobs/${jobId}`)).body;
    const res = await s.manager.post(`/api/jobs/${jobId}/transition`, { to: 'cancelled', version: job.version, reason: 'Owner sold the aircraft' });
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('cancelled');

    expect(await DepositRequest.findByPk(first)).toMatchObject({ state: 'cancelled', cancelReason: 'the job was cancelled' });
    expect(await DepositRequest.findByPk(second)).toMatchObject({ state: 'cancelled' });
    expect(await DepositRequest.findByPk(paidOne)).toMatchObject({ state: 'paid' });
    const page = await Payment.findOne({ where: { stripeCheckoutSessionId: sessionOf(openUrl) } });
    expect(page).toMatchObject({ state: 'cancelled', outcomeNote: 'Payment page closed unpaid: the job was cancelled.' });
    expect((await live.state.session(sessionOf(openUrl)))?.status).toBe('expired');
    const lines = await AuditEvent.findAll({ where: { jobId, action: 'deposit.cancelled' } });
    expect(lines.map((l) => l.summary).sort()).toEqual(['Deposit of £40.00 cancelled: the job was cancelled', 'Deposit of £80.00 cancelled: the job was cancelled']);
    // Another workshop's manager cannot cancel this job or reach its deposits.
    const other = await setup('Cancel elsewhere');
    expect((await other.manager.post(`/api/jobs/${jobId}/transition`, { to: 'cancelled', version: job.version, reason: 'Not ours' })).status).toBe(404);
    // The closed page can no longer take money, and the owner is not offered it.
    const retry = await s.owner.post(`/api/jobs/${jobId}/payments/checkout`, { for: 'deposit', depositRequestId: first });
    expect(retry.status).toBe(409);
  }, 60_000);

  it('when 20 cancels of a job with a waiting deposit arrive at once, then one wins and the deposit is cancelled once', async () => {
    const s = await setup('Cancel race');
    const jobId = s.w.owners[0].job.id;
    const depositId = (await s.manager.post(`/api/jobs/${jobId}/deposits`, { amount: '60.00', reason: 'Prop bolts ordered' })).body.id as string;
    await s.owner.post(`/api/jobs/${jobId}/payments/checkout`, { for: 'deposit', depositRequestId: depositId });
    const version = (await s.manager.get(`/api/jobs/${jobId}`)).body.version as number;
    const res = await Promise.all(Array.from({ length: 20 }, () => s.manager.post(`/api/jobs/${jobId}/transition`, { to: 'cancelled', version, reason: 'Owner withdrew' })));
    expect(res.filter((r) => r.status === 200)).toHaveLength(1);
    expect(res.every((r) => r.status === 200 || r.status === 409)).toBe(true);
    expect(await DepositRequest.findByPk(depositId)).toMatchObject({ state: 'cancelled' });
    expect(await AuditEvent.count({ where: { jobId, action: 'deposit.cancelled' } })).toBe(1);
    expect(await Payment.count({ where: { depositRequestId: depositId, state: 'cancelled' } })).toBe(1);
  }, 60_000);
});
