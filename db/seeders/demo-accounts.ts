import type Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { Dec, type InvoiceDocument } from '../../shared/src/index.js';
import { Aircraft, AuditEvent, Customer, DepositRequest, Invoice, Payment, type User, type Workshop } from '../../server/src/models/index.js';
import { createStripeClient } from '../../server/src/payments/stripe-client.js';
import type { SeededJob } from './demo-estimates.js';

const day = 86_400_000;
const iso = (d: Date) => d.toISOString().slice(0, 10);

/** The local fake the demo app talks to, when the seed runs beside it (npm start, npm test). */
function demoStripe(): Stripe | null {
  const key = process.env.STRIPE_SECRET_KEY;
  const url = process.env.STRIPE_API_URL;
  if (!key || !url) return null;
  const u = new URL(url);
  return createStripeClient({ STRIPE_SECRET_KEY: key, NODE_ENV: 'test', stripeApi: { host: u.hostname, port: Number(u.port), protocol: u.protocol === 'https:' ? 'https' : 'http' } });
}

/** A card payment confirmed in the fake (so its balance transaction and a payout run are real). */
async function viaFake(stripe: Stripe | null, amount: string): Promise<Partial<Payment> & { fee: string; net: string }> {
  const minor = new Dec(amount).times(100).toNumber();
  if (stripe) {
    try {
      const pi = await stripe.paymentIntents.create({ amount: minor, currency: 'gbp', payment_method: 'pm_card_visa', confirm: true });
      const charge = await stripe.charges.retrieve(pi.latest_charge as string);
      const bt = await stripe.balanceTransactions.retrieve(charge.balance_transaction as string);
      return { stripePaymentIntentId: pi.id, stripeChargeId: charge.id, stripeBalanceTransactionId: bt.id, fee: (bt.fee / 100).toFixed(2), net: (bt.net / 100).toFixed(2) };
    } catch {
      // No fake running (a seed test without one): the rows are planted without processor objects.
    }
  }
  // The UK standard card fee the fake charges: 1.5 % half-up + 20p [common practice; values as the fake uses them].
  const feeMinor = new Dec(minor).times('0.015').toDecimalPlaces(0, Dec.ROUND_HALF_UP).plus(20);
  return { fee: feeMinor.dividedBy(100).toFixed(2), net: new Dec(minor).minus(feeMinor).dividedBy(100).toFixed(2) };
}

function invoiceDocument(w: Workshop, c: Customer, a: Aircraft, job: SeededJob, number: string, taxPoint: string, dueOn: string, net: string, vat: string, gross: string): InvoiceDocument {
  return {
    version: 1,
    kind: 'invoice',
    number,
    issuedOn: taxPoint,
    taxPoint,
    dueOn,
    supplier: { name: w.name, addressLines: (w.addressLines ?? '').split('\n'), postcode: w.postcode ?? '', vatNumber: w.vatNumber ?? '', phone: '01632 960418', email: 'office@brackenfold.example' },
    customer: { name: c.name, addressLines: [], postcode: '', email: c.email },
    job: { number: job.job.number, title: job.job.title, registration: a.registration, aircraft: a.type },
    currency: 'GBP',
    rounding: 'invoice-nearest',
    roundingLabel: 'VAT worked on the invoice total, to the nearest penny',
    lines: [{ stage: 'approved', finding: null, description: job.job.title, quantity: '1', unit: '', unitNet: net, discount: '0.00', vatRate: 'standard', vatPercent: '20', net, vat: null }],
    byRate: [{ vatRate: 'standard', vatPercent: '20', net, vat }],
    totals: { net, vat, gross },
    deposits: [],
    depositsVat: '0.00',
    balance: { net, vat, gross },
    balanceDue: gross,
    notes: ['Payment is due within 30 days of the invoice date.'],
  };
}

/**
 * Accounts in the demo: two issued invoices (one paid by card, one part-paid by card and still
 * owed within its terms), an older one paid by bank transfer, and a deposit paid by card that came
 * in short of what was asked — the one planted exception. The card payments are real in the local
 * fake, with the fake's clock moved past their two pending days, so a payout run pays them out.
 */
export async function seedAccounts(w: Workshop, jobs: SeededJob[], staff: Map<string, User>, now: Date, t: Transaction): Promise<void> {
  const byTitle = (title: string) => jobs.find((j) => j.job.title === title);
  const paidJob = byTitle('Fuel hose and clip renewal');
  const owedJob = byTitle('Exhaust spring replacement');
  const oldJob = byTitle('Gearbox inspection');
  const depositJob = byTitle('Wing strip inspection and re-cover');
  if (!paidJob || !owedJob || !oldJob || !depositJob) return;
  const stripe = demoStripe();
  const moira = staff.get('moira')!;
  const partyOf = async (j: SeededJob) => {
    const aircraft = (await Aircraft.findByPk(j.job.aircraftId, { transaction: t }))!;
    const customer = (await Customer.findByPk(aircraft.customerId, { transaction: t }))!;
    return { aircraft, customer };
  };

  let seq = 0;
  const issue = async (j: SeededJob, daysAgo: number, net: string, vat: string, gross: string, state: 'issued' | 'paid') => {
    seq += 1;
    const number = `INV-${String(seq).padStart(4, '0')}`;
    const taxPoint = iso(new Date(now.getTime() - daysAgo * day));
    const dueOn = iso(new Date(now.getTime() + (30 - daysAgo) * day));
    const { aircraft, customer } = await partyOf(j);
    return Invoice.create(
      {
        workshopId: w.id, jobId: j.job.id, seq, number, state, taxPoint, dueOn, currency: 'GBP', rounding: 'invoice-nearest', net, vat, gross,
        depositsGross: '0.00', balanceDue: gross, document: invoiceDocument(w, customer, aircraft, j, number, taxPoint, dueOn, net, vat, gross),
        issuedAt: new Date(now.getTime() - daysAgo * day), issuedBy: staff.get('declan')!.id, paidAt: state === 'paid' ? new Date(now.getTime() - (daysAgo - 2) * day) : null,
      },
      { transaction: t },
    );
  };

  const paidInv = await issue(paidJob, 12, '200.00', '40.00', '240.00', 'paid');
  const p1 = await viaFake(stripe, '240.00');
  await Payment.create({ workshopId: w.id, jobId: paidJob.job.id, kind: 'balance', method: 'card', invoiceId: paidInv.id, state: 'succeeded', currency: 'GBP', expectedAmount: '240.00', amount: '240.00', ...p1, receivedAt: new Date(now.getTime() - 10 * day) }, { transaction: t });

  const owedInv = await issue(owedJob, 5, '300.00', '60.00', '360.00', 'issued');
  const p2 = await viaFake(stripe, '200.00');
  await Payment.create({ workshopId: w.id, jobId: owedJob.job.id, kind: 'balance', method: 'card', invoiceId: owedInv.id, state: 'succeeded', currency: 'GBP', expectedAmount: '360.00', amount: '200.00', ...p2, receivedAt: new Date(now.getTime() - 3 * day) }, { transaction: t });

  const oldInv = await issue(oldJob, 60, '150.00', '30.00', '180.00', 'paid');
  await Payment.create(
    { workshopId: w.id, jobId: oldJob.job.id, kind: 'balance', method: 'bank_transfer', invoiceId: oldInv.id, state: 'succeeded', currency: 'GBP', expectedAmount: '180.00', amount: '180.00', fee: '0.00', net: '180.00', reference: 'BACS 4471', recordedBy: moira.id, receivedAt: new Date(now.getTime() - 55 * day) },
    { transaction: t },
  );
  await w.sequelize.query(`INSERT INTO document_counters (workshop_id, kind, prefix, next_value) VALUES ($1, 'invoice', 'INV-', $2) ON CONFLICT (workshop_id, kind) DO NOTHING`, { bind: [w.id, seq + 1], transaction: t });

  // The planted exception: £300.00 asked as a deposit, £290.00 received.
  const dr = await DepositRequest.create(
    { workshopId: w.id, jobId: depositJob.job.id, origin: 'manual', reason: 'Fabric and dope ordered for the re-cover', amount: '300.00', currency: 'GBP', vatMix: [{ rate: '20', gross: '1800.00' }], state: 'paid', paidAt: new Date(now.getTime() - 4 * day), createdBy: staff.get('declan')!.id },
    { transaction: t },
  );
  const p3 = await viaFake(stripe, '290.00');
  await Payment.create(
    { workshopId: w.id, jobId: depositJob.job.id, kind: 'deposit', method: 'card', depositRequestId: dr.id, state: 'succeeded', currency: 'GBP', expectedAmount: '300.00', amount: '290.00', ...p3, amountMismatch: true, receivedAt: new Date(now.getTime() - 4 * day) },
    { transaction: t },
  );
  await AuditEvent.create({ workshopId: w.id, jobId: depositJob.job.id, actorUserId: null, action: 'payment.received', summary: 'Deposit of £290.00 received by card (£300.00 was asked)', detail: { depositRequestId: dr.id }, at: new Date(now.getTime() - 4 * day) }, { transaction: t });

  // The fake holds card money for two days before a payout may take it.
  if (stripe) {
    try {
      const u = new URL(process.env.STRIPE_API_URL!);
      await fetch(`${u.origin}/control/clock`, { method: 'POST', headers: { Authorization: `Bearer ${process.env.STRIPE_SECRET_KEY}`, 'Content-Type': 'application/x-www-form-urlencoded' }, body: 'advance_seconds=172860' });
    } catch {
      // No fake: nothing to move.
    }
  }
}
