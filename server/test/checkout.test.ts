import http, { type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import Stripe from 'stripe';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startStripeFake, type RunningFake } from '@wingstage/stripe-fake';
import { AuditEvent, DepositRequest, Invoice, Job, Payment, PaymentEvent, Refund, boundSequelize } from '../src/models/index.js';
import { stripeClient } from '../src/payments/stripe-client.js';
import { makeJob, makeWorkshop, signIn, startTestServer, testConfig, TEST_STRIPE_KEY, TEST_WEBHOOK_SECRET, type Client, type TestServer, type WorkshopFixture, waitForMail } from './helpers.js';

/*
 * Card payments through the real SDK against the local fake: the app opens payment pages, the fake's
 * page takes the test cards (sources.md, "Card payments": Stripe docs "Testing"), and its signed
 * webhooks come back to a listening app. A second fake without webhooks lets a test decide when (and
 * in which order) events arrive, or leave only the owner's return to find out.
 */
const SUCCESS = '4242424242424242';
const DECLINE = '4000000000000002';

let server: TestServer;
let listener: Server;
let live: RunningFake; // delivers webhooks to `listener`
let quiet: RunningFake; // delivers nothing
let quietApp: Express;
let quietSdk: Stripe;

beforeAll(async () => {
  listener = http.createServer();
  await new Promise<void>((r) => listener.listen(0, '127.0.0.1', () => r()));
  const { port } = listener.address() as AddressInfo;
  live = await startStripeFake({ apiKey: TEST_STRIPE_KEY, port: 0, webhookUrl: `http://127.0.0.1:${port}/api/webhooks/stripe`, webhookSecret: TEST_WEBHOOK_SECRET, retryDelaysMs: [50, 100] });
  quiet = await startStripeFake({ apiKey: TEST_STRIPE_KEY, port: 0 });
  server = await startTestServer({ STRIPE_API_URL: live.url });
  listener.on('request', server.app);
  quietApp = server.variant({ STRIPE_API_URL: quiet.url });
  quietSdk = stripeClient(testConfig({ STRIPE_API_URL: quiet.url }));
});
afterAll(async () => {
  await live?.stop();
  await quiet?.stop();
  listener?.closeAllConnections();
  await new Promise((r) => listener?.close(r));
  await server?.close();
});

async function payOnPage(url: string, card: string): Promise<{ status: number; location: string | null; html: string }> {
  const res = await fetch(url, { method: 'POST', body: new URLSearchParams({ card, expiry: '12/34', cvc: '123', action: 'pay' }), redirect: 'manual' });
  return { status: res.status, location: res.headers.get('location'), html: await res.text() };
}
const sessionOf = (url: string) => /\/pay\/(cs_[A-Za-z0-9_]+)/.exec(url)![1]!;

interface Setup {
  w: WorkshopFixture;
  manager: Client;
  owner: Client;
  jobId: string;
}
async function setup(app: Express = server.app): Promise<Setup> {
  const w = await makeWorkshop('Checkout');
  return { w, manager: await signIn(app, w.users.manager.email), owner: await signIn(app, w.owners[0].user.email), jobId: w.owners[0].job.id };
}
async function askDeposit(s: Setup, amount = '250.00', reason = 'Propeller overhaul ordered'): Promise<string> {
  const res = await s.manager.post(`/api/jobs/${s.jobId}/deposits`, { amount, reason });
  expect(res.status).toBe(201);
  return res.body.id as string;
}
async function checkout(s: Setup, depositRequestId: string) {
  return s.owner.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'deposit', depositRequestId });
}

describe('paying a deposit by card', () => {
  it('when the owner pays on the payment page, then the webhook records the payment once with the fee and net of the UK card fee, and the deposit is paid', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    const res = await checkout(s, depositId);
    expect(res.status).toBe(201);
    expect(res.body.url).toMatch(new RegExp(`^${live.url}/pay/cs_`));
    const page = await live.state.session(sessionOf(res.body.url));
    // Integer minor units to the processor.
    expect(page.amount_total).toBe(25000);
    const paid = await payOnPage(res.body.url, SUCCESS);
    expect(paid.status).toBe(303);
    expect(paid.location).toBe(`http://127.0.0.1:3100/my-aircraft/payment?job=${s.jobId}&session=${page.id}`);
    await live.idle();

    // UK standard card fee 1.5% + £0.20 — sources.md, "Card payments" (Stripe support, April 2023): £250.00 → fee £3.95, net £246.05.
    const payment = await Payment.findOne({ where: { depositRequestId: depositId } });
    expect(payment).toMatchObject({ state: 'succeeded', amount: '250.00', fee: '3.95', net: '246.05', amountMismatch: false, kind: 'deposit', method: 'card' });
    expect(payment!.stripeBalanceTransactionId).toMatch(/^txn_/);
    expect(payment!.receivedAt).toBeInstanceOf(Date);
    expect(await DepositRequest.findByPk(depositId)).toMatchObject({ state: 'paid' });
    const history = await AuditEvent.findAll({ where: { jobId: s.jobId, action: ['payment.received', 'deposit.paid'] } });
    expect(history.map((h) => h.summary).sort()).toEqual(['Deposit of £250.00 received by card (fee £3.95, net £246.05)', 'Deposit paid: Propeller overhaul ordered (£250.00)']);

    // The owner sees it paid, without the workshop's fee; the manager sees fee and net.
    const mine = (await s.owner.get(`/api/jobs/${s.jobId}/deposits`)).body;
    expect(mine[0]).toMatchObject({ state: 'paid', payments: [{ state: 'succeeded', amount: '250.00', fee: null, net: null }] });
    const staff = (await s.manager.get(`/api/jobs/${s.jobId}/deposits`)).body;
    expect(staff[0].payments[0]).toMatchObject({ fee: '3.95', net: '246.05' });

    // Paying it again is refused in plain words.
    const again = await checkout(s, depositId);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe('This deposit has already been paid. There is nothing more to pay for it.');
  });

  it('when the fee vectors £120.00 and £10.50 are paid, then fee and net match sources.md', async () => {
    // sources.md, "Card payments": £120.00 → £2.00 / £118.00; £10.50 → £0.36 / £10.14 (half-up rounding from memory).
    for (const [amount, fee, net] of [
      ['120.00', '2.00', '118.00'],
      ['10.50', '0.36', '10.14'],
    ]) {
      const s = await setup();
      const depositId = await askDeposit(s, amount!);
      await payOnPage((await checkout(s, depositId)).body.url, SUCCESS);
      await live.idle();
      expect(await Payment.findOne({ where: { depositRequestId: depositId } })).toMatchObject({ amount, fee, net, state: 'succeeded' });
    }
  });

  it('when a card is declined, then the owner is told the reason on return and can pay on the same page with another card', async () => {
    const s = await setup(quietApp);
    const depositId = await askDeposit(s, '80.00', 'Magneto parts ordered');
    const url = (await checkout(s, depositId)).body.url as string;
    const declined = await payOnPage(url, DECLINE);
    expect(declined.status).toBe(402);
    const back = await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(url) });
    expect(back.status).toBe(200);
    expect(back.body).toMatchObject({ payment: { state: 'failed', failureMessage: 'Your card was declined.' }, declined: 'Your card was declined.', deposit: { state: 'waiting', lastDecline: 'Your card was declined.' } });
    // Returning twice records the decline once.
    await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(url) });
    expect(await AuditEvent.count({ where: { jobId: s.jobId, action: 'payment.declined' } })).toBe(1);
    // The waiting list shows the decline to staff.
    const waiting = (await s.manager.get('/api/deposits/waiting')).body;
    expect(waiting.items.find((r: { id: string }) => r.id === depositId)).toMatchObject({ lastDecline: 'Your card was declined.', openPages: 1 });

    expect((await payOnPage(url, SUCCESS)).status).toBe(303);
    // No webhook from this fake: the return reads the session through the SDK and records it.
    const paid = await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(url) });
    expect(paid.body).toMatchObject({ payment: { state: 'succeeded', amount: '80.00', fee: null }, deposit: { state: 'paid', lastDecline: null }, declined: null });
  });

  it('when the owner comes back before paying, then the page is not paid: only the processor’s answer counts', async () => {
    const s = await setup(quietApp);
    const depositId = await askDeposit(s);
    const url = (await checkout(s, depositId)).body.url as string;
    const back = await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(url) });
    expect(back.body).toMatchObject({ payment: { state: 'pending' }, deposit: { state: 'waiting' }, declined: null });
  });

  it('when the events arrive five times each and the payment intent before the session, then one payment is recorded and the deposit is paid once', async () => {
    const s = await setup(quietApp);
    const depositId = await askDeposit(s, '120.00');
    const url = (await checkout(s, depositId)).body.url as string;
    await payOnPage(url, SUCCESS);
    const events = (await quietSdk.events.list({ limit: 10 })).data.filter((e) => ['payment_intent.succeeded', 'checkout.session.completed'].includes(e.type));
    const session = sessionOf(url);
    const mine = events.filter((e) => (e.data.object as { id: string; metadata?: Record<string, string> }).id === session || (e.data.object as { metadata?: Record<string, string> }).metadata?.deposit_request_id === depositId);
    expect(mine.map((e) => e.type).sort()).toEqual(['checkout.session.completed', 'payment_intent.succeeded']);
    const ordered = [...mine].sort((a) => (a.type === 'payment_intent.succeeded' ? -1 : 1));
    for (let i = 0; i < 5; i += 1) {
      for (const e of i % 2 ? [...ordered].reverse() : ordered) {
        const payload = JSON.stringify(e);
        const res = await request(quietApp).post('/api/webhooks/stripe').set('Content-Type', 'application/json').set('Stripe-Signature', quietSdk.webhooks.generateTestHeaderString({ payload, secret: TEST_WEBHOOK_SECRET })).send(payload);
        expect(res.status).toBe(200);
        expect(res.body.duplicate).toBe(i > 0);
      }
    }
    expect(await Payment.count({ where: { depositRequestId: depositId, state: 'succeeded' } })).toBe(1);
    expect(await AuditEvent.count({ where: { jobId: s.jobId, action: 'payment.received' } })).toBe(1);
    expect(await PaymentEvent.count({ where: { stripeEventId: mine.map((e) => e.id), outcome: 'processed' } })).toBe(2);
  });

  it('when the payment page closes unpaid, then its payment is cancelled and the deposit still waits', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    const url = (await checkout(s, depositId)).body.url as string;
    await stripeClient(testConfig({ STRIPE_API_URL: live.url })).checkout.sessions.expire(sessionOf(url));
    await live.idle();
    expect(await Payment.findOne({ where: { depositRequestId: depositId } })).toMatchObject({ state: 'cancelled', outcomeNote: 'Payment page closed unpaid: it expired before a card was accepted.' });
    expect(await DepositRequest.findByPk(depositId)).toMatchObject({ state: 'waiting' });
  });

  it('when the amount taken differs from the deposit asked, then the payment is kept and flagged for accounts, and the deposit still waits', async () => {
    const s = await setup();
    const depositId = await askDeposit(s, '250.00');
    const url = (await checkout(s, depositId)).body.url as string;
    // What the payment row expected no longer matches what the page charges (as if either had been changed).
    await boundSequelize().query(`UPDATE payments SET expected_amount = 300.00 WHERE stripe_checkout_session_id = $1`, { bind: [sessionOf(url)] });
    await payOnPage(url, SUCCESS);
    await live.idle();
    const p = await Payment.findOne({ where: { depositRequestId: depositId } });
    expect(p).toMatchObject({ state: 'succeeded', amount: '250.00', amountMismatch: true, outcomeNote: 'Received £250.00 against £300.00 asked: kept and flagged for accounts to check.' });
    expect(await DepositRequest.findByPk(depositId)).toMatchObject({ state: 'waiting' });
    expect(await AuditEvent.count({ where: { jobId: s.jobId, action: 'payment.amount_mismatch' } })).toBe(1);
  });
});

describe('two payment pages for one deposit', () => {
  it('when one page is paid, then the other open pages are expired through the processor and their payments say why', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    const a = (await checkout(s, depositId)).body.url as string;
    const b = (await checkout(s, depositId)).body.url as string;
    expect(a).not.toBe(b);
    await payOnPage(a, SUCCESS);
    await live.idle();
    expect(live.state.session(sessionOf(b)).status).toBe('expired');
    const other = await Payment.findOne({ where: { stripeCheckoutSessionId: sessionOf(b) } });
    expect(other).toMatchObject({ state: 'cancelled' });
    expect(other!.outcomeNote).toMatch(/^Payment page closed unpaid: the deposit was paid through another payment page/);
    // The closed page cannot take money.
    expect((await payOnPage(b, SUCCESS)).status).toBe(402);
  });

  it('when both pages are nonetheless paid, then the second payment is refunded in full through the processor and recorded', async () => {
    const s = await setup(quietApp);
    const depositId = await askDeposit(s);
    const a = (await checkout(s, depositId)).body.url as string;
    const b = (await checkout(s, depositId)).body.url as string;
    await payOnPage(a, SUCCESS);
    await payOnPage(b, SUCCESS);
    expect((await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(a) })).body.payment.state).toBe('succeeded');
    const second = await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(b) });
    expect(second.body.payment).toMatchObject({ state: 'refunded', refunded: '250.00' });
    const p = await Payment.findOne({ where: { stripeCheckoutSessionId: sessionOf(b) } });
    expect(p!.outcomeNote).toBe('Second payment for a deposit that was already paid (two payment pages were open): returned in full.');
    const refund = await Refund.findOne({ where: { paymentId: p!.id } });
    expect(refund).toMatchObject({ amount: '250.00', state: 'succeeded', reason: p!.outcomeNote });
    expect(refund!.stripeRefundId).toMatch(/^re_/);
    const pi = await quietSdk.paymentIntents.retrieve(p!.stripePaymentIntentId!, { expand: ['latest_charge'] });
    expect((pi.latest_charge as Stripe.Charge).amount_refunded).toBe(25000);
    // Once only: another return adds no second refund.
    await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: sessionOf(b) });
    expect(await Refund.count({ where: { paymentId: p!.id } })).toBe(1);
  });
});

describe('races', () => {
  it('when 20 pay requests for one deposit arrive at once, then each opens its own page, and paying one closes all the others', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    const all = await Promise.all(Array.from({ length: 20 }, () => checkout(s, depositId)));
    expect(all.map((r) => r.status)).toEqual(Array(20).fill(201));
    const urls = new Set(all.map((r) => r.body.url as string));
    expect(urls.size).toBe(20);
    await payOnPage([...urls][7]!, SUCCESS);
    await live.idle();
    const states = (await Payment.findAll({ where: { depositRequestId: depositId } })).map((p) => p.state).sort();
    expect(states).toEqual([...Array(19).fill('cancelled'), 'succeeded']);
  });

  it('when 20 cancels of one deposit arrive at once, then one cancels it and the others are told it is already cancelled', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    await checkout(s, depositId);
    const all = await Promise.all(Array.from({ length: 20 }, () => s.manager.post(`/api/jobs/${s.jobId}/deposits/${depositId}/cancel`, { reason: 'Owner bringing parts' })));
    expect(all.filter((r) => r.status === 200)).toHaveLength(1);
    expect(all.filter((r) => r.status === 409).map((r) => r.body.error.message)).toEqual(Array(19).fill('The deposit request is already cancelled.'));
    expect(await AuditEvent.count({ where: { jobId: s.jobId, action: 'deposit.cancelled' } })).toBe(1);
    expect(await Payment.findOne({ where: { depositRequestId: depositId } })).toMatchObject({ state: 'cancelled', outcomeNote: 'Payment page closed unpaid: the workshop cancelled the deposit.' });
    const pay = await checkout(s, depositId);
    expect(pay.status).toBe(409);
    expect(pay.body.error.message).toBe('The workshop cancelled this deposit, so there is nothing to pay for it.');
  });
});

describe('who may pay what', () => {
  it('when another owner, another workshop’s owner or staff try to open a page, then it is 404 or 403 and nothing is written', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    const otherOwner = await signIn(server.app, s.w.owners[1].user.email);
    expect((await otherOwner.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'deposit', depositRequestId: depositId })).status).toBe(404);
    // Their own job, someone else's deposit id.
    expect((await otherOwner.post(`/api/jobs/${s.w.owners[1].job.id}/payments/checkout`, { for: 'deposit', depositRequestId: depositId })).status).toBe(404);
    const elsewhere = await setup();
    expect((await elsewhere.owner.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'deposit', depositRequestId: depositId })).status).toBe(404);
    expect((await elsewhere.owner.get(`/api/jobs/${s.jobId}/deposits`)).status).toBe(404);
    expect((await s.manager.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'deposit', depositRequestId: depositId })).status).toBe(403);
    expect((await elsewhere.manager.post(`/api/jobs/${s.jobId}/deposits/${depositId}/cancel`, {})).status).toBe(404);
    expect(await Payment.count({ where: { depositRequestId: depositId } })).toBe(0);
  });

  it('when the body is wrong, then it is a 400 in plain words and nothing is written', async () => {
    const s = await setup();
    const depositId = await askDeposit(s);
    const bodies: object[] = [{}, { for: 'tip' }, { for: 'deposit' }, { for: 'deposit', depositRequestId: 'x' }, { for: 'deposit', depositRequestId: depositId, amount: '1.00' }, { for: 'balance', amount: 5 }];
    for (const body of bodies) {
      const res = await s.owner.post(`/api/jobs/${s.jobId}/payments/checkout`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
    }
    for (const body of [{ amount: '0.00', reason: 'x' }, { amount: 250, reason: 'x' }, { amount: '-5', reason: 'x' }, { amount: '10.001', reason: 'x' }, { amount: '10.00', reason: '' }, { amount: '10.00', reason: 'a\u0007b' }]) {
      const res = await s.manager.post(`/api/jobs/${s.jobId}/deposits`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.message).not.toMatch(/expected|Invalid/);
    }
    expect((await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: 'cs_test_unknown123' })).status).toBe(404);
    expect((await s.owner.post(`/api/jobs/${s.jobId}/payments/sync`, { sessionId: '../../v1/charges' })).status).toBe(400);
    expect(await Payment.count({ where: { jobId: s.jobId } })).toBe(0);
    expect(await DepositRequest.count({ where: { jobId: s.jobId } })).toBe(1);
  });
});

describe('paying the balance by card', () => {
  async function issueInvoice(jobId: string, workshopId: string, gross: string) {
    const [row] = await boundSequelize().query<{ id: string }>(
      `INSERT INTO invoices (workshop_id, job_id, seq, number, tax_point, due_on, currency, rounding, net, vat, gross, balance_due, document)
       VALUES ($1, $2, 1, 'INV-0001', '2026-12-01', '2026-12-31', 'GBP', 'invoice-nearest', $3::numeric - round($3::numeric / 6, 2), round($3::numeric / 6, 2), $3::numeric, $3::numeric, '{}'::jsonb)
       RETURNING id`,
      { bind: [workshopId, jobId, gross], type: 'SELECT' as never },
    );
    return row!.id;
  }

  it('when there is no invoice or nothing is due, then it is refused; otherwise the page asks for the balance and paying it settles the job', async () => {
    const s = await setup();
    const none = await s.owner.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'balance' });
    expect(none.status).toBe(409);
    expect(none.body.error.message).toBe('There is no invoice for this job yet, so there is no balance to pay.');

    // A paid deposit counts against the invoice.
    const depositId = await askDeposit(s, '120.00');
    await payOnPage((await checkout(s, depositId)).body.url, SUCCESS);
    await live.idle();
    await Job.update({ state: 'invoiced' }, { where: { id: s.jobId } });
    await issueInvoice(s.jobId, s.w.workshop.id, '600.00');
    const res = await s.owner.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'balance' });
    expect(res.status).toBe(201);
    expect(live.state.session(sessionOf(res.body.url)).amount_total).toBe(48000);
    await payOnPage(res.body.url, SUCCESS);
    await live.idle();
    expect(await Payment.findOne({ where: { jobId: s.jobId, kind: 'balance' } })).toMatchObject({ state: 'succeeded', amount: '480.00', fee: '7.40', net: '472.60' });
    expect(await Invoice.findOne({ where: { jobId: s.jobId } })).toMatchObject({ state: 'paid' });
    expect(await Job.findByPk(s.jobId)).toMatchObject({ state: 'paid' });
    const done = await s.owner.post(`/api/jobs/${s.jobId}/payments/checkout`, { for: 'balance' });
    expect(done.status).toBe(409);
    expect(done.body.error.message).toBe('Nothing is left to pay on this job.');
  });
});

describe('asking and cancelling deposits', () => {
  it('when a manager asks a deposit, then the owner is e-mailed, it is in the waiting list and in accounts’ page; an engineer cannot ask one', async () => {
    const s = await setup();
    const depositId = await askDeposit(s, '95.50', 'Exhaust parts ordered');
    const mail = await waitForMail(s.w.owners[0].customer.email!, (m) => m.subject.includes('deposit of £95.50'));
    expect(mail.text).toContain('What it is for: Exhaust parts ordered');
    expect(mail.text).toContain(`/my-aircraft?job=${s.jobId}`);
    const accounts = await signIn(server.app, s.w.users.accounts.email);
    const page = (await accounts.get('/api/deposits/accounts')).body;
    expect(page.waiting).toEqual([expect.objectContaining({ id: depositId, amount: '95.50', reason: 'Exhaust parts ordered', registration: s.w.owners[0].aircraft.registration })]);
    expect(page.totals).toMatchObject({ waiting: '95.50', received: '0.00' });
    const engineer = await signIn(server.app, s.w.users.engineer.email);
    expect((await engineer.post(`/api/jobs/${s.jobId}/deposits`, { amount: '10.00', reason: 'x' })).status).toBe(403);
    expect((await s.owner.get('/api/deposits/accounts')).status).toBe(403);
    expect((await engineer.get('/api/deposits/accounts')).status).toBe(403);
    const closedJob = await makeJob(s.w.workshop.id, s.w.owners[0].aircraft.id, 'cancelled');
    expect((await s.manager.post(`/api/jobs/${closedJob.id}/deposits`, { amount: '10.00', reason: 'x' })).status).toBe(409);
  });

  it('when there are more deposits than one page, then accounts’ page pages each list on its own and its totals cover them all', async () => {
    const s = await setup();
    const job = s.w.owners[0].job;
    const waiting: string[] = [];
    for (let i = 0; i < 5; i += 1) {
      const d = await DepositRequest.create({ workshopId: job.workshopId, jobId: job.id, origin: 'manual', reason: `Waiting ${i}`, amount: `1${i}.05`, currency: 'GBP', createdAt: new Date(Date.UTC(2026, 9, 1 + i)) } as never);
      waiting.push(d.id);
    }
    const received: string[] = [];
    for (let i = 0; i < 3; i += 1) {
      const d = await DepositRequest.create({ workshopId: job.workshopId, jobId: job.id, origin: 'manual', reason: `Paid ${i}`, amount: '100.10', currency: 'GBP', state: 'paid', paidAt: new Date() } as never);
      const p = await Payment.create({ workshopId: job.workshopId, jobId: job.id, kind: 'deposit', method: 'card', depositRequestId: d.id, state: 'succeeded', currency: 'GBP', expectedAmount: '100.10', amount: '100.10', fee: '1.70', net: '98.40', receivedAt: new Date(Date.UTC(2026, 9, 10 + i)) } as never);
      received.unshift(p.id);
    }
    const accounts = await signIn(server.app, s.w.users.accounts.email);
    const first = (await accounts.get('/api/deposits/accounts?pageSize=2')).body;
    expect(first).toMatchObject({ receivedTotal: 3, waitingTotal: 5, receivedPage: 1, waitingPage: 1, pageSize: 2 });
    expect(first.received.map((r: { paymentId: string }) => r.paymentId)).toEqual(received.slice(0, 2));
    expect(first.waiting.map((r: { id: string }) => r.id)).toEqual(waiting.slice(0, 2));
    // Totals of every deposit, not of the page (exact decimal strings).
    expect(first.totals).toEqual({ received: '300.30', fees: '5.10', net: '295.20', waiting: '60.25' });
    const later = (await accounts.get('/api/deposits/accounts?pageSize=2&receivedPage=2&waitingPage=3')).body;
    expect(later.received.map((r: { paymentId: string }) => r.paymentId)).toEqual(received.slice(2));
    expect(later.waiting.map((r: { id: string }) => r.id)).toEqual(waiting.slice(4));
    expect(later.totals).toEqual(first.totals);
    const bad = await accounts.get('/api/deposits/accounts?receivedPage=0');
    expect([400, 422]).toContain(bad.status);
  });
});

describe('webhook processing time', () => {
  it('when 60 real checkout events are processed (payments settled, deposits paid), then the median and 95th percentile are logged, the median under a second', async () => {
    const s = await setup(quietApp);
    const sessions: string[] = [];
    for (let batch = 0; batch < 3; batch += 1) {
      const urls = await Promise.all(
        Array.from({ length: 10 }, async (_, i) => {
          const d = await DepositRequest.create({ workshopId: s.w.workshop.id, jobId: s.jobId, origin: 'manual', reason: `Parts batch ${batch}-${i}`, amount: `${10 + batch}.${String(i).padStart(2, '0')}`, currency: 'GBP' });
          return (await checkout(s, d.id)).body.url as string;
        }),
      );
      for (const url of urls) {
        expect((await payOnPage(url, SUCCESS)).status).toBe(303);
        sessions.push(sessionOf(url));
      }
    }
    // Every event the fake made for these payments: each payment intent's success and each session's completion.
    const events: Stripe.Event[] = [];
    for await (const e of quietSdk.events.list({ limit: 100 })) {
      const o = e.data.object as { id: string; metadata?: Record<string, string> };
      if ((e.type === 'checkout.session.completed' && sessions.includes(o.id)) || (e.type === 'payment_intent.succeeded' && o.metadata?.job_id === s.jobId)) events.push(e);
    }
    expect(events).toHaveLength(60);
    events.reverse(); // oldest first, as delivered
    const times: number[] = [];
    for (const e of events) {
      const payload = JSON.stringify(e);
      const header = quietSdk.webhooks.generateTestHeaderString({ payload, secret: TEST_WEBHOOK_SECRET });
      const t0 = process.hrtime.bigint();
      const res = await request(quietApp).post('/api/webhooks/stripe').set('Content-Type', 'application/json').set('Stripe-Signature', header).send(payload);
      times.push(Number(process.hrtime.bigint() - t0) / 1e6);
      expect(res.body).toMatchObject({ duplicate: false, outcome: 'processed' });
    }
    expect(await Payment.count({ where: { jobId: s.jobId, state: 'succeeded' } })).toBe(30);
    expect(await DepositRequest.count({ where: { jobId: s.jobId, state: 'paid' } })).toBe(30);
    times.sort((a, b) => a - b);
    const median = (times[29]! + times[30]!) / 2;
    const p95 = times[56]!;
    console.info(`checkout webhook processing over 60 events (signature, record, SDK read-back, settle): median ${median.toFixed(1)} ms, 95th percentile ${p95.toFixed(1)} ms`);
    // A coarse bound only: the figures the README quotes come from the log line above, taken on a
    // quiet machine. A shared CI machine at load 20 has shown a p95 of 1.3 s for the same code.
    expect(median).toBeLessThan(1000);
    expect(p95).toBeLessThan(3000);
  }, 180_000);
});
