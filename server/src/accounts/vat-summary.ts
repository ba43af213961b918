import { QueryTypes } from 'sequelize';
import { Dec, formatAmount, minorUnits, settleDeposits, type CreditNoteDocument, type InvoiceDocument, type Period, type VatDocumentDto, type VatSummaryDto } from '@wingstage/shared';
import { boundSequelize } from '../models/index.js';
import type { Scope } from '../services/scope.js';
import { checkPeriod } from './period.js';

type Mix = { rate: string; gross: string }[];

const rateLabel = (percent: string) => `${new Dec(percent).toString()}%`;
const mixLabel = (mix: Mix) => {
  const rates = [...new Set(mix.filter((m) => new Dec(m.gross).greaterThan(0)).map((m) => rateLabel(m.rate)))];
  return rates.length === 1 ? rates[0]! : rates.length === 0 ? 'unknown' : 'mixed';
};

/** VAT in a deposit received, on the job's VAT mix when it was asked, through the pricing engine. */
export function depositVat(paymentId: string, amount: string, receivedOn: string, mix: Mix, currency: string): string {
  if (!mix.some((m) => new Dec(m.gross).greaterThan(0))) return formatAmount(new Dec(0), minorUnits(currency));
  const s = settleDeposits({ net: '0.00', vat: '0.00', gross: '0.00', byRate: [] }, [{ id: paymentId, amount, receivedOn, kind: 'advance', vatMix: mix }], [], currency);
  return s.payments[0]!.vat;
}

/**
 * Output VAT for a period, by rate, from the documents themselves:
 * - a deposit (advance payment) is taxed at the date received [VAT Act 1994 s6(4)];
 * - an invoice at its tax point, less the VAT already accounted for on the deposits it lists;
 * - a credit note reduces output VAT at its own date [VAT Regulations 1995 reg 38].
 * Each document row is listed beneath the totals, and the totals are the sums of those rows.
 */
export async function vatSummary(scope: Scope, period: Period, currency: string): Promise<VatSummaryDto> {
  await checkPeriod(scope, period.from, period.to);
  const sequelize = boundSequelize();
  const dp = minorUnits(currency);
  const bind = [scope.workshopId, period.from, period.to];
  const deposits = await sequelize.query<{ id: string; amount: string; received_on: string; vat_mix: Mix; job_number: string; reason: string; currency: string }>(
    `SELECT p.id, p.amount::text, p.received_at::date::text AS received_on, d.vat_mix, j.number AS job_number, d.reason, p.currency
       FROM payments p JOIN deposit_requests d ON d.id = p.deposit_request_id JOIN jobs j ON j.id = p.job_id
      WHERE p.workshop_id = $1 AND p.kind = 'deposit' AND p.state IN ('succeeded', 'partially_refunded', 'refunded')
        AND p.received_at::date BETWEEN $2::date AND $3::date
      ORDER BY p.received_at, p.id`,
    { bind, type: QueryTypes.SELECT },
  );
  const invoices = await sequelize.query<{ id: string; number: string; tax_point: string; document: InvoiceDocument; job_number: string }>(
    `SELECT i.id, i.number, i.tax_point::text, i.document, j.number AS job_number FROM invoices i JOIN jobs j ON j.id = i.job_id
      WHERE i.workshop_id = $1 AND i.tax_point BETWEEN $2::date AND $3::date ORDER BY i.tax_point, i.seq`,
    { bind, type: QueryTypes.SELECT },
  );
  const credits = await sequelize.query<{ id: string; number: string; tax_point: string; document: CreditNoteDocument; job_number: string }>(
    `SELECT c.id, c.number, c.tax_point::text, c.document, j.number AS job_number FROM credit_notes c JOIN jobs j ON j.id = c.job_id
      WHERE c.workshop_id = $1 AND c.tax_point BETWEEN $2::date AND $3::date ORDER BY c.tax_point, c.seq`,
    { bind, type: QueryTypes.SELECT },
  );
  // The rate of each deposit an invoice lists, to take its VAT back off under the same rate.
  const listedIds = invoices.flatMap((i) => i.document.deposits.map((d) => d.paymentId));
  const mixes = new Map<string, Mix>();
  if (listedIds.length) {
    const rows = await sequelize.query<{ id: string; vat_mix: Mix }>(
      `SELECT p.id, d.vat_mix FROM payments p JOIN deposit_requests d ON d.id = p.deposit_request_id WHERE p.workshop_id = $1 AND p.id = ANY($2::uuid[])`,
      { bind: [scope.workshopId, listedIds], type: QueryTypes.SELECT },
    );
    for (const r of rows) mixes.set(r.id, r.vat_mix);
  }

  const fmt = (d: Dec) => formatAmount(d, dp);
  const docs: VatDocumentDto[] = [];
  for (const d of deposits) {
    const vat = depositVat(d.id, d.amount, d.received_on, d.vat_mix, d.currency);
    docs.push({ kind: 'deposit', id: d.id, reference: `Deposit: ${d.reason}`, jobNumber: d.job_number, taxPoint: d.received_on, rate: mixLabel(d.vat_mix), net: fmt(new Dec(d.amount).minus(vat)), vat, gross: d.amount, note: 'Taxed at the date received (VAT Act 1994 s6(4)).' });
  }
  for (const i of invoices) {
    for (const r of i.document.byRate) {
      docs.push({ kind: 'invoice', id: i.id, reference: `Invoice ${i.number}`, jobNumber: i.job_number, taxPoint: i.tax_point, rate: rateLabel(r.vatPercent), net: r.net, vat: r.vat, gross: fmt(new Dec(r.net).plus(r.vat)), note: null });
    }
    for (const dep of i.document.deposits) {
      docs.push({
        kind: 'invoice', id: i.id, reference: `Invoice ${i.number}`, jobNumber: i.job_number, taxPoint: i.tax_point, rate: mixLabel(mixes.get(dep.paymentId) ?? []),
        net: fmt(new Dec(dep.amount).minus(dep.vat).negated()), vat: fmt(new Dec(dep.vat).negated()), gross: fmt(new Dec(dep.amount).negated()),
        note: `Less the deposit received ${dep.receivedOn}: its VAT was due then.`,
      });
    }
  }
  for (const c of credits) {
    for (const r of c.document.byRate) {
      docs.push({ kind: 'credit_note', id: c.id, reference: `Credit note ${c.number}`, jobNumber: c.job_number, taxPoint: c.tax_point, rate: rateLabel(r.vatPercent), net: fmt(new Dec(r.net).negated()), vat: fmt(new Dec(r.vat).negated()), gross: fmt(new Dec(r.net).plus(r.vat).negated()), note: 'Reduces output VAT at its own date (VAT Regulations 1995 reg 38).' });
    }
  }
  // In date order; on one date, deposits, then invoices, then credit notes (a stable sort keeps each document's rows together).
  const order = { deposit: 0, invoice: 1, credit_note: 2 } as const;
  docs.sort((a, b) => a.taxPoint.localeCompare(b.taxPoint) || order[a.kind] - order[b.kind]);
  const byRate = new Map<string, { net: Dec; vat: Dec; gross: Dec }>();
  const tot = { net: new Dec(0), vat: new Dec(0), gross: new Dec(0) };
  for (const d of docs) {
    const b = byRate.get(d.rate) ?? { net: new Dec(0), vat: new Dec(0), gross: new Dec(0) };
    b.net = b.net.plus(d.net);
    b.vat = b.vat.plus(d.vat);
    b.gross = b.gross.plus(d.gross);
    byRate.set(d.rate, b);
    tot.net = tot.net.plus(d.net);
    tot.vat = tot.vat.plus(d.vat);
    tot.gross = tot.gross.plus(d.gross);
  }
  return {
    from: period.from,
    to: period.to,
    currency,
    byRate: [...byRate.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([rate, v]) => ({ rate, net: fmt(v.net), vat: fmt(v.vat), gross: fmt(v.gross) })),
    totals: { net: fmt(tot.net), vat: fmt(tot.vat), gross: fmt(tot.gross) },
    documents: docs,
  };
}
