import { Dec, MoneyError, allocateUnits, formatAmount, minorUnits, parseAmount, parseDecimal, roundHalfUp } from '../money.js';
import type { PricedEstimate, Totals } from './types.js';
import { computeVat, parseVatRate, vatFractionExact, type VatItem } from './vat.js';

const HUNDRED = new Dec(100);

/**
 * When a deposit is asked for, and how much: `percent` of the parts and sub-contract value (incl.
 * VAT) in the inspection scope and approved work, once that value is above `threshold`. With
 * `of: 'excess'` the percentage applies only to the value above the threshold.
 */
export interface DepositPolicy {
  percent: string;
  threshold: string;
  of?: 'whole' | 'excess';
}

export interface DepositRequirement {
  /** Committed parts and sub-contract value incl. VAT. */
  basis: string;
  applies: boolean;
  required: string;
}

/** The deposit a policy asks for on a priced estimate (rounded to the nearest minor unit). */
export function depositRequired(estimate: PricedEstimate, policy: DepositPolicy | null | undefined): DepositRequirement {
  const dp = minorUnits(estimate.currency);
  const items: VatItem[] = [];
  estimate.lines.forEach((l) => {
    if ((l.kind === 'part' || l.kind === 'subcontract') && (l.stage === 'inspection' || l.stage === 'approved')) {
      items.push({ key: l.vatRate, rate: new Dec(l.vatPercent), net: new Dec(l.net) });
    }
  });
  const r = computeVat(items, dp, estimate.rounding);
  const basis = r.net.plus(r.vat);
  if (!policy) return { basis: formatAmount(basis, dp), applies: false, required: formatAmount(new Dec(0), dp) };
  const pct = parseDecimal(policy.percent, 'policy.percent');
  if (pct.greaterThan(100)) throw new MoneyError('out_of_range', 'a deposit cannot exceed 100%.', 'policy.percent');
  const threshold = parseAmount(policy.threshold, estimate.currency, 'policy.threshold');
  const of = policy.of ?? 'whole';
  if (of !== 'whole' && of !== 'excess') throw new MoneyError('invalid_input', 'policy.of is "whole" or "excess".', 'policy.of');
  const applies = basis.greaterThan(threshold);
  const base = !applies ? new Dec(0) : of === 'whole' ? basis : basis.minus(threshold);
  return { basis: formatAmount(basis, dp), applies, required: formatAmount(roundHalfUp(base.times(pct).dividedBy(HUNDRED), dp), dp) };
}

/**
 * A payment taken before the invoice. An `advance` is a payment for the work and creates a tax
 * point for the amount received on `receivedOn` [source: VAT Act 1994 s6(4); HMRC manual
 * VATTOS5105]. A `security` deposit is not consideration and creates none [source: HMRC manual
 * VATTOS5135]; it still counts towards what the owner has paid.
 */
export interface DepositPayment {
  id: string;
  amount: string;
  receivedOn: string;
  kind: 'advance' | 'security';
  /**
   * The job's VAT mix when the payment was received, as gross value per rate; the payment's VAT is
   * worked on this mix. Defaults to the invoice's own mix.
   */
  vatMix?: { rate: string; gross: string }[];
}

export interface DepositRefund {
  paymentId: string;
  amount: string;
}

export interface SettledPayment {
  id: string;
  kind: 'advance' | 'security';
  amount: string;
  refunded: string;
  /** VAT carried by what is kept of the payment, fixed at its tax point. */
  vat: string;
  taxPoint: string | null;
}

export interface Settlement {
  currency: string;
  invoice: { net: string; vat: string; gross: string };
  payments: SettledPayment[];
  /** Totals of what was received, after refunds. */
  paid: { gross: string; vat: string };
  /** VAT still to account for on the final invoice's balance, and the gross balance. Negative when overpaid. */
  balance: { net: string; vat: string; gross: string };
  due: string;
  toRefund: string;
}

const ISO_DATE_RE = /^\d{4}-\d{2}-\d{2}$/;

/** VAT inside a gross payment spread over a VAT mix in proportion to each rate's gross value. */
function paymentVat(amount: Dec, mix: { rate: Dec; gross: Dec }[], dp: number): Dec {
  const positive = mix.filter((m) => m.gross.greaterThan(0));
  if (positive.length === 0) return new Dec(0);
  const scale = new Dec(10).pow(dp);
  const parts = allocateUnits(amount.times(scale), positive.map((m) => m.gross));
  return parts.reduce((acc, p, i) => acc.plus(roundHalfUp(vatFractionExact(p.dividedBy(scale), positive[i]!.rate), dp)), new Dec(0));
}

/**
 * Splits the final invoice between the deposits already received and the balance: each advance
 * carries the VAT fraction of what was received at its payment date, and the balance carries the
 * rest, so the VAT on the deposits plus the balance equals the invoice's VAT [derived from VAT Act
 * 1994 s6(4)]. Refunds reverse their share of a payment's VAT.
 */
export function settleDeposits(
  invoice: Pick<Totals, 'net' | 'vat' | 'gross' | 'byRate'>,
  payments: DepositPayment[],
  refunds: DepositRefund[],
  currency: string,
): Settlement {
  const dp = minorUnits(currency);
  const inv = {
    net: parseAmount(invoice?.net, currency, 'invoice.net'),
    vat: parseAmount(invoice?.vat, currency, 'invoice.vat'),
    gross: parseAmount(invoice?.gross, currency, 'invoice.gross'),
  };
  if (!inv.net.plus(inv.vat).equals(inv.gross)) throw new MoneyError('invalid_input', 'invoice net + VAT must equal gross.', 'invoice');
  const invoiceMix = (invoice.byRate ?? []).map((r, i) => ({
    rate: parseVatRate(r.rate, `invoice.byRate[${i}].rate`),
    gross: parseAmount(r.net, currency, `invoice.byRate[${i}].net`).plus(parseAmount(r.vat, currency, `invoice.byRate[${i}].vat`)),
  }));
  if (!Array.isArray(payments)) throw new MoneyError('invalid_input', 'payments must be an array.', 'payments');

  const ids = new Set<string>();
  const work = payments.map((p, i) => {
    const path = `payments[${i}]`;
    if (typeof p?.id !== 'string' || p.id.length === 0) throw new MoneyError('invalid_input', 'an id is required.', `${path}.id`);
    if (ids.has(p.id)) throw new MoneyError('invalid_input', `payment id "${p.id}" is used twice.`, `${path}.id`);
    ids.add(p.id);
    if (p.kind !== 'advance' && p.kind !== 'security') throw new MoneyError('invalid_input', 'kind is "advance" or "security".', `${path}.kind`);
    if (typeof p.receivedOn !== 'string' || !ISO_DATE_RE.test(p.receivedOn)) {
      throw new MoneyError('invalid_input', 'use a date like 2026-12-01.', `${path}.receivedOn`);
    }
    const amount = parseAmount(p.amount, currency, `${path}.amount`);
    const mix = p.vatMix
      ? p.vatMix.map((m, j) => ({ rate: parseVatRate(m.rate, `${path}.vatMix[${j}].rate`), gross: parseAmount(m.gross, currency, `${path}.vatMix[${j}].gross`) }))
      : invoiceMix;
    if (p.kind === 'advance' && amount.greaterThan(0) && !mix.some((m) => m.gross.greaterThan(0))) {
      // Nothing to say which rates the payment was for: guessing would fix the wrong VAT at the tax point.
      throw new MoneyError('invalid_input', 'give the VAT mix at the payment date: the invoice has no value to take it from.', `${path}.vatMix`);
    }
    const vat = p.kind === 'advance' ? paymentVat(amount, mix, dp) : new Dec(0);
    return { id: p.id, kind: p.kind, receivedOn: p.receivedOn, amount, mix, vat, refunded: new Dec(0), vatRefunded: new Dec(0) };
  });
  const byId = new Map(work.map((w) => [w.id, w]));

  (refunds ?? []).forEach((r, i) => {
    const path = `refunds[${i}]`;
    const w = byId.get(r?.paymentId);
    if (!w) throw new MoneyError('invalid_input', `no payment "${String(r?.paymentId)}" to refund.`, `${path}.paymentId`);
    const amt = parseAmount(r.amount, currency, `${path}.amount`);
    const left = w.amount.minus(w.refunded);
    if (amt.greaterThan(left)) throw new MoneyError('out_of_range', `refund is more than the ${formatAmount(left, dp)} left on payment "${w.id}".`, `${path}.amount`);
    const vatLeft = w.vat.minus(w.vatRefunded);
    // The refund carries the VAT fraction of what is handed back, on the payment's own mix (as its
    // credit note would); a full refund reverses exactly the VAT left, so rounding strands nothing.
    const vatBack = w.kind === 'security' ? new Dec(0) : amt.equals(left) ? vatLeft : paymentVat(amt, w.mix, dp);
    w.refunded = w.refunded.plus(amt);
    w.vatRefunded = w.vatRefunded.plus(Dec.min(vatBack, vatLeft));
  });

  let paidGross = new Dec(0);
  let paidVat = new Dec(0);
  const settled: SettledPayment[] = work.map((w) => {
    const kept = w.amount.minus(w.refunded);
    const vat = w.vat.minus(w.vatRefunded);
    paidGross = paidGross.plus(kept);
    paidVat = paidVat.plus(vat);
    return {
      id: w.id,
      kind: w.kind,
      amount: formatAmount(w.amount, dp),
      refunded: formatAmount(w.refunded, dp),
      vat: formatAmount(vat, dp),
      taxPoint: w.kind === 'advance' ? w.receivedOn : null,
    };
  });
  const balGross = inv.gross.minus(paidGross);
  const balVat = inv.vat.minus(paidVat);
  return {
    currency,
    invoice: { net: formatAmount(inv.net, dp), vat: formatAmount(inv.vat, dp), gross: formatAmount(inv.gross, dp) },
    payments: settled,
    paid: { gross: formatAmount(paidGross, dp), vat: formatAmount(paidVat, dp) },
    balance: { net: formatAmount(balGross.minus(balVat), dp), vat: formatAmount(balVat, dp), gross: formatAmount(balGross, dp) },
    due: formatAmount(Dec.max(balGross, 0), dp),
    toRefund: formatAmount(Dec.max(balGross.negated(), 0), dp),
  };
}
