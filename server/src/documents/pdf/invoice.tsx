import Decimal from 'decimal.js';
import { Text } from '@react-pdf/renderer';
import { PAYMENT_METHOD_LABELS, type InvoiceDocument, type InvoiceDocumentLine } from '@wingstage/shared';
import { H2, Notice, P, Sums, Table, VatDocumentFrame, day, money, quantity, s, type Column, type Row } from './kit.js';

/** A payment method in words (the shared labels; a method stored before a label existed prints as stored). */
export const methodWords = (m: string) => (PAYMENT_METHOD_LABELS as Record<string, string>)[m] ?? m;

const STAGE_WORDS: Record<InvoiceDocumentLine['stage'], string> = {
  inspection: 'Inspection scope',
  approved: 'Approved work',
};

export function percent(p: string): string {
  return `${quantity(p)}%`;
}

/**
 * A full VAT invoice: every particular of VAT Regulations 1995 reg 14(1) (Notice 700 §16.3) — number,
 * date of issue, tax point, the supplier's name, address and VAT number, the customer's name and
 * address, and for each line its description, quantity, unit price, rate and amount excluding VAT;
 * totals per rate and in all, with the VAT in sterling — then the deposits already received, each
 * with its own tax point (VAT Act 1994 s6(4)), and the balance.
 */
export function InvoicePdf({ doc }: { doc: InvoiceDocument }) {
  const c = doc.currency;
  const perLineVat = doc.lines.some((l) => l.vat !== null);
  const anyDiscount = doc.lines.some((l) => !/^0(\.0+)?$/.test(l.discount));
  const columns: Column[] = [
    { label: 'Description', flex: 4.4 },
    { label: 'Quantity', flex: 1.1, align: 'right' },
    { label: 'Unit price excl. VAT', flex: 1.5, align: 'right' },
    ...(anyDiscount ? [{ label: 'Discount', flex: 1.1, align: 'right' as const }] : []),
    { label: 'VAT rate', flex: 0.9, align: 'right' },
    { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
    ...(perLineVat ? [{ label: 'VAT', flex: 1.1, align: 'right' as const }] : []),
  ];
  const rows: Row[] = [];
  for (const stage of ['inspection', 'approved'] as const) {
    const lines = doc.lines.filter((l) => l.stage === stage);
    if (!lines.length) continue;
    rows.push({ group: STAGE_WORDS[stage], note: stage === 'approved' ? 'work you approved after the inspection' : 'the work you agreed to at the start' });
    let finding: string | null = null;
    for (const l of lines) {
      if (l.finding && l.finding !== finding) rows.push({ group: l.finding });
      finding = l.finding;
      rows.push({
        cells: [
          l.description,
          `${quantity(l.quantity)}${l.unit ? ` ${l.unit}` : ''}`,
          money(l.unitNet, c),
          ...(anyDiscount ? [/^0(\.0+)?$/.test(l.discount) ? '–' : money(l.discount, c)] : []),
          percent(l.vatPercent),
          money(l.net, c),
          ...(perLineVat ? [l.vat === null ? '–' : money(l.vat, c)] : []),
        ],
      });
    }
  }

  const zeroRated = doc.byRate.some((r) => /^0(\.0+)?$/.test(r.vatPercent) && !/^0(\.0+)?$/.test(r.net));

  return (
    <VatDocumentFrame
      title="VAT invoice"
      reference={doc.number}
      subject={`VAT invoice ${doc.number} for job ${doc.job.number}, ${doc.job.registration}`}
      supplier={doc.supplier}
      heading="Invoice to"
      customer={doc.customer}
      job={doc.job}
      facts={[
        ['Invoice number', doc.number],
        ['Date of issue', day(doc.issuedOn)],
        ['Tax point (time of supply)', day(doc.taxPoint)],
        ['Payment due by', day(doc.dueOn)],
      ]}
    >

      <H2>What this invoice is for</H2>
      <Table columns={columns} rows={rows} empty="No lines." />

      <H2>VAT by rate</H2>
      <Table
        columns={[
          { label: 'VAT rate', flex: 2 },
          { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
          { label: 'VAT', flex: 1.5, align: 'right' },
          { label: 'Amount incl. VAT', flex: 1.5, align: 'right' },
        ]}
        rows={[
          ...doc.byRate.map((r): Row => ({
            cells: [`${percent(r.vatPercent)} (${r.vatRate})`, money(r.net, c), money(r.vat, c), money(addStrings(r.net, r.vat), c)],
          })),
          { kind: 'sum', cells: ['Totals', money(doc.totals.net, c), money(doc.totals.vat, c), money(doc.totals.gross, c)] },
        ]}
      />
      <Sums
        rows={[
          { label: 'Total excl. VAT', value: money(doc.totals.net, c) },
          { label: 'Total VAT', value: money(doc.totals.vat, c) },
          { label: 'Total incl. VAT', value: money(doc.totals.gross, c), strong: true },
        ]}
      />
      <Text style={s.note}>
        Amounts in {c === 'GBP' ? 'pounds sterling' : c}. {doc.roundingLabel}.
        {zeroRated ? ' Lines at 0% are a zero-rated supply.' : ''}
      </Text>

      <H2>Deposits already received</H2>
      {doc.deposits.length === 0 ? (
        <P>No deposit was received for this job before this invoice.</P>
      ) : (
        <>
          <Table
            columns={[
              { label: 'Received on (tax point)', flex: 2 },
              { label: 'How', flex: 1.4 },
              { label: 'Reference', flex: 2 },
              { label: 'Amount', flex: 1.4, align: 'right' },
              { label: 'VAT included', flex: 1.4, align: 'right' },
            ]}
            rows={[
              ...doc.deposits.map((d): Row => ({ cells: [day(d.receivedOn), methodWords(d.method), d.reference ?? '–', money(d.amount, c), money(d.vat, c)] })),
              { kind: 'sum', cells: ['Deposits in all', '', '', money(sumStrings(doc.deposits.map((d) => d.amount)), c), money(doc.depositsVat, c)] },
            ]}
          />
          <Text style={s.note}>
            Each deposit has its own tax point, the day it was received; the VAT it carries was fixed on that day and is part of the total VAT above, not
            charged again.
          </Text>
        </>
      )}

      <H2 minPresenceAhead={130}>The balance</H2>
      <Sums
        width={300}
        rows={[
          { label: 'Balance excl. VAT', value: money(doc.balance.net, c) },
          { label: 'VAT on the balance', value: money(doc.balance.vat, c), note: `tax point ${day(doc.taxPoint)}` },
          { label: 'Balance incl. VAT', value: money(doc.balance.gross, c) },
          { label: `Balance due by ${day(doc.dueOn)}`, value: money(doc.balanceDue, c), strong: true },
        ]}
      />

      {doc.notes.length > 0 && (
        <Notice>
          {doc.notes.map((n, i) => (
            <Text key={i} style={i < doc.notes.length - 1 ? { marginBottom: 2 } : {}}>
              {n}
            </Text>
          ))}
        </Notice>
      )}
    </VatDocumentFrame>
  );
}

/** Display sums of decimal strings (the engine's figures, added for a table's foot) without a float. */
export function sumStrings(xs: string[]): string {
  return xs.reduce((acc, x) => acc.plus(new Decimal(x)), new Decimal(0)).toFixed(2);
}
function addStrings(a: string, b: string): string {
  return sumStrings([a, b]);
}
