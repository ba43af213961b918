import { Text } from '@react-pdf/renderer';
import type { CreditNoteDocument } from '@wingstage/shared';
import { H2, Notice, P, Sums, Table, VatDocumentFrame, day, money, s, type Row } from './kit.js';
import { methodWords, percent } from './invoice.js';

/**
 * A credit note [VAT Regulations 1995 reg 38; HMRC manual VATREC13040]: its own number and date,
 * the supplier's and customer's names and addresses and the supplier's VAT number, the original
 * invoice's number and date, the reason, what is credited and the VAT credited.
 */
export function CreditNotePdf({ doc }: { doc: CreditNoteDocument }) {
  const c = doc.currency;
  return (
    <VatDocumentFrame
      title="Credit note"
      reference={doc.number}
      subject={`Credit note ${doc.number} against VAT invoice ${doc.invoice.number}`}
      supplier={doc.supplier}
      heading="Credit to"
      customer={doc.customer}
      job={doc.job}
      facts={[
        ['Credit note number', doc.number],
        ['Date of issue', day(doc.issuedOn)],
        ['Tax point', day(doc.taxPoint)],
        ['Against VAT invoice', `${doc.invoice.number}, issued ${day(doc.invoice.issuedOn)}`],
      ]}
    >

      <H2>Why this credit is given</H2>
      <P>{doc.reason}</P>

      <H2>What is credited</H2>
      <Table
        columns={[
          { label: 'Description', flex: 4.4 },
          { label: 'VAT rate', flex: 1, align: 'right' },
          { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
          { label: 'VAT credited', flex: 1.4, align: 'right' },
        ]}
        rows={doc.lines.map((l): Row => ({ cells: [l.description, percent(l.vatPercent), money(l.net, c), money(l.vat, c)] }))}
        empty="No lines."
      />
      {doc.byRate.length > 1 && (
        <Table
          columns={[
            { label: 'VAT rate', flex: 2 },
            { label: 'Amount excl. VAT', flex: 1.5, align: 'right' },
            { label: 'VAT credited', flex: 1.5, align: 'right' },
          ]}
          rows={doc.byRate.map((r): Row => ({ cells: [`${percent(r.vatPercent)} (${r.vatRate})`, money(r.net, c), money(r.vat, c)] }))}
        />
      )}
      <Sums
        rows={[
          { label: 'Credited excl. VAT', value: money(doc.totals.net, c) },
          { label: 'VAT credited', value: money(doc.totals.vat, c) },
          { label: 'Total credited incl. VAT', value: money(doc.totals.gross, c), strong: true },
        ]}
      />
      <Text style={s.note}>
        Amounts in {c === 'GBP' ? 'pounds sterling' : c}. This credit note reduces VAT invoice {doc.invoice.number} by{' '}
        {money(doc.totals.gross, c)} including VAT.
      </Text>

      <H2>Refund</H2>
      {doc.refund ? (
        <P>
          {money(doc.refund.amount, c)} is being paid back to you ({methodWords(doc.refund.method).toLowerCase()}), against payment reference{' '}
          {doc.refund.paymentId}.
        </P>
      ) : (
        <P>No money is paid back with this credit note: it reduces what the invoice asks of you.</P>
      )}

      {doc.notes.length > 0 && (
        <Notice>
          {doc.notes.map((n, i) => (
            <Text key={i}>{n}</Text>
          ))}
        </Notice>
      )}
    </VatDocumentFrame>
  );
}
