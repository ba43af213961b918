import Stripe from 'stripe';
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startStripeFake, type RunningFake } from '@wingstage/stripe-fake';
import { Dec } from '@wingstage/shared';
import { Aircraft, AuditEvent, Customer, boundSequelize } from '../src/models/index.js';
import { reconcilePayout, syncPayouts } from '../src/accounts/payouts.js';
import { guardText } from '../src/accounts/csv.js';
import { makeJob, makeWorkshop, signIn, startTestServer, waitForMail, TEST_STRIPE_KEY, TEST_WEBHOOK_SECRET, type Client, type TestServer, type WorkshopFixture } from './helpers.js';
import { cardPayment, cardRefund, creditNote, depositRequest, invoice, offlinePayment } from './accounts-fixtures.js';

let fake: RunningFake;
let server: TestServer;
let sdk: Stripe;
let ws: WorkshopFixture;
let accounts: Client;

const TWO_DAYS = 2 * 86_400 + 60;

beforeAll(async () => {
  fake = await startStripeFake({ apiKey: TEST_STRIPE_KEY, port: 0, webhookSecret: TEST_WEBHOOK_SECRET, retryDelaysMs: [50] });
  server = await startTestServer({ STRIPE_API_URL: fake.url });
  sdk = new Stripe(TEST_STRIPE_KEY, fake.sdkOptions);
  ws = await makeWorkshop('Accounts');
  accounts = await signIn(server.app, ws.users.accounts.email);
});
afterAll(async () => {
  await server?.close();
  await fake?.stop();
});

const count = async (sql: string, bind: unknown[]) => Number(((await boundSequelize().query(sql, { bind, plain: true })) as { n: string }).n);

/** A signed payout.paid event from the fake, posted to our webhook. */
async function deliverPayoutEvent(payoutId: string) {
  const ev = (await sdk.events.list({ type: 'payout.paid', limit: 100 })).data.find((e) => (e.data.object as { id: string }).id === payoutId);
  expect(ev).toBeDefined();
  const payload = JSON.stringify(ev);
  const header = sdk.webhooks.generateTestHeaderString({ payload, secret: TEST_WEBHOOK_SECRET });
  const { default: request } = await import('supertest');
  return request(server.app).post('/api/webhooks/stripe').set('Content-Type', 'application/json').set('Stripe-Signature', header).send(payload);
}

describe('payouts', () => {
  beforeEach(() => fake.state.reset());

  it('when a payout is paid, then the webhook stores it with its transactions matched to the payments, it adds up, and a second delivery or a scheduled fetch writes nothing new', async () => {
    const job = ws.owners[0].job;
    const inv = await invoice(job, { net: '250.00', vat: '50.00', gross: '300.00', taxPoint: '2026-11-20', dueOn: '2026-12-20' });
    const a = await cardPayment(sdk, job, '120.00', { invoiceId: inv.id });
    const b = await cardPayment(sdk, job, '180.00', { invoiceId: inv.id });
    fake.state.advanceClock(TWO_DAYS);
    const [po] = fake.state.runPayouts();
    expect(po).toBeDefined();

    const res = await deliverPayoutEvent(po!.id);
    expect(res.status).toBe(200);
    expect(res.body.outcome).toBe('processed');
    const list = await accounts.get('/api/accounts/payouts');
    const mine = list.body.find((p: { stripePayoutId: string }) => p.stripePayoutId === po!.id);
    // The fake's fee: 1.5 % + 20p on each charge [payments-fake.md]; 120.00 → 2.00, 180.00 → 2.90.
    expect(mine).toMatchObject({ amount: '295.10', transactionsNet: '295.10', transactionsCount: 2, addsUp: true, difference: '0.00', currency: 'GBP' });
    const detail = await accounts.get(`/api/accounts/payouts/${mine.id}`);
    expect(detail.body.transactions.map((t: { paymentId: string }) => t.paymentId).sort()).toEqual([a.payment.id, b.payment.id].sort());
    expect(detail.body.transactions.map((t: { fee: string }) => t.fee).sort()).toEqual(['2.00', '2.90']);

    expect((await deliverPayoutEvent(po!.id)).body.duplicate).toBe(true);
    await syncPayouts(sdk, { all: true });
    await syncPayouts(sdk, { all: true });
    expect(await count(`SELECT count(*) AS n FROM payouts WHERE stripe_payout_id = $1`, [po!.id])).toBe(1);
    expect(await count(`SELECT count(*) AS n FROM payout_transactions pt JOIN payouts p ON p.id = pt.payout_id WHERE p.stripe_payout_id = $1`, [po!.id])).toBe(2);

    // The ledger shows which payout carried each payment.
    const ledger = await accounts.get('/api/accounts/ledger?kind=balance&pageSize=200');
    expect(ledger.body.items.find((r: { id: string }) => r.id === a.payment.id)).toMatchObject({ payout: po!.id, settles: `Invoice ${inv.number}` });
  });

  it('when the fake pays out random sets of charges and refunds, then the nets of each payout’s transactions equal the payout', async () => {
    const job = ws.owners[1].job;
    await fc.assert(
      fc.asyncProperty(fc.array(fc.integer({ min: 100, max: 250_000 }), { minLength: 1, maxLength: 5 }), fc.boolean(), async (amounts, refundFirst) => {
        fake.state.reset();
        const made = [];
        for (const m of amounts) made.push(await cardPayment(sdk, job, (m / 100).toFixed(2)));
        if (refundFirst) await cardRefund(sdk, made[0]!.payment, (Math.floor(amounts[0]! / 2) / 100).toFixed(2));
        fake.state.advanceClock(TWO_DAYS);
        const pos = fake.state.runPayouts();
        await syncPayouts(sdk, { all: true });
        for (const po of pos) {
          const row = (await boundSequelize().query(`SELECT amount::text, transactions_net::text, adds_up FROM payouts WHERE stripe_payout_id = $1`, { bind: [po.id], plain: true })) as { amount: string; transactions_net: string; adds_up: boolean };
          expect(row.adds_up).toBe(true);
          expect(row.transactions_net).toBe(row.amount);
        }
      }),
      { numRuns: 6 },
    );
  });

  it('property: a payout adds up exactly when its transactions’ nets sum to its amount (the payout’s own transaction left out)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -500_000, max: 500_000 }), { maxLength: 60 }), fc.integer({ min: -3, max: 3 }), (nets, skew) => {
        const sum = nets.reduce((a, n) => a.plus(n), new Dec(0)).toNumber();
        const txns = [...nets.map((net) => ({ type: 'charge', net })), { type: 'payout', net: -(sum + skew) }];
        const r = reconcilePayout(sum + skew, txns);
        expect(r.netMinor).toBe(sum);
        expect(r.count).toBe(nets.length);
        expect(r.addsUp).toBe(skew === 0);
      }),
      { numRuns: 300 },
    );
  });

  it('when a planted payout does not add up, then it is stored as sent, flagged, and an exception is raised once', async () => {
    const job = ws.owners[0].job;
    await cardPayment(sdk, job, '50.00');
    fake.state.advanceClock(TWO_DAYS);
    const [po] = fake.state.runPayouts();
    // Planted: the bank was sent one penny more than the transactions net to.
    fake.state.payouts.get(po!.id)!.amount += 1;
    await syncPayouts(sdk, { all: true });
    await syncPayouts(sdk, { all: true });
    const row = (await boundSequelize().query(`SELECT id, amount::text, transactions_net::text, adds_up FROM payouts WHERE stripe_payout_id = $1`, { bind: [po!.id], plain: true })) as { id: string; amount: string; transactions_net: string; adds_up: boolean };
    expect(row).toMatchObject({ amount: '49.06', transactions_net: '49.05', adds_up: false });
    const ex = await accounts.get('/api/accounts/exceptions');
    const flagged = ex.body.filter((e: { payoutId: string }) => e.payoutId === row.id);
    expect(flagged).toHaveLength(1);
    expect(flagged[0]).toMatchObject({ kind: 'payout_does_not_add_up', state: 'open' });
    expect(flagged[0].reason).toMatch(/difference -0\.01/);
  });
});

describe('the ledger and its export', () => {
  let w: WorkshopFixture;
  let acc: Client;
  beforeAll(async () => {
    fake.state.reset();
    w = await makeWorkshop('Ledger');
    acc = await signIn(server.app, w.users.accounts.email);
    // An owner name a spreadsheet would run as a formula.
    await Customer.update({ name: '=HYPERLINK("x")' }, { where: { id: w.owners[1].customer.id } });
    const j1 = w.owners[0].job;
    const j2 = w.owners[1].job;
    const dr = await depositRequest(j1, '99.99');
    await cardPayment(sdk, j1, '99.99', { kind: 'deposit', depositRequestId: dr.id, receivedAt: new Date('2026-11-02T10:00:00Z') });
    const p = await cardPayment(sdk, j2, '0.10', { receivedAt: new Date('2026-11-03T10:00:00Z') });
    await cardPayment(sdk, j2, '1234.57', { receivedAt: new Date('2026-11-04T10:00:00Z') });
    await offlinePayment(j1, '0.20', new Date('2026-11-05T10:00:00Z'));
    await cardRefund(sdk, p.payment, '0.05');
  });

  it('when the ledger is read, then it totals the whole filtered set exactly, pages and sorts on the server, and filters by kind', async () => {
    const all = await acc.get('/api/accounts/ledger?pageSize=2&sort=gross&dir=asc');
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(5);
    expect(all.body.items).toHaveLength(2);
    expect(all.body.items.map((r: { gross: string }) => r.gross)).toEqual(['-0.05', '0.10']);
    // 99.99 + 0.10 + 1234.57 + 0.20 − 0.05: in floating point this sum is not 1334.81.
    expect(all.body.totals.gross).toBe('1334.81');
    expect(all.body.totals.net).toBe(new Dec(all.body.totals.gross).minus(all.body.totals.fee).toFixed(2));
    const second = await acc.get('/api/accounts/ledger?pageSize=2&page=3&sort=gross&dir=asc');
    expect(second.body.items.map((r: { gross: string }) => r.gross)).toEqual(['1234.57']);
    const refunds = await acc.get('/api/accounts/ledger?kind=refund');
    expect(refunds.body).toMatchObject({ total: 1, totals: { gross: '-0.05', fee: '0.00', net: '-0.05' } });
    const offline = await acc.get('/api/accounts/ledger?kind=offline');
    expect(offline.body.items[0]).toMatchObject({ kind: 'offline', method: 'bank_transfer', gross: '0.20' });
    const dep = await acc.get('/api/accounts/ledger?kind=deposit');
    expect(dep.body.items[0].settles).toBe('Deposit: Parts ordered');
    const dated = await acc.get('/api/accounts/ledger?from=2026-11-03&to=2026-11-04');
    expect(dated.body.total).toBe(2);
  });

  it('when the ledger is exported, then the CSV parsed back with the same library equals the ledger rows, and formula-like text is guarded', async () => {
    const page = await acc.get('/api/accounts/ledger?pageSize=200');
    const csv = await acc.get('/api/accounts/ledger.csv');
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const rows = parse(csv.text, { columns: true }) as Record<string, string>[];
    expect(Object.keys(rows[0]!)).toEqual(['date', 'kind', 'job', 'owner', 'method', 'currency', 'gross', 'fee', 'net', 'status', 'payout', 'settles', 'id']);
    expect(rows).toEqual(
      page.body.items.map((r: Record<string, string | null>) => ({
        date: r.date!.slice(0, 10), kind: r.kind, job: r.jobNumber, owner: guardText(r.ownerName), method: r.method, currency: r.currency,
        gross: r.gross, fee: r.fee ?? '', net: r.net ?? '', status: r.status, payout: r.payout ?? '', settles: r.settles ?? '', id: r.id,
      })),
    );
    expect(rows.some((r) => r.owner === `'=HYPERLINK("x")`)).toBe(true);
    // Amounts keep their minus sign: only text cells are guarded.
    expect(rows.some((r) => r.gross === '-0.05')).toBe(true);
  });

  it('when a date range is the wrong way round, or starts before the workshop’s records, then it is a clear 400', async () => {
    const wrong = await acc.get('/api/accounts/ledger?from=2026-11-05&to=2026-11-01');
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.to).toMatch(/start date must be on or before the end date/);
    const early = await acc.get('/api/accounts/vat-summary?from=2019-01-01&to=2026-12-31');
    expect(early.status).toBe(400);
    expect(early.body.error.message).toMatch(/records start in the quarter beginning 2026-10-01/);
    const late = await acc.get('/api/accounts/vat-summary?from=2026-10-01&to=2031-12-31');
    expect(late.status).toBe(400);
    expect((await acc.get('/api/accounts/vat-summary?from=2026-13-01&to=2026-12-31')).status).toBe(400);
  });
});

describe('exceptions', () => {
  it('when things do not match, then each kind is listed once; resolving needs a note, is recorded in the job’s history and the ledger, and twenty at once have one winner', async () => {
    const w = await makeWorkshop('Exceptions');
    const acc = await signIn(server.app, w.users.accounts.email);
    const j1 = w.owners[0].job;
    const j2 = w.owners[1].job;
    const paidNoInvoice = await cardPayment(sdk, j1, '40.00');
    const differs = await cardPayment(sdk, j2, '75.00', { expected: '80.00' });
    await invoice(j2, { net: '100.00', vat: '20.00', gross: '120.00', taxPoint: '2026-10-01', dueOn: '2026-10-31' });
    await cardRefund(sdk, differs.payment, '5.00');
    const first = await acc.get('/api/accounts/exceptions');
    const kinds = first.body.map((e: { kind: string }) => e.kind).sort();
    expect(kinds).toEqual(['amount_differs', 'paid_not_invoiced', 'refund_without_credit_note', 'unpaid_past_terms']);
    // Read again: nothing raised twice.
    expect((await acc.get('/api/accounts/exceptions')).body).toHaveLength(4);

    const target = first.body.find((e: { kind: string }) => e.kind === 'paid_not_invoiced');
    expect(target.paymentId).toBe(paidNoInvoice.payment.id);
    const noNote = await acc.post(`/api/accounts/exceptions/${target.id}/resolve`, { note: '   ' });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.fields.note).toMatch(/note/i);
    expect((await acc.post(`/api/accounts/exceptions/${target.id}/resolve`, {})).status).toBe(400);
    expect(await count(`SELECT count(*) AS n FROM account_exceptions WHERE id = $1 AND state = 'open'`, [target.id])).toBe(1);

    const all = await Promise.all(Array.from({ length: 20 }, () => acc.post(`/api/accounts/exceptions/${target.id}/resolve`, { note: 'Invoice to follow: owner paid early at the desk.' })));
    const statuses = all.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(19);
    const history = await AuditEvent.findAll({ where: { jobId: j1.id, action: 'accounts.exception_resolved' } });
    expect(history).toHaveLength(1);
    expect(history[0]!.summary).toMatch(/Invoice to follow/);
    const ledger = await acc.get('/api/accounts/ledger?kind=balance');
    expect(ledger.body.items.find((r: { id: string }) => r.id === paidNoInvoice.payment.id).exception).toEqual({ kind: 'paid_not_invoiced', state: 'resolved', note: 'Invoice to follow: owner paid early at the desk.' });
    const resolved = await acc.get('/api/accounts/exceptions?state=resolved');
    expect(resolved.body[0]).toMatchObject({ id: target.id, resolvedByName: w.users.accounts.name });
  });

  it('when someone other than accounts or admin asks, then engineers and owners get 404, managers may only read, and another workshop’s exception is 404', async () => {
    const w = await makeWorkshop('Access');
    await cardPayment(sdk, w.owners[0].job, '10.00');
    const acc = await signIn(server.app, w.users.accounts.email);
    const [ex] = (await acc.get('/api/accounts/exceptions')).body;
    for (const who of [w.users.engineer.email, w.owners[0].user.email]) {
      const c = await signIn(server.app, who);
      for (const path of ['/api/accounts/ledger', '/api/accounts/payouts', '/api/accounts/exceptions', '/api/accounts/aged-debt', '/api/accounts/vat-summary?from=2026-10-01&to=2026-12-31', '/api/accounts/ledger.csv', '/api/accounts/weekly']) {
        expect((await c.get(path)).status, `${who} ${path}`).toBe(404);
      }
    }
    const manager = await signIn(server.app, w.users.manager.email);
    expect((await manager.get('/api/accounts/ledger')).status).toBe(200);
    expect((await manager.post(`/api/accounts/exceptions/${ex.id}/resolve`, { note: 'Seen' })).status).toBe(404);
    // Another workshop's accounts person.
    expect((await accounts.post(`/api/accounts/exceptions/${ex.id}/resolve`, { note: 'Not mine' })).status).toBe(404);
    expect((await accounts.get(`/api/accounts/payouts/${ex.id}`)).status).toBe(404);
    const admin = await signIn(server.app, w.users.admin.email);
    expect((await admin.post(`/api/accounts/exceptions/${ex.id}/resolve`, { note: 'Checked with the owner.' })).status).toBe(200);
  });
});

describe('VAT summary', () => {
  it('when a deposit falls in one quarter, its invoice in the next, and a credit note after, then each quarter carries its own output VAT and the totals tie to the documents', async () => {
    // Hand-worked [VAT Act 1994 s6(4): a payment before the invoice is a tax point for what it
    // covers; VAT Regulations 1995 reg 38: a credit note adjusts output VAT when it is issued]:
    //  Q3 2026: deposit £240.00 received 15 Sep at 20 %  → VAT 240 × 1/6 = £40.00, net £200.00.
    //  Q4 2026: invoice 20 Oct, £1,000.00 + £200.00 VAT; less the deposit's £40.00 already
    //           accounted → £160.00; credit note 5 Nov £50.00 + £10.00 VAT → −£10.00. Q4 = £150.00.
    const w = await makeWorkshop('Vat');
    const acc = await signIn(server.app, w.users.accounts.email);
    const job = w.owners[0].job;
    const dr = await depositRequest(job, '240.00', [{ rate: '20', gross: '1200.00' }]);
    const dep = await cardPayment(sdk, job, '240.00', { kind: 'deposit', depositRequestId: dr.id, receivedAt: new Date('2026-09-15T11:00:00Z') });
    const inv = await invoice(job, {
      net: '1000.00', vat: '200.00', gross: '1200.00', taxPoint: '2026-10-20', dueOn: '2026-11-19', balanceDue: '960.00',
      deposits: [{ paymentId: dep.payment.id, receivedOn: '2026-09-15', amount: '240.00', vat: '40.00', method: 'card', reference: null }],
    });
    await creditNote(inv, { net: '50.00', vat: '10.00', gross: '60.00', taxPoint: '2026-11-05' });

    const q3 = await acc.get('/api/accounts/vat-summary?from=2026-07-01&to=2026-09-30');
    expect(q3.status).toBe(200);
    expect(q3.body.totals).toEqual({ net: '200.00', vat: '40.00', gross: '240.00' });
    expect(q3.body.byRate).toEqual([{ rate: '20%', net: '200.00', vat: '40.00', gross: '240.00' }]);
    expect(q3.body.documents).toHaveLength(1);

    const q4 = await acc.get('/api/accounts/vat-summary?from=2026-10-01&to=2026-12-31');
    expect(q4.body.totals).toEqual({ net: '750.00', vat: '150.00', gross: '900.00' });
    expect(q4.body.documents.map((d: { kind: string; vat: string }) => [d.kind, d.vat])).toEqual([['invoice', '200.00'], ['invoice', '-40.00'], ['credit_note', '-10.00']]);
    const tie = q4.body.documents.reduce((a: Dec, d: { vat: string }) => a.plus(d.vat), new Dec(0));
    expect(tie.toFixed(2)).toBe(q4.body.totals.vat);

    const csv = await acc.get('/api/accounts/vat-summary.csv?from=2026-10-01&to=2026-12-31');
    const rows = parse(csv.text, { columns: true }) as Record<string, string>[];
    expect(rows.at(-1)).toMatchObject({ section: 'total', vat: '150.00', net: '750.00', gross: '900.00' });
  });
});

describe('aged debt', () => {
  it('when invoices are owed past their due dates, then each owner’s debt sits in the right column, and a reminder e-mail lists what is owed', async () => {
    const w = await makeWorkshop('Aged');
    const acc = await signIn(server.app, w.users.accounts.email);
    const today = new Date();
    const daysAgo = (n: number) => new Date(today.getTime() - n * 86_400_000).toISOString().slice(0, 10);
    const j1 = w.owners[0].job;
    await invoice(j1, { net: '100.00', vat: '20.00', gross: '120.00', taxPoint: daysAgo(70), dueOn: daysAgo(45) });
    await offlinePayment(j1, '20.00', new Date());
    const j2 = w.owners[1].job;
    await invoice(j2, { net: '500.00', vat: '100.00', gross: '600.00', taxPoint: daysAgo(130), dueOn: daysAgo(100) });
    const res = await acc.get('/api/accounts/aged-debt');
    expect(res.status).toBe(200);
    const one = res.body.rows.find((r: { customerId: string }) => r.customerId === w.owners[0].customer.id);
    expect(one.buckets).toEqual({ d0_30: '0.00', d31_60: '100.00', d61_90: '0.00', over90: '0.00' });
    const two = res.body.rows.find((r: { customerId: string }) => r.customerId === w.owners[1].customer.id);
    expect(two.buckets.over90).toBe('600.00');
    expect(res.body.totals.total).toBe('700.00');

    const sent = await acc.post('/api/accounts/aged-debt/reminders', { customerId: w.owners[0].customer.id });
    expect(sent.status).toBe(202);
    const mail = await waitForMail(w.owners[0].customer.email!, (m) => /Payment reminder/.test(m.subject));
    expect(mail.text).toMatch(/£100\.00 to pay/);
    expect(await AuditEvent.count({ where: { jobId: j1.id, action: 'accounts.debt_reminder' } })).toBe(1);
    expect((await acc.post('/api/accounts/aged-debt/reminders', { customerId: 'not-an-id' })).status).toBe(400);
    expect((await accounts.post('/api/accounts/aged-debt/reminders', { customerId: w.owners[0].customer.id })).status).toBe(404);
  });
});

describe('aged debt, paged', () => {
  it('when the list runs over several pages, then the pages joined equal the whole list, and every page carries the totals of all owners', async () => {
    const w = await makeWorkshop('Aged pages');
    const acc = await signIn(server.app, w.users.accounts.email);
    const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
    // Nine owners in all, owing in every column; two invoices for one owner so a page is cut by owner, not by invoice.
    const owners = [w.owners[0].job, w.owners[1].job];
    for (let n = 3; n <= 9; n++) {
      const customer = await Customer.create({ workshopId: w.workshop.id, name: `Owner ${String.fromCharCode(64 + n)} paged`, email: `paged${n}-${w.workshop.id.slice(0, 6)}@test.example` });
      const aircraft = await Aircraft.create({ workshopId: w.workshop.id, customerId: customer.id, registration: `Q-PG${n}${w.workshop.id.slice(0, 2).toUpperCase()}`, type: 'Two-seat flex-wing trike', airframeHours: '10.0' });
      owners.push(await makeJob(w.workshop.id, aircraft.id));
    }
    const ages = [5, 40, 75, 120, 0, 33, 61, 95, 200];
    for (const [i, job] of owners.entries()) {
      const gross = new Dec(i + 1).times('123.45');
      // VAT fraction 1/6 of a standard-rated gross [HMRC VAT Notice 700]; net is the rest.
      const vat = gross.dividedBy(6).toDecimalPlaces(2);
      await invoice(job, { net: gross.minus(vat).toFixed(2), vat: vat.toFixed(2), gross: gross.toFixed(2), taxPoint: daysAgo(ages[i]! + 30), dueOn: daysAgo(ages[i]!) });
    }
    await invoice(await makeJob(w.workshop.id, owners[2]!.aircraftId), { net: '50.00', vat: '10.00', gross: '60.00', taxPoint: daysAgo(10), dueOn: daysAgo(-20) });

    const whole = (await acc.get('/api/accounts/aged-debt?pageSize=200')).body;
    expect(whole.ownerCount).toBe(9);
    expect(whole.rows).toHaveLength(9);
    expect(new Set(whole.rows.map((r: { customerId: string }) => r.customerId)).size).toBe(9);
    const joined: unknown[] = [];
    for (let page = 1; page <= 5; page++) {
      const res = await acc.get(`/api/accounts/aged-debt?page=${page}&pageSize=2`);
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ page, pageSize: 2, ownerCount: 9, totals: whole.totals });
      joined.push(...res.body.rows);
    }
    expect(joined).toEqual(whole.rows);
    // The totals are those of every owner's row, summed by decimal.
    const sum = (key: 'd0_30' | 'd31_60' | 'd61_90' | 'over90') => whole.rows.reduce((a: Dec, r: { buckets: Record<string, string> }) => a.plus(r.buckets[key]!), new Dec(0)).toFixed(2);
    expect(whole.totals).toEqual({ d0_30: sum('d0_30'), d31_60: sum('d31_60'), d61_90: sum('d61_90'), over90: sum('over90'), total: whole.rows.reduce((a: Dec, r: { total: string }) => a.plus(r.total), new Dec(0)).toFixed(2) });
    // Past the end: no rows, the same totals.
    expect((await acc.get('/api/accounts/aged-debt?page=9&pageSize=2')).body).toMatchObject({ rows: [], ownerCount: 9, totals: whole.totals });
    expect((await acc.get('/api/accounts/aged-debt?page=0')).status).toBe(400);
    expect((await acc.get('/api/accounts/aged-debt?pageSize=abc')).status).toBe(400);
  });
});
