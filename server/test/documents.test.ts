import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { formatMoney, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type JobDocumentsDto, type SendForApprovalResultDto } from '@wingstage/shared';
import { renderInvoicePdf, renderReceiptPdf } from '../src/documents/index.js';
import { CreditNote, Invoice, Job } from '../src/models/index.js';
import { aCreditNote, aLongInvoice, aReceipt, anInvoice } from './support/document-fixtures.js';
import { decideTokenFromMail, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/** The text of a PDF as poppler's pdftotext reads it, in layout order (a table row stays on one line). */
function pdfText(pdf: Buffer): string {
  return execFileSync('pdftotext', ['-layout', '-enc', 'UTF-8', '-', '-'], { input: pdf, maxBuffer: 20_000_000 }).toString('utf8');
}
function pdfPages(pdf: Buffer): number {
  const info = execFileSync('pdfinfo', ['-'], { input: pdf }).toString('utf8');
  return Number(/Pages:\s+(\d+)/.exec(info)?.[1]);
}
/** Collapses runs of white space, so a check does not depend on where pdftotext breaks a line. */
const flat = (t: string) => t.replace(/\s+/g, ' ');

/** supertest collects an application/pdf answer as a Buffer with this parser. */
function binary(res: import('node:http').IncomingMessage, done: (err: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
}
/** WS_PDF_DIR=<folder> keeps each PDF a test fetched, to render with pdftoppm and look at. */
function keep(name: string, pdf: Buffer): Buffer {
  if (process.env.WS_PDF_DIR) fs.writeFileSync(path.join(process.env.WS_PDF_DIR, `${name}.pdf`), pdf);
  return pdf;
}
const getPdf = (c: Client, url: string) => c.get(url).buffer(true).parse(binary as unknown as Parameters<ReturnType<Client['get']>['parse']>[0]);

let server: TestServer;
let a: WorkshopFixture;
let b: WorkshopFixture;
let manager: Client;
let engineer: Client;
let owner: Client;
let otherOwner: Client;
let elsewhere: Client;
let invoiceId: string;
let creditNoteId: string;

let seq = Math.floor(Math.random() * 1_000_000);

/** An issued invoice row made by hand from a frozen document (issuing itself is the invoices service's). */
async function insertInvoice(job: Job, doc = anInvoice()) {
  seq += 1;
  return Invoice.create({
    workshopId: job.workshopId,
    jobId: job.id,
    seq,
    number: doc.number,
    taxPoint: doc.taxPoint,
    dueOn: doc.dueOn,
    currency: doc.currency,
    rounding: doc.rounding,
    net: doc.totals.net,
    vat: doc.totals.vat,
    gross: doc.totals.gross,
    balanceDue: doc.balanceDue,
    document: doc,
  });
}

beforeAll(async () => {
  server = await startTestServer();
  [a, b] = await Promise.all([makeWorkshop('Documents'), makeWorkshop('Elsewhere')]);
  await a.workshop.update({ addressLines: 'Hangar 3, Marsh Lane Airstrip\nFendlebury', postcode: 'QX9 4ZZ', vatNumber: 'GB 999 0001 23' });
  await a.owners[0].customer.update({ name: 'Zofia Dvořák', addressLines: '12 Ulica Łódź Cottages\nLittle Wenham', postcode: 'QX2 7YY' });
  [manager, engineer, owner, otherOwner, elsewhere] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.users.engineer.email),
    signIn(server.app, a.owners[0].user.email),
    signIn(server.app, a.owners[1].user.email),
    signIn(server.app, b.users.manager.email),
  ]);
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'invoiced');
  const inv = await insertInvoice(job, anInvoice({ number: `INV-${seq + 1}` }));
  invoiceId = inv.id;
  seq += 1;
  const cn = await CreditNote.create({
    workshopId: job.workshopId,
    jobId: job.id,
    invoiceId: inv.id,
    seq,
    number: `CN-${seq}`,
    taxPoint: '2026-12-05',
    reason: 'Fuel hose charged at the wrong length.',
    net: '100.00',
    vat: '20.00',
    gross: '120.00',
    document: aCreditNote({ number: `CN-${seq}`, invoice: { number: inv.number, issuedOn: '2026-12-02' } }),
  });
  creditNoteId = cn.id;
});
afterAll(async () => {
  await server?.close();
});

describe('the VAT invoice PDF', () => {
  it('when the owner downloads their invoice, then every reg 14 particular is in its text, names with diacritics included', async () => {
    const res = await getPdf(owner, `/api/invoices/${invoiceId}/pdf`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const inv = (await Invoice.findByPk(invoiceId))!;
    expect(res.headers['content-disposition']).toBe(`attachment; filename="invoice-${inv.number}-Q-BRKA.pdf"`);
    const pdf = keep('invoice', res.body as Buffer);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const text = flat(pdfText(pdf));
    // VAT Regulations 1995 reg 14(1), restated in HMRC VAT Notice 700 §16.3 (sources.md):
    // (a) a sequential number identifying the invoice
    expect(text).toContain(`Invoice number ${inv.number}`);
    // (b) the time of supply (tax point) and (c) the date of issue
    expect(text).toContain('Tax point (time of supply) 30 November 2026');
    expect(text).toContain('Date of issue 2 December 2026');
    // (d) the supplier's name, address and VAT registration number
    expect(text).toContain('Brackenfold Light Aircraft Engineering');
    for (const l of ['Hangar 3, Marsh Lane Airstrip', 'Fendlebury', 'QX9 4ZZ']) expect(text).toContain(l);
    expect(text).toContain('VAT registration number GB 999 0001 23');
    // (e) the customer's name and address — in full Latin script, from the shipped TTFs
    expect(text).toContain('Zofia Dvořák');
    for (const l of ['12 Ulica Łódź Cottages', 'Little Wenham', 'QX2 7YY']) expect(text).toContain(l);
    // (g) a description of the services, and for each line (h) the quantity or extent,
    // (i) the unit price, (j) the rate of VAT and (k) the amount excluding VAT
    expect(text).toContain('Quantity');
    expect(text).toContain('Unit price excl. VAT');
    expect(text).toContain('VAT rate');
    expect(text).toContain('Amount excl. VAT');
    expect(text).toContain('Replace fuel hose and clips 2.5 h £62.00 20% £155.00');
    expect(text).toContain('Spark plugs, resistor type 4 each £14.00 20% £56.00');
    // (m) the total amount excluding VAT and (o) the total VAT in sterling
    expect(text).toContain('Total excl. VAT £1,200.00');
    expect(text).toContain('Total VAT £240.00');
    expect(text).toContain('Total incl. VAT £1,440.00');
    expect(text).toContain('pounds sterling');
    // Deposits keep their own tax point [VAT Act 1994 s6(4); sources.md vector: £300 deposit carries £50 VAT,
    // the balance £1,140 carries £190].
    expect(text).toContain('28 October 2026 Card Quote deposit £300.00 £50.00');
    expect(text).toContain('VAT on the balance £190.00');
    expect(text).toContain('£1,140.00');
    expect(text).toMatch(/Page 1 of \d/);
    // Subset fonts only: the whole pair of TTFs is 850 KB.
    expect(pdf.length).toBeLessThan(120_000);
  });

  it('when staff of the workshop fetch it, then they get it; another owner, another workshop or no sign-in gets nothing', async () => {
    expect((await getPdf(engineer, `/api/invoices/${invoiceId}/pdf`)).status).toBe(200);
    expect((await getPdf(manager, `/api/invoices/${invoiceId}/pdf`)).status).toBe(200);
    const other = await otherOwner.get(`/api/invoices/${invoiceId}/pdf`);
    expect(other.status).toBe(404);
    expect(other.body.error.message).toBe('That invoice was not found.');
    expect((await elsewhere.get(`/api/invoices/${invoiceId}/pdf`)).status).toBe(404);
    expect((await owner.get(`/api/invoices/${randomUUID()}/pdf`)).status).toBe(404);
    expect((await owner.get(`/api/invoices/not-an-id/pdf`)).status).toBe(400);
    expect((await request(server.app).get(`/api/invoices/${invoiceId}/pdf`)).status).toBe(401);
  });

  it('when an invoice has 200 lines, then it breaks across pages with the table header on each, and renders in reasonable time', async () => {
    const started = performance.now();
    const pdf = await renderInvoicePdf(aLongInvoice(200));
    const ms = Math.round(performance.now() - started);
    console.log(`200-line invoice: ${ms} ms, ${pdfPages(pdf)} pages, ${pdf.length} bytes`);
    const pages = pdfPages(pdf);
    expect(pages).toBeGreaterThan(3);
    const text = pdfText(pdf);
    const perPage = text.split('\f').filter((p) => p.trim() !== '');
    expect(perPage).toHaveLength(pages);
    // The lines' table runs over every page but the last; its header row repeats on each of them.
    for (const page of perPage.slice(1, -1)) expect(flat(page)).toContain('Description Quantity Unit price excl. VAT VAT rate Amount excl. VAT VAT');
    perPage.forEach((page, i) => expect(flat(page)).toContain(`Page ${i + 1} of ${pages}`));
    expect(flat(text)).toContain('Line 200: rivet');
    expect(flat(text)).toContain('Total incl. VAT £2,400.00');
    // Generous: this machine has two cores shared with other work.
    expect(ms).toBeLessThan(60_000);
  });
});

describe('the credit note PDF', () => {
  it('when the owner downloads it, then the reg 38 particulars are in its text', async () => {
    const res = await getPdf(owner, `/api/credit-notes/${creditNoteId}/pdf`);
    expect(res.status).toBe(200);
    const cn = (await CreditNote.findByPk(creditNoteId))!;
    const inv = (await Invoice.findByPk(invoiceId))!;
    expect(res.headers['content-disposition']).toBe(`attachment; filename="credit-note-${cn.number}-Q-BRKA.pdf"`);
    const text = flat(pdfText(keep('credit-note', res.body as Buffer)));
    // VAT Regulations 1995 reg 38 and HMRC manual VATREC13040 (sources.md): its own number and date,
    // the original invoice's number and date, the VAT credited, both parties.
    expect(text).toContain(`Credit note number ${cn.number}`);
    expect(text).toContain('Date of issue 5 December 2026');
    expect(text).toContain(`Against VAT invoice ${inv.number}, issued 2 December 2026`);
    expect(text).toContain('VAT credited £20.00');
    expect(text).toContain('Total credited incl. VAT £120.00');
    expect(text).toContain('VAT registration number GB 999 0001 23');
    expect(text).toContain('Zofia Dvořák');
    expect(text).toContain('Fuel hose charged at the wrong length');
  });

  it('when another owner or workshop asks for it, then it is not found', async () => {
    expect((await otherOwner.get(`/api/credit-notes/${creditNoteId}/pdf`)).status).toBe(404);
    expect((await elsewhere.get(`/api/credit-notes/${creditNoteId}/pdf`)).status).toBe(404);
  });
});

describe("the job's documents list", () => {
  it("when the owner lists their job's documents, then the estimate, the invoice and its credit note come with their download paths; others get 404", async () => {
    const inv = (await Invoice.findByPk(invoiceId))!;
    const res = await owner.get(`/api/jobs/${inv.jobId}/documents`);
    expect(res.status).toBe(200);
    const docs = res.body as JobDocumentsDto;
    expect(docs.estimate.path).toBe(`/api/jobs/${inv.jobId}/estimate.pdf`);
    expect(docs.invoice).toMatchObject({ id: invoiceId, number: inv.number, path: `/api/invoices/${invoiceId}/pdf` });
    expect(docs.creditNotes.map((c) => c.path)).toEqual([`/api/credit-notes/${creditNoteId}/pdf`]);
    expect(docs.decisionRecords).toEqual([]);
    // Every path it gives downloads.
    expect((await getPdf(owner, docs.creditNotes[0]!.path)).status).toBe(200);
    expect((await otherOwner.get(`/api/jobs/${inv.jobId}/documents`)).status).toBe(404);
    expect((await elsewhere.get(`/api/jobs/${inv.jobId}/documents`)).status).toBe(404);
    const none = (await manager.get(`/api/jobs/${a.owners[1].job.id}/documents`)).body as JobDocumentsDto;
    expect(none.invoice).toBeNull();
    expect(none.creditNotes).toEqual([]);
  });
});

describe('the receipt PDF', () => {
  it('when a deposit receipt is rendered, then it says it is not a VAT invoice and gives the VAT fixed on the day received', async () => {
    const text = flat(pdfText(await renderReceiptPdf(aReceipt())));
    // A document marked "This is not a VAT invoice" creates no tax point [HMRC manual VATTOS9165];
    // the deposit's own tax point is the day received [VAT Act 1994 s6(4)].
    expect(text).toContain('This is not a VAT invoice.');
    expect(text).toContain('Received on 28 October 2026');
    expect(text).toContain('VAT included £50.00');
    expect(text).toContain('Amount received £300.00');
    expect(text).toContain('Zofia Dvořák');
  });
});

describe('the estimate PDF', () => {
  it('when the owner downloads the estimate, then it shows the stages, totals and cautions with the safety wording', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
    await job.update({ scopeCautions: [{ line: 'Engine ground run', caution: 'Treat the propeller as live.' }] });
    const finding = await makeFinding(job, { title: 'Chafed throttle cable', category: 'airworthiness' });
    const lines: EstimateLineInputForm[] = [
      { id: randomUUID(), stage: 'inspection', kind: 'labour', description: 'Annual inspection, Łódź pattern checklist', quantity: '6', labourRateCode: 'standard', ratePerHour: '62.00' },
      { id: randomUUID(), stage: 'inspection', kind: 'fee', description: 'Permit paperwork', amount: '48.00' },
      { id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'Replace throttle cable', amount: '95.00', findingId: finding.id },
    ];
    const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines, accessTasks: [] });
    expect(saved.status).toBe(200);
    const est = saved.body as EstimateDto;

    const res = await getPdf(owner, `/api/jobs/${job.id}/estimate.pdf`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toBe(`attachment; filename="estimate-${job.number}-${a.owners[0].aircraft.registration}.pdf"`);
    const text = flat(pdfText(keep('estimate', res.body as Buffer)));
    expect(text).toContain('Inspection scope');
    // pdftotext may close up the narrow space before a unit ("6h").
    expect(text).toMatch(/Annual inspection, Łódź pattern checklist 6 ?h 20% £372\.00/);
    expect(text).toContain('Not yet agreed');
    expect(text).toContain('Discovered work');
    expect(text).toContain('F-1 Chafed throttle cable');
    // The totals are the engine's, as the estimate page shows them.
    const row = (t: { net: string; vat: string; gross: string }) => [t.net, t.vat, t.gross].map((x) => formatMoney(x, 'GBP')).join(' ');
    expect(text).toContain(`Quoted ${row(est.priced.quoted)}`);
    expect(est.priced.quoted.gross).toBe('504.00');
    expect(text).toContain(`Waiting for your decision ${row(est.priced.undecided)}`);
    expect(text).toContain(`If everything is approved ${row(est.priced.ifAllApproved)}`);
    expect(text).toContain('Agreed so far £0.00 £0.00 £0.00');
    expect(text).toContain('Discovered work: total excl. VAT £95.00');
    expect(text).toContain('VAT £19.00 · total incl. VAT £114.00');
    expect(text).toContain('Treat the propeller as live.');
    expect(text).toContain('decided by the licensed inspector');
    expect(text).not.toContain('airworthy');
  });

  it('when another owner or another workshop asks for the estimate, then it is not found', async () => {
    const job = a.owners[0].job;
    expect((await otherOwner.get(`/api/jobs/${job.id}/estimate.pdf`)).status).toBe(404);
    expect((await elsewhere.get(`/api/jobs/${job.id}/estimate.pdf`)).status).toBe(404);
    expect((await getPdf(engineer, `/api/jobs/${job.id}/estimate.pdf`)).status).toBe(200);
  });
});

describe('the decision record PDF', () => {
  it('when the owner has decided, then the record shows what was asked, each decision, who, when, from where and the hash', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
    const worn = await makeFinding(job, { title: 'Worn nose-wheel tyre', category: 'recommended' });
    const fuel = await makeFinding(job, { title: 'Perished fuel hose', category: 'airworthiness' });
    const lines: EstimateLineInputForm[] = [
      { id: randomUUID(), stage: 'inspection', kind: 'labour', description: 'Inspection', quantity: '2', labourRateCode: 'standard', ratePerHour: '62.00' },
      { id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'New tyre and tube', amount: '125.00', findingId: worn.id },
      { id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'New fuel hose and clips', amount: '40.00', findingId: fuel.id },
    ];
    const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines, accessTasks: [] });
    expect(saved.status).toBe(200);
    const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [worn.id, fuel.id], message: 'Found while inspecting.', includeQuote: false, estimateVersion: (saved.body as EstimateDto).version });
    expect(sent.status).toBe(201);
    const requestId = (sent.body as SendForApprovalResultDto).request!.id;
    const token = await decideTokenFromMail(a.owners[0].customer.email, requestId);
    const page = (await request(server.app).get(`/api/decide/${token}`)).body as DecisionPageDto;
    const decided = await request(server.app)
      .post(`/api/decide/${token}`)
      .set('User-Agent', 'QuietPhone/4.2 (test handset)')
      .send({
        snapshotHash: page.snapshotHash,
        typedName: 'Zofia Dvořák',
        decisions: [
          { itemId: worn.id, decision: 'decline', note: 'Next year.' },
          { itemId: fuel.id, decision: 'approve', note: '' },
        ],
      });
    expect(decided.status).toBe(200);

    const res = await getPdf(owner, `/api/approval-requests/${requestId}/decision-record.pdf`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="decision-record-${job.number}-Q-[A-Z0-9]+-\\d{4}-\\d{2}-\\d{2}\\.pdf"$`));
    const text = flat(pdfText(keep('decision-record', res.body as Buffer)));
    expect(text).toContain('F-1 Worn nose-wheel tyre');
    expect(text).toContain('New tyre and tube 1 20% £125.00');
    expect(text).toContain('Price shown incl. VAT £150.00');
    expect(text).toContain('Decision Declined');
    expect(text).toContain('Owner’s note: Next year.');
    expect(text).toContain('F-2 Perished fuel hose');
    expect(text).toContain('Decision Approved');
    expect(text).toContain('Name typed to confirm Zofia Dvořák');
    expect(text).toContain('127.0.0.1');
    expect(text).toContain('QuietPhone/4.2 (test handset)');
    expect(text).toContain(page.snapshotHash);
    expect(text).toContain('Approved in these decisions £48.00');

    const listed = (await owner.get(`/api/jobs/${job.id}/documents`)).body as JobDocumentsDto;
    expect(listed.decisionRecords).toMatchObject([{ requestId, decidedByName: 'Zofia Dvořák', path: `/api/approval-requests/${requestId}/decision-record.pdf` }]);
    expect((await otherOwner.get(`/api/approval-requests/${requestId}/decision-record.pdf`)).status).toBe(404);
    expect((await elsewhere.get(`/api/approval-requests/${requestId}/decision-record.pdf`)).status).toBe(404);
    expect((await getPdf(manager, `/api/approval-requests/${requestId}/decision-record.pdf`)).status).toBe(200);
  });
});
