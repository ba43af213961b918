import type { CreditNoteDocument, InvoiceDocument, InvoiceDocumentLine, ReceiptDocument } from '@wingstage/shared';

/*
 * Hand-built frozen documents for the PDF tests. Invented workshop, people and aircraft (Q- marks).
 * Figures are worked by hand at 20%: the test vector of sources.md, job £1,200 + £240 VAT with a
 * £300 deposit carrying £50 VAT, the balance £1,140 carrying £190 [derived from VAT Act 1994 s6(4)].
 */

export const SUPPLIER = {
  name: 'Brackenfold Light Aircraft Engineering',
  addressLines: ['Hangar 3, Marsh Lane Airstrip', 'Fendlebury'],
  postcode: 'QX9 4ZZ',
  vatNumber: 'GB 999 0001 23',
  phone: '01632 960418',
  email: 'office@brackenfold.example',
};

export const CUSTOMER = {
  name: 'Zofia Dvořák',
  addressLines: ['12 Ulica Łódź Cottages', 'Little Wenham'],
  postcode: 'QX2 7YY',
  email: 'zofia.dvorak@owners.example',
};

export const JOB = { number: 'J-1042', title: 'Annual permit inspection', registration: 'Q-BRKA', aircraft: 'two-seat flex-wing trike' };

const line = (over: Partial<InvoiceDocumentLine>): InvoiceDocumentLine => ({
  stage: 'inspection',
  finding: null,
  description: 'Annual inspection labour',
  quantity: '8.00',
  unit: 'h',
  unitNet: '62.00',
  discount: '0.00',
  vatRate: 'standard',
  vatPercent: '20',
  net: '496.00',
  vat: null,
  ...over,
});

export function anInvoice(over: Partial<InvoiceDocument> = {}): InvoiceDocument {
  return {
    version: 1,
    kind: 'invoice',
    number: 'INV-000107',
    issuedOn: '2026-12-02',
    taxPoint: '2026-11-30',
    dueOn: '2026-12-16',
    supplier: SUPPLIER,
    customer: CUSTOMER,
    job: JOB,
    currency: 'GBP',
    rounding: 'invoice_nearest',
    roundingLabel: 'VAT on the invoice total, to the nearest penny',
    lines: [
      line({}),
      line({ description: 'Spark plugs, resistor type', quantity: '4', unit: 'each', unitNet: '14.00', net: '56.00' }),
      line({ description: 'Permit revalidation paperwork', quantity: '1', unit: '', unitNet: '48.00', net: '48.00' }),
      line({ stage: 'approved', finding: 'F-2 Perished fuel hose, left tank outlet', description: 'Replace fuel hose and clips', quantity: '2.5', unit: 'h', unitNet: '62.00', net: '155.00' }),
      line({ stage: 'approved', finding: 'F-2 Perished fuel hose, left tank outlet', description: 'Fuel hose, 1 m, with clips', quantity: '1', unit: 'each', unitNet: '445.00', net: '445.00' }),
    ],
    byRate: [{ vatRate: 'standard', vatPercent: '20', net: '1200.00', vat: '240.00' }],
    totals: { net: '1200.00', vat: '240.00', gross: '1440.00' },
    deposits: [{ paymentId: 'pay_3f9a1c', receivedOn: '2026-10-28', amount: '300.00', vat: '50.00', method: 'card', reference: 'Quote deposit' }],
    depositsVat: '50.00',
    balance: { net: '950.00', vat: '190.00', gross: '1140.00' },
    balanceDue: '1140.00',
    notes: ['Payment terms: 14 days from the date of issue.', 'Pay by card from your job page, or by bank transfer quoting INV-000107.'],
    ...over,
  };
}

/** An invoice of `n` lines (the long-invoice test): VAT per line, so every line carries its own VAT column. */
export function aLongInvoice(n: number): InvoiceDocument {
  const lines: InvoiceDocumentLine[] = [];
  for (let i = 1; i <= n; i++) {
    lines.push(
      line({
        stage: i <= n / 2 ? 'inspection' : 'approved',
        finding: i <= n / 2 ? null : `F-${Math.ceil((i - n / 2) / 10)} Finding number ${Math.ceil((i - n / 2) / 10)}`,
        description: `Line ${i}: rivet, stainless, countersunk, with sealant`,
        quantity: '1',
        unit: 'each',
        unitNet: '10.00',
        net: '10.00',
        vat: '2.00',
      }),
    );
  }
  const net = (10 * n).toFixed(2);
  const vat = (2 * n).toFixed(2);
  const gross = (12 * n).toFixed(2);
  return anInvoice({
    number: 'INV-000200',
    rounding: 'line_nearest',
    roundingLabel: 'VAT on each line, to the nearest penny',
    lines,
    byRate: [{ vatRate: 'standard', vatPercent: '20', net, vat }],
    totals: { net, vat, gross },
    deposits: [],
    depositsVat: '0.00',
    balance: { net, vat, gross },
    balanceDue: gross,
  });
}

export function aCreditNote(over: Partial<CreditNoteDocument> = {}): CreditNoteDocument {
  return {
    version: 1,
    kind: 'credit_note',
    number: 'CN-000012',
    issuedOn: '2026-12-05',
    taxPoint: '2026-12-05',
    invoice: { number: 'INV-000107', issuedOn: '2026-12-02' },
    supplier: SUPPLIER,
    customer: CUSTOMER,
    job: JOB,
    currency: 'GBP',
    reason: 'Fuel hose charged at the wrong length: 0.5 m was fitted, not 1 m.',
    lines: [{ description: 'Fuel hose, 0.5 m not fitted', vatRate: 'standard', vatPercent: '20', net: '100.00', vat: '20.00' }],
    byRate: [{ vatRate: 'standard', vatPercent: '20', net: '100.00', vat: '20.00' }],
    totals: { net: '100.00', vat: '20.00', gross: '120.00' },
    refund: { amount: '120.00', method: 'card', paymentId: 'pay_7d2e01' },
    notes: ['The refund reaches your card in 5 to 10 working days.'],
    ...over,
  };
}

export function aReceipt(over: Partial<ReceiptDocument> = {}): ReceiptDocument {
  return {
    version: 1,
    kind: 'receipt',
    paymentId: 'pay_3f9a1c',
    receivedOn: '2026-10-28',
    supplier: SUPPLIER,
    customer: CUSTOMER,
    job: JOB,
    currency: 'GBP',
    description: 'Deposit on accepting the quote for the annual permit inspection',
    amount: '300.00',
    vat: '50.00',
    method: 'card',
    invoiceNumber: null,
    notes: [],
    ...over,
  };
}
