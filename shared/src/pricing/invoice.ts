import type {
  CreditNoteDocumentLine,
  DocumentJob,
  DocumentParty,
  DocumentRateTotal,
  DocumentSupplier,
  InvoiceDocument,
  InvoiceDocumentDeposit,
  InvoiceDocumentLine,
} from '../documents.js';
import { Dec, MoneyError, allocate, formatAmount, minorUnits, parseAmount, roundHalfUp } from '../money.js';
import type { AccessTaskDto, EstimateLineDto } from '../schemas/estimates.js';
import { settleDeposits, type DepositPayment, type DepositRefund } from './deposits.js';
import type { PricedEstimate, RateTotal, Totals } from './types.js';
import { VAT_ROUNDING_LABELS } from '../vat-rounding-words.js';
import { exactVat, parseVatRate, roundLineVat, vatFractionExact } from './vat.js';


/** A deposit received before the invoice, as the invoice shows it. */
export interface InvoiceDepositInput {
  paymentId: string;
  /** Gross received. */
  amount: string;
  /** Of it, already handed back. */
  refunded: string;
  /** The date received (YYYY-MM-DD): the deposit's own tax point [VAT Act 1994 s6(4)]. */
  receivedOn: string;
  method: string;
  reference: string | null;
  /** The job's VAT mix when the deposit was asked (gross per rate); empty → the invoice's own mix. */
  vatMix: { rate: string; gross: string }[];
}

export interface InvoiceBuildInput {
  number: string;
  issuedOn: string;
  taxPoint: string;
  dueOn: string;
  paymentTermsDays: number;
  supplier: DocumentSupplier;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob;
  /** The estimate's lines (their descriptions and quantities) and access tasks, priced below. */
  lines: EstimateLineDto[];
  accessTasks: AccessTaskDto[];
  priced: PricedEstimate;
  /** Finding id → "F3 Cracked exhaust clamp" for approved work. */
  findingNames: Record<string, string>;
  deposits: InvoiceDepositInput[];
}

const UNIT: Record<EstimateLineDto['kind'], string> = { labour: 'h', part: 'each', subcontract: '', fee: '' };

/** Four decimal places at most for a unit price that does not come out in whole pence (a part priced by mark-up). */
function unitPrice(listNet: string, quantity: string, dp: number): string {
  const q = new Dec(quantity);
  if (q.isZero()) return listNet;
  const u = new Dec(listNet).dividedBy(q);
  const exact = u.toDecimalPlaces(dp);
  return u.equals(exact) ? formatAmount(exact, dp) : u.toDecimalPlaces(4, Dec.ROUND_HALF_UP).toFixed(4);
}

function rateTotals(byRate: RateTotal[]): DocumentRateTotal[] {
  return byRate.map((r) => ({ vatRate: r.code, vatPercent: r.rate, net: r.net, vat: r.vat }));
}

const NOTE_FOR_RATE: Partial<Record<string, string>> = {
  zero: 'Lines at 0% are zero-rated supplies.',
  exempt: 'Lines marked exempt are exempt from VAT.',
  outside: 'Lines marked outside the scope are outside the scope of UK VAT.',
};

/**
 * The VAT invoice for a job, as frozen data: what will be invoiced is the engine's `committed`
 * (the agreed inspection scope, approved work, and the access tasks they need) — declined or
 * undecided work never appears. Deposits received are shown with the VAT fixed at their own tax
 * points, and the balance carries the rest [VAT Act 1994 s6(4); settleDeposits]. Every particular
 * of a full VAT invoice is present [VAT Regulations 1995 reg 14(1); VAT Notice 700 §16.3].
 */
export function buildInvoiceDocument(input: InvoiceBuildInput): InvoiceDocument {
  const { priced } = input;
  const currency = priced.currency;
  const dp = minorUnits(currency);
  const byId = new Map(input.lines.map((l) => [l.id, l]));
  const tasks = new Map(input.accessTasks.map((t) => [t.id, t]));

  const lines: InvoiceDocumentLine[] = [];
  for (const p of priced.lines) {
    const committed = (p.stage === 'inspection' && p.agreed) || p.stage === 'approved';
    if (!committed) continue;
    const src = byId.get(p.id);
    if (!src) throw new MoneyError('invalid_input', `line ${p.id} has no description.`, 'lines');
    const quantity = src.kind === 'labour' || src.kind === 'part' ? src.quantity : '1';
    lines.push({
      stage: p.stage === 'inspection' ? 'inspection' : 'approved',
      finding: p.findingId ? (input.findingNames[p.findingId] ?? null) : null,
      description: src.description,
      quantity,
      unit: UNIT[src.kind],
      unitNet: src.kind === 'labour' && src.ratePerHour ? formatAmount(new Dec(src.ratePerHour), dp) : unitPrice(p.listNet, quantity, dp),
      discount: p.discount,
      vatRate: p.vatRate,
      vatPercent: p.vatPercent,
      net: p.net,
      vat: p.vat,
    });
  }
  for (const a of priced.accessTasks) {
    if (!a.committedPays) continue;
    const t = tasks.get(a.id);
    lines.push({
      stage: a.chargedIn === 'inspection' ? 'inspection' : 'approved',
      finding: null,
      description: `Opening-up work: ${t?.name ?? 'access'}`,
      quantity: t?.hours ?? '1',
      unit: t ? 'h' : '',
      unitNet: t ? formatAmount(new Dec(t.ratePerHour), dp) : a.net,
      discount: formatAmount(new Dec(0), dp),
      vatRate: a.vatRate,
      vatPercent: a.vatPercent,
      net: a.net,
      // Per-line VAT for an access task under line-nearest: its own figure, as the engine works it.
      vat: priced.rounding === 'line-nearest' ? formatAmount(roundLineVat(exactVat(new Dec(a.net), new Dec(a.vatPercent)), dp, 'line-nearest'), dp) : null,
    });
  }

  const totals: Totals = priced.committed;
  const payments: DepositPayment[] = input.deposits.map((d) => ({
    id: d.paymentId,
    amount: d.amount,
    receivedOn: d.receivedOn,
    kind: 'advance',
    ...(d.vatMix.length ? { vatMix: d.vatMix } : {}),
  }));
  const refunds: DepositRefund[] = input.deposits.filter((d) => new Dec(d.refunded).greaterThan(0)).map((d) => ({ paymentId: d.paymentId, amount: d.refunded }));
  const settlement = settleDeposits(
    { net: totals.net, vat: totals.vat, gross: totals.gross, byRate: totals.byRate },
    payments,
    refunds,
    currency,
  );
  const deposits: InvoiceDocumentDeposit[] = settlement.payments.map((s, i) => {
    const d = input.deposits[i]!;
    return {
      paymentId: d.paymentId,
      receivedOn: d.receivedOn,
      amount: formatAmount(new Dec(s.amount).minus(s.refunded), dp),
      vat: s.vat,
      method: d.method,
      reference: d.reference,
    };
  });

  const notes: string[] = [];
  for (const code of ['zero', 'exempt', 'outside']) {
    if (lines.some((l) => l.vatRate === code)) notes.push(NOTE_FOR_RATE[code]!);
  }
  if (deposits.length) {
    notes.push('Deposits received before this invoice were taxed when received (each on its own date); the VAT on the balance is the rest.');
  }
  notes.push(input.paymentTermsDays === 0 ? 'Payment due on receipt of this invoice.' : `Payment due within ${input.paymentTermsDays} ${input.paymentTermsDays === 1 ? 'day' : 'days'} of the invoice date.`);

  return {
    version: 1,
    kind: 'invoice',
    number: input.number,
    issuedOn: input.issuedOn,
    taxPoint: input.taxPoint,
    dueOn: input.dueOn,
    supplier: input.supplier,
    customer: input.customer,
    job: input.job,
    currency,
    rounding: priced.rounding,
    roundingLabel: `VAT worked ${VAT_ROUNDING_LABELS[priced.rounding].replace(/^O/, 'o')}`,
    lines,
    byRate: rateTotals(totals.byRate),
    totals: { net: totals.net, vat: totals.vat, gross: totals.gross },
    deposits,
    depositsVat: settlement.paid.vat,
    balance: settlement.balance,
    balanceDue: settlement.due,
    notes,
  };
}

export interface CreditAmounts {
  lines: CreditNoteDocumentLine[];
  byRate: DocumentRateTotal[];
  totals: { net: string; vat: string; gross: string };
}

/**
 * A reduction of `gross` (VAT included) against an invoice, shared across the invoice's VAT rates
 * in proportion to each rate's gross (largest remainder, so the parts add up), each part carrying
 * its VAT fraction [HMRC VAT Notice 700, VAT fraction]. Crediting everything still creditable hands
 * back exactly the VAT still on the invoice per rate, so rounding never strands a penny.
 * `alreadyCredited` is what earlier credit notes took, per rate.
 */
export function creditNoteAmounts(
  invoiceByRate: DocumentRateTotal[],
  alreadyCredited: DocumentRateTotal[],
  gross: string,
  currency: string,
  description: string,
): CreditAmounts {
  const dp = minorUnits(currency);
  const g = parseAmount(gross, currency, 'amount');
  if (!g.greaterThan(0)) throw new MoneyError('out_of_range', 'a credit note must be for more than nothing.', 'amount');
  const left = invoiceByRate.map((r) => {
    const done = alreadyCredited.filter((c) => c.vatRate === r.vatRate && c.vatPercent === r.vatPercent);
    const net = done.reduce((a, c) => a.minus(c.net), new Dec(r.net));
    const vat = done.reduce((a, c) => a.minus(c.vat), new Dec(r.vat));
    return { r, net, vat, gross: net.plus(vat) };
  });
  const creditable = left.reduce((a, l) => a.plus(l.gross), new Dec(0));
  if (g.greaterThan(creditable)) {
    throw new MoneyError('out_of_range', `a credit note cannot be more than the ${formatAmount(creditable, dp)} still on the invoice.`, 'amount');
  }
  let parts: { r: DocumentRateTotal; net: Dec; vat: Dec }[];
  if (g.equals(creditable)) {
    parts = left.map((l) => ({ r: l.r, net: l.net, vat: l.vat }));
  } else {
    const shares = allocate(formatAmount(g, dp), left.map((l) => formatAmount(Dec.max(l.gross, 0), dp)), currency);
    parts = left.map((l, i) => {
      const part = new Dec(shares[i]!);
      const vat = Dec.min(roundHalfUp(vatFractionExact(part, parseVatRate(l.r.vatPercent)), dp), Dec.max(l.vat, 0));
      return { r: l.r, net: part.minus(vat), vat };
    });
  }
  parts = parts.filter((p) => p.net.plus(p.vat).greaterThan(0));
  const net = parts.reduce((a, p) => a.plus(p.net), new Dec(0));
  const vat = parts.reduce((a, p) => a.plus(p.vat), new Dec(0));
  return {
    lines: parts.map((p) => ({ description, vatRate: p.r.vatRate, vatPercent: p.r.vatPercent, net: formatAmount(p.net, dp), vat: formatAmount(p.vat, dp) })),
    byRate: parts.map((p) => ({ vatRate: p.r.vatRate, vatPercent: p.r.vatPercent, net: formatAmount(p.net, dp), vat: formatAmount(p.vat, dp) })),
    totals: { net: formatAmount(net, dp), vat: formatAmount(vat, dp), gross: formatAmount(net.plus(vat), dp) },
  };
}
