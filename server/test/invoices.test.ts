import { randomUUID } from 'node:crypto';
import type Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startStripeFake, type RunningFake } from '@wingstage/stripe-fake';
import { inTransaction } from '../src/db/transaction.js';
import { AuditEvent, CreditNote, DepositRequest, EstimateLine, Invoice, Job, Payment, PaymentEvent, Refund, boundSequelize } from '../src/models/index.js';
import { stripeClient } from '../src/payments/stripe-client.js';
import { recordStripeEvent } from '../src/services/payment-events.service.js';
import { issueInvoiceIn } from '../src/services/invoices.service.js';
import { makeFinding, makeJob, makeWorkshop, signIn, startTestServer, TEST_STRIPE_KEY, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let fake: RunningFake;
let sdk: Stripe;
let a: WorkshopFixture;
let b: WorkshopFixture;
let manager: Client;
let accounts: Client;
let owner1: Client;
let owner2: Client;
let otherManager: Client;

beforeAll(async () => {
  fake = await startStripeFake({ port: 0, apiKey: TEST_STRIPE_KEY });
  server = await startTestServer({ STRIPE_API_URL: fake.url });
  sdk = stripeClient(server.parts.config);
  a = await makeWorkshop('Invoices');
  b = await makeWorkshop('Elsewhere');
  [manager, accounts, owner1, owner2, otherManager] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.users.accounts.email),
    signIn(server.app, a.owners[0].user.email),
    signIn(server.app, a.owners[1].user.email),
    signIn(server.app, b.users.manager.email),
  ]);
}, 60_000);
afterAll(async () => {
  await server?.close();
  await fake?.stop();
});

type LineSpec = { stage: 'inspection' | 'approved' | 'declined' | 'discovered'; kind: 'labour' | 'fee'; amount?: string; hours?: string; agreed?: boolean; findingId?: string | null; vatRate?: string; description?: string };

async function line(job: Job, s: LineSpec, sortOrder: number) {
  await EstimateLine.create({
    jobId: job.id, id: randomUUID(), workshopId: job.workshopId, stage: s.stage, kind: s.kind, description: s.description ?? `${s.kind} ${sortOrder}`,
    quantity: s.kind === 'labour' ? (s.hours ?? '1') : '1', labourRateCode: s.kind === 'labour' ? 'standard' : null, ratePerHour: s.kind === 'labour' ? '62.00' : null,
    partId: null, supplierId: null, unitCost: null, unitPrice: null, markupPercent: null, amount: s.kind === 'fee' ? (s.amount ?? '10.00') : null,
    vatRate: (s.vatRate ?? 'standard') as 'standard', findingId: s.findingId ?? null, accessTaskId: null, discountPercent: null, sortOrder,
    agreedAt: s.stage === 'inspection' && s.agreed !== false ? new Date('2026-11-10T10:00:00Z') : null,
    agreedHow: s.stage === 'inspection' && s.agreed !== false ? 'phone' : null,
    agreedBy: s.stage === 'inspection' && s.agreed !== false ? 'Owner' : null,
  });
}

/**
 * A job ready for release with £1,200 agreed (10 h × £62 inspection labour, £580 approved work), a
 * declined finding (£999) and an inspection line the owner never agreed (£55): only £1,200 is invoiced.
 */
async function readyJob(w: WorkshopFixture = a, ownerIx = 0): Promise<Job> {
  const job = await makeJob(w.workshop.id, w.owners[ownerIx]!.aircraft.id, 'ready_for_release');
  const approved = await makeFinding(job, { state: 'approved', seq: 1, title: 'Cracked exhaust clamp' });
  const declined = await makeFinding(job, { state: 'declined', seq: 2, title: 'Worn seat cushion' });
  await line(job, { stage: 'inspection', kind: 'labour', hours: '10', description: 'Annual inspection labour' }, 0);
  await line(job, { stage: 'inspection', kind: 'fee', amount: '55.00', agreed: false, description: 'Unagreed extra' }, 1);
  await line(job, { stage: 'approved', kind: 'fee', amount: '580.00', findingId: approved.id, description: 'New exhaust clamp fitted' }, 2);
  await line(job, { stage: 'declined', kind: 'fee', amount: '999.00', findingId: declined.id, description: 'Seat cushion renewal' }, 3);
  return job;
}

/** A card deposit of `amount` received on `receivedAt`, as the deposits flow records it. */
async function cardDeposit(job: Job, amount: string, receivedAt: Date, intentId: string | null = null): Promise<Payment> {
  const dr = await DepositRequest.create({
    workshopId: job.workshopId, jobId: job.id, origin: 'manual', reason: 'Parts ordered', amount, currency: 'GBP',
    vatMix: [{ rate: '20', gross: '1440.00' }], state: 'paid', paidAt: receivedAt,
  });
  return Payment.create({
    workshopId: job.workshopId, jobId: job.id, kind: 'deposit', method: 'card', depositRequestId: dr.id, state: 'succeeded', currency: 'GBP',
    expectedAmount: amount, amount, receivedAt, stripePaymentIntentId: intentId ?? `pi_test_${randomUUID().replace(/-/g, '')}`,
    stripeChargeId: intentId ? null : `ch_test_${randomUUID().replace(/-/g, '')}`,
  });
}

const counter = async (workshopId: string, kind = 'invoice') => {
  const [row] = (await boundSequelize().query(`SELECT next_value FROM document_counters WHERE workshop_id = $1 AND kind = $2`, { bind: [workshopId, kind], plain: false })) as unknown as [{ next_value: number }[]];
  return row[0]?.next_value ?? 1;
};

describe('issuing a VAT invoice', () => {
  it('when the manager issues a job ready for release, then the invoice holds only agreed and approved work, the deposit with its own tax point, and the job is invoiced', async () => {
    const job = await readyJob();
    // Received in the VAT quarter before the invoice: it keeps its own tax point [VAT Act 1994 s6(4)].
    await cardDeposit(job, '300.00', new Date('2026-09-28T10:00:00Z'));
    const preview = await manager.get(`/api/jobs/${job.id}/invoice/preview`);
    expect(preview.status).toBe(200);
    expect(preview.body.blocker).toBeNull();
    const res = await manager.post(`/api/jobs/${job.id}/invoice`, { expectedGross: preview.body.document.totals.gross });
    expect(res.status).toBe(201);
    const doc = res.body.document;
    expect(doc.lines.map((l: { description: string }) => l.description).sort()).toEqual(['Annual inspection labour', 'New exhaust clamp fitted']);
    expect(doc.lines.find((l: { finding: string | null }) => l.finding)).toMatchObject({ finding: 'F-1 Cracked exhaust clamp', stage: 'approved', net: '580.00' });
    expect(doc.lines.find((l: { unit: string }) => l.unit === 'h')).toMatchObject({ quantity: '10.00', unitNet: '62.00', net: '620.00', vatPercent: '20' });
    // Sources vector (sources.md, deposits) [VAT Act 1994 s6(4); HMRC VATTOS5105]: £1,200 + £240 VAT,
    // £300 deposit first → £50 VAT at its payment date; the balance £1,140 carries £190 VAT.
    expect(doc.totals).toEqual({ net: '1200.00', vat: '240.00', gross: '1440.00' });
    expect(doc.deposits).toEqual([expect.objectContaining({ receivedOn: '2026-09-28', amount: '300.00', vat: '50.00', method: 'card' })]);
    expect(doc.depositsVat).toBe('50.00');
    expect(doc.balance).toEqual({ net: '950.00', vat: '190.00', gross: '1140.00' });
    expect(doc.balanceDue).toBe('1140.00');
    expect(doc.taxPoint).toBe(doc.issuedOn);
    expect(doc.taxPoint > '2026-09-30').toBe(true);
    expect(res.body).toMatchObject({ state: 'issued', gross: '1440.00', received: '300.00', due: '1140.00' });
    expect(res.body.number).toMatch(/^INV-\d{5}$/);
    // Every particular reg 14(1) asks for is in the frozen document [VAT Regulations 1995 reg 14(1); Notice 700 §16.3].
    expect(doc.supplier.name).toBe(a.workshop.name);
    expect(doc.customer.name).toBe(a.owners[0].customer.name);
    expect(doc.byRate).toEqual([{ vatRate: 'standard', vatPercent: '20', net: '1200.00', vat: '240.00' }]);
    const after = await Job.findByPk(job.id);
    expect(after!.state).toBe('invoiced');
    const history = await AuditEvent.findAll({ where: { jobId: job.id }, order: [['at', 'ASC']] });
    expect(history.map((h) => h.action)).toEqual(expect.arrayContaining(['job.state_changed', 'invoice.issued']));

    const again = await manager.post(`/api/jobs/${job.id}/invoice`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already has an invoice/);
  });

  it('when the job is not ready for release, then issuing is refused with the reason and no number is used', async () => {
    const job = await readyJob();
    await job.update({ state: 'in_work' });
    const before = await counter(a.workshop.id);
    const res = await manager.post(`/api/jobs/${job.id}/invoice`, {});
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe('An invoice is issued when the job is ready for release; this job is in work.');
    expect(await Invoice.count({ where: { jobId: job.id } })).toBe(0);
    expect(await counter(a.workshop.id)).toBe(before);
  });

  it('when someone tries to mark a job invoiced or paid by hand, then it is refused: those follow from the invoice and the money', async () => {
    const job = await readyJob();
    const res = await manager.post(`/api/jobs/${job.id}/transition`, { to: 'invoiced', version: job.version });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/Issue invoice/);
    expect((await Job.findByPk(job.id))!.state).toBe('ready_for_release');
  });

  it('when 20 jobs are issued at once, then they get 20 consecutive numbers, and an issue rolled back gives its number back', async () => {
    const w = await makeWorkshop('Burst');
    const m = await signIn(server.app, w.users.manager.email);
    const jobs = await Promise.all(Array.from({ length: 20 }, () => readyJob(w)));
    const started = performance.now();
    const results = await Promise.all(jobs.map((j) => m.post(`/api/jobs/${j.id}/invoice`, {})));
    const ms = performance.now() - started;
    console.info(`[measure] 20 invoices issued concurrently in ${ms.toFixed(0)} ms`);
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
    const seqs = (await Invoice.findAll({ where: { workshopId: w.workshop.id }, attributes: ['seq'] })).map((i) => i.seq).sort((x, y) => x - y);
    expect(seqs).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));

    // A failure after the number was taken (forced here) rolls the whole issue back, number included.
    const failing = await readyJob(w);
    const scope = { workshopId: w.workshop.id, userId: w.users.manager.id, role: 'manager' as const, customerId: null };
    await expect(
      inTransaction(async (t) => {
        const inv = await issueInvoiceIn(scope, failing.id, {}, t);
        expect(inv.seq).toBe(21);
        throw new Error('forced rollback');
      }),
    ).rejects.toThrow('forced rollback');
    expect((await Job.findByPk(failing.id))!.state).toBe('ready_for_release');
    const next = await m.post(`/api/jobs/${failing.id}/invoice`, {});
    expect(next.status).toBe(201);
    expect(next.body.number).toBe('INV-00021');
  }, 60_000);
});

describe('payments taken another way', () => {
  it('when accounts records a bank transfer for what is owed, then the invoice and the job are paid; more than owed or a future date is refused and nothing is written', async () => {
    const job = await readyJob();
    await cardDeposit(job, '300.00', new Date('2026-11-20T10:00:00Z'));
    expect((await manager.post(`/api/jobs/${job.id}/invoice`, {})).status).toBe(201);
    const tooMuch = await accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '1140.01', method: 'bank_transfer', receivedOn: '2026-11-30', reference: 'BRK 1' });
    expect(tooMuch.status).toBe(422);
    expect(tooMuch.body.error.message).toMatch(/more than the £1,140.00 still owed/);
    const future = await accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '10.00', method: 'cash', receivedOn: '2999-01-01' });
    expect(future.status).toBe(400);
    const badDecimal = await accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '10.001', method: 'cash', receivedOn: '2026-11-30' });
    expect(badDecimal.status).toBe(400);
    expect(await Payment.count({ where: { jobId: job.id, kind: 'balance' } })).toBe(0);
    const asManager = await manager.post(`/api/jobs/${job.id}/payments/offline`, { amount: '100.00', method: 'cash', receivedOn: '2026-11-30' });
    expect(asManager.status).toBe(403);

    const part = await accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '140.00', method: 'cheque', receivedOn: '2026-11-30', reference: 'Chq 100231' });
    expect(part.status).toBe(201);
    expect(part.body.invoice).toMatchObject({ state: 'issued', received: '440.00', due: '1000.00' });
    const rest = await accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '1000.00', method: 'bank_transfer', receivedOn: '2026-12-01', reference: 'BRK 2' });
    expect(rest.status).toBe(201);
    expect(rest.body.invoice).toMatchObject({ state: 'paid', due: '0.00' });
    expect((await Job.findByPk(job.id))!.state).toBe('paid');
    const nothingOwed = await accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '1.00', method: 'cash', receivedOn: '2026-12-01' });
    expect(nothingOwed.status).toBe(409);
  });

  it('when 20 payments of the whole balance race, then exactly one is recorded', async () => {
    const job = await readyJob();
    expect((await manager.post(`/api/jobs/${job.id}/invoice`, {})).status).toBe(201);
    const res = await Promise.all(Array.from({ length: 20 }, () => accounts.post(`/api/jobs/${job.id}/payments/offline`, { amount: '1440.00', method: 'bank_transfer', receivedOn: '2026-12-01' })));
    expect(res.filter((r) => r.status === 201)).toHaveLength(1);
    expect(res.every((r) => r.status === 201 || r.status === 409)).toBe(true);
    expect(await Payment.count({ where: { jobId: job.id, kind: 'balance' } })).toBe(1);
  }, 30_000);
});

describe('credit notes and refunds', () => {
  it('when accounts issues a goodwill credit note, then it has its own number in its own sequence and lowers what is owed; one above the invoice is refused', async () => {
    const job = await readyJob();
    const inv = (await manager.post(`/api/jobs/${job.id}/invoice`, {})).body;
    const tooBig = await accounts.post(`/api/invoices/${inv.id}/credit-notes`, { amount: '1440.01', reason: 'Goodwill' });
    expect(tooBig.status).toBe(422);
    expect(tooBig.body.error.message).toMatch(/cannot be more than the £1,440.00 still on invoice/);
    const cn = await accounts.post(`/api/invoices/${inv.id}/credit-notes`, { amount: '120.00', reason: 'Goodwill: aircraft returned a day late' });
    expect(cn.status).toBe(201);
    expect(cn.body.number).toMatch(/^CN-\d{5}$/);
    // £120 gross at 20% carries £20 VAT (VAT fraction 1/6) [HMRC VAT Notice 700].
    expect(cn.body.document).toMatchObject({ totals: { net: '100.00', vat: '20.00', gross: '120.00' }, invoice: { number: inv.number }, refund: null });
    const after = (await manager.get(`/api/invoices/${inv.id}`)).body;
    expect(after).toMatchObject({ invoiced: '1320.00', due: '1320.00', state: 'issued' });
    expect(after.creditNotes).toHaveLength(1);
  });

  it('when accounts refunds part of a card payment, then the processor refunds it, a credit note is issued, the payment is partly refunded, and charge.refunded changes nothing more', async () => {
    const job = await readyJob();
    const pi = await sdk.paymentIntents.create({ amount: 30000, currency: 'gbp', payment_method: 'pm_card_visa', confirm: true });
    expect(pi.status).toBe('succeeded');
    const deposit = await cardDeposit(job, '300.00', new Date('2026-11-20T10:00:00Z'), pi.id);
    const inv = (await manager.post(`/api/jobs/${job.id}/invoice`, {})).body;
    const tooMuch = await accounts.post(`/api/invoices/${inv.id}/refunds`, { paymentId: deposit.id, amount: '300.01', reason: 'Too much' });
    expect(tooMuch.status).toBe(422);
    expect(await CreditNote.count({ where: { invoiceId: inv.id } })).toBe(0);
    const res = await accounts.post(`/api/invoices/${inv.id}/refunds`, { paymentId: deposit.id, amount: '60.00', reason: 'Clamp supplied at a lower price' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ gross: '60.00', vat: '10.00', refunded: '60.00' });
    const p = await Payment.findByPk(deposit.id);
    expect(p).toMatchObject({ state: 'partially_refunded', refunded: '60.00' });
    const refund = await Refund.findOne({ where: { paymentId: deposit.id } });
    expect(refund).toMatchObject({ state: 'succeeded', amount: '60.00', creditNoteId: res.body.id });
    const charge = await sdk.charges.retrieve(String((await sdk.paymentIntents.retrieve(pi.id)).latest_charge));
    expect(charge.amount_refunded).toBe(6000);

    // The processor's event arrives: the payment is already up to date.
    const event = fake.state.events.newestFirst().find((e) => e.type === 'charge.refunded' && (e.data.object as Stripe.Charge).id === charge.id);
    expect(event).toBeDefined();
    const receipt = await recordStripeEvent({ config: server.parts.config, mail: server.parts.mail, logger: server.parts.logger, photos: server.parts.photos }, event!);
    expect(receipt.outcome).toBe('processed');
    expect(await PaymentEvent.count({ where: { stripeEventId: event!.id } })).toBe(1);
    expect(await Payment.findByPk(deposit.id)).toMatchObject({ state: 'partially_refunded', refunded: '60.00' });
    const owed = (await manager.get(`/api/invoices/${inv.id}`)).body;
    expect(owed).toMatchObject({ invoiced: '1380.00', received: '240.00', due: '1140.00', paid: '300.00', refunded: '60.00' });
  });

  it('when an invoice paid in full has part refunded with its credit note, then it reads paid, refunded and nothing owed, to staff and to the owner', async () => {
    const job = await readyJob();
    const inv = (await manager.post(`/api/jobs/${job.id}/invoice`, {})).body;
    // The whole £1,440.00 by card, then £5.00 handed back: the invoice drops to £1,435.00 and so does what was kept.
    const pi = await sdk.paymentIntents.create({ amount: 144000, currency: 'gbp', payment_method: 'pm_card_visa', confirm: true });
    const payment = await Payment.create({
      workshopId: job.workshopId, jobId: job.id, kind: 'balance', method: 'card', state: 'succeeded', currency: 'GBP',
      expectedAmount: '1440.00', amount: '1440.00', receivedAt: new Date('2026-11-25T10:00:00Z'), stripePaymentIntentId: pi.id,
    });
    const cn = await accounts.post(`/api/invoices/${inv.id}/refunds`, { paymentId: payment.id, amount: '5.00', reason: 'Rounding on the clamp price' });
    expect(cn.status).toBe(201);
    const staffView = (await manager.get(`/api/invoices/${inv.id}`)).body;
    expect(staffView).toMatchObject({ invoiced: '1435.00', paid: '1440.00', refunded: '5.00', received: '1435.00', due: '0.00' });
    expect(staffView.creditNotes).toEqual([expect.objectContaining({ number: cn.body.number, refunded: '5.00', gross: '5.00' })]);
    const ownerView = (await owner1.get(`/api/jobs/${job.id}/invoice`)).body.invoice;
    expect(ownerView).toMatchObject({ paid: '1440.00', refunded: '5.00', due: '0.00', payments: [] });
    expect(ownerView.creditNotes.map((c: { number: string; refunded: string | null }) => [c.number, c.refunded])).toEqual([[cn.body.number, '5.00']]);
    // The list row carries the same figures, worked from the row.
    const row = (await manager.get(`/api/invoices?jobId=${job.id}`)).body.items[0];
    expect(row).toMatchObject({ paid: '1440.00', refunded: '5.00', due: '0.00' });
  });
});

describe('who sees which invoice', () => {
  it('when an owner asks for their own invoice they get it; another owner, another workshop or an owner listing all get 404 / 403', async () => {
    const job = await readyJob(a, 0);
    const inv = (await manager.post(`/api/jobs/${job.id}/invoice`, {})).body;
    expect((await owner1.get(`/api/invoices/${inv.id}`)).status).toBe(200);
    const own = await owner1.get(`/api/jobs/${job.id}/invoice`);
    expect(own.status).toBe(200);
    expect(own.body.invoice).toMatchObject({ id: inv.id, payments: [] });
    expect((await owner2.get(`/api/invoices/${inv.id}`)).status).toBe(404);
    expect((await owner2.get(`/api/jobs/${job.id}/invoice`)).status).toBe(404);
    expect((await otherManager.get(`/api/invoices/${inv.id}`)).status).toBe(404);
    expect((await otherManager.post(`/api/jobs/${job.id}/invoice`, {})).status).toBe(404);
    expect((await owner1.get('/api/invoices')).status).toBe(403);
    expect((await owner1.get('/api/credit-notes')).status).toBe(403);
    const list = await manager.get(`/api/invoices?jobId=${job.id}`);
    expect(list.status).toBe(200);
    expect(list.body.items.map((i: { id: string }) => i.id)).toEqual([inv.id]);
    expect((await manager.get(`/api/invoices?state=nonsense`)).status).toBe(400);
    expect((await otherManager.get(`/api/invoices?jobId=${job.id}`)).body.items).toEqual([]);
  });
});
