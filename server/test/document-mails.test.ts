import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { CreditNote, Invoice, boundSequelize } from '../src/models/index.js';
import { DOCUMENT_MAIL_TRIES, sendDocumentMail, sweepUnmailedDocuments } from '../src/jobs/payment-receipts.js';
import { issueGoodwillCreditNote } from '../src/services/credit-notes.service.js';
import { issueInvoice } from '../src/services/invoices.service.js';
import { mailsTo, startTestServer, waitForMail, type TestServer } from './helpers.js';
import { readyJob, staffClients } from './support/money-mail-fixtures.js';

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

const setup = (label: string) => staffClients(server.app, label);

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

  it('when an invoice’s PDF can never be made, then each try is counted, the last one gives up with one warning, the sweep leaves it and staff see it not e-mailed; Resend, raced six times, mails it once', async () => {
    const s = await setup('Given up document');
    const other = await setup('Given up elsewhere');
    const owner = s.owner;
    const job = await readyJob(s);
    const inv = await issueInvoice(s.managerScope, job.id, {});
    // A document that cannot be rendered: its lines are gone (a real failure of the renderer, not a stand-in).
    const [keptRow] = await boundSequelize().query<{ document: object }>(`SELECT document FROM invoices WHERE id = $1`, { bind: [inv.id], type: QueryTypes.SELECT });
    const kept = keptRow!.document;
    await boundSequelize().query(`UPDATE invoices SET document = jsonb_set(document, '{lines}', 'null'::jsonb) WHERE id = $1`, { bind: [inv.id] });
    const warn = vi.spyOn(server.parts.logger, 'warn');
    try {
      for (let i = 1; i < DOCUMENT_MAIL_TRIES; i++) await expect(sendDocumentMail(server.parts, { kind: 'invoice', id: inv.id })).rejects.toThrow();
      expect(await sendDocumentMail(server.parts, { kind: 'invoice', id: inv.id })).toBe('given-up');
      // Given up: not tried again, not counted again, and said once in the log.
      expect(await sendDocumentMail(server.parts, { kind: 'invoice', id: inv.id })).toBe('given-up');
      const givenUp = warn.mock.calls.filter((c) => String(c[1]).includes('document e-mail given up'));
      expect(givenUp).toHaveLength(1);
      expect(givenUp[0]![0]).toMatchObject({ kind: 'invoice', id: inv.id, tries: DOCUMENT_MAIL_TRIES });
    } finally {
      warn.mockRestore();
    }
    const [row] = await boundSequelize().query<{ mail_tries: number; mail_given_up_at: Date | null; mailed_at: Date | null }>(
      `SELECT mail_tries, mail_given_up_at, mailed_at FROM invoices WHERE id = $1`, { bind: [inv.id], type: QueryTypes.SELECT },
    );
    expect(row).toMatchObject({ mail_tries: DOCUMENT_MAIL_TRIES, mail_given_up_at: expect.any(Date), mailed_at: null });
    expect(await sweepUnmailedDocuments(server.parts, { workshopId: s.w.workshop.id, olderThanMs: 0 })).toBe(0);
    expect((await s.manager.get(`/api/invoices/${inv.id}`)).body.email).toBe('not_sent');
    expect((await owner.get(`/api/invoices/${inv.id}`)).body.email).toBeNull();

    // Only this workshop's staff may send it again.
    expect((await other.manager.post(`/api/invoices/${inv.id}/resend`, {})).status).toBe(404);
    expect((await owner.post(`/api/invoices/${inv.id}/resend`, {})).status).toBe(403);
    expect((await s.manager.post(`/api/invoices/not-an-id/resend`, {})).status).toBe(400);

    // Mended, then sent again by six hands at once: the tries start afresh and one e-mail goes.
    await boundSequelize().query(`UPDATE invoices SET document = $2::jsonb WHERE id = $1`, { bind: [inv.id, JSON.stringify(kept)] });
    const resends = await Promise.all(Array.from({ length: 6 }, () => s.accounts.post(`/api/invoices/${inv.id}/resend`, {})));
    expect(resends.every((r) => r.status === 202 || r.status === 409)).toBe(true);
    expect(resends.filter((r) => r.status === 202).length).toBeGreaterThanOrEqual(1);
    await waitForMail(s.email, (m) => m.subject.includes(`your invoice ${inv.number}`));
    await expect.poll(async () => (await s.manager.get(`/api/invoices/${inv.id}`)).body.email, { timeout: 20_000 }).toBe('done');
    await settle();
    expect(await subjectsTo(s.email, `your invoice ${inv.number}`)).toHaveLength(1);
    const again = await s.manager.post(`/api/invoices/${inv.id}/resend`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe('That invoice has already been e-mailed to the owner.');
  }, 90_000);

  it('when a credit note’s last try fails, then it is given up and shown on its invoice; Resend mails it once it renders', async () => {
    const s = await setup('Given up credit note');
    const job = await readyJob(s);
    const inv = await issueInvoice(s.managerScope, job.id, {});
    await sendDocumentMail(server.parts, { kind: 'invoice', id: inv.id });
    const cn = await issueGoodwillCreditNote(s.accountsScope, inv.id, { amount: '12.00', reason: 'Goodwill: collected a day late' });
    // Seven tries already failed (as if the queue had retried it through the afternoon); the renderer is still failing.
    await boundSequelize().query(`UPDATE credit_notes SET mail_tries = $2 - 1, document = jsonb_set(document, '{lines}', 'null'::jsonb) WHERE id = $1`, { bind: [cn.id, DOCUMENT_MAIL_TRIES] });
    expect(await sendDocumentMail(server.parts, { kind: 'credit_note', id: cn.id })).toBe('given-up');
    const seen = (await s.manager.get(`/api/invoices/${inv.id}`)).body;
    expect(seen.email).toBe('done');
    expect(seen.creditNotes).toEqual([expect.objectContaining({ number: cn.number, email: 'not_sent' })]);
    await boundSequelize().query(`UPDATE credit_notes SET document = $2::jsonb WHERE id = $1`, { bind: [cn.id, JSON.stringify(cn.document)] });
    expect((await s.accounts.post(`/api/credit-notes/${cn.id}/resend`, {})).status).toBe(202);
    await waitForMail(s.email, (m) => m.subject.includes(`credit note ${cn.number}`));
    await expect.poll(async () => (await s.manager.get(`/api/credit-notes/${cn.id}`)).body.email, { timeout: 20_000 }).toBe('done');
  }, 90_000);
});
