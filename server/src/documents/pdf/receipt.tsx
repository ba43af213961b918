import { Text, View } from '@react-pdf/renderer';
import type { ReceiptDocument } from '@wingstage/shared';
import { CustomerAndFacts, DocumentFrame, H2, Notice, P, Sums, day, money, s } from './kit.js';
import { methodWords } from './invoice.js';

/**
 * A receipt for one payment. It is not a VAT invoice and says so: a document marked "This is not a
 * VAT invoice" creates no tax point [HMRC manual VATTOS9165]. A deposit's own tax point is the day
 * it was received [VAT Act 1994 s6(4)]; the VAT invoice issued later shows it.
 */
export function ReceiptPdf({ doc }: { doc: ReceiptDocument }) {
  const c = doc.currency;
  return (
    <DocumentFrame title="Receipt" reference={doc.paymentId} subject={`Receipt for a payment on job ${doc.job.number}`} letterhead={{ ...doc.supplier }}>
      <Notice>
        <Text style={[s.strong, { fontSize: 11 }]}>This is not a VAT invoice.</Text>
        <Text>It confirms a payment received. The VAT invoice for the job shows this payment and its VAT.</Text>
      </Notice>
      <CustomerAndFacts
        heading="Received from"
        customer={doc.customer}
        job={doc.job}
        marginTop={12}
        facts={[
          ['Receipt reference', doc.paymentId],
          ['Received on', day(doc.receivedOn)],
          ['Paid by', methodWords(doc.method)],
        ]}
        after={doc.invoiceNumber ? [['Towards VAT invoice', doc.invoiceNumber]] : []}
      />

      <H2>Payment received</H2>
      <P>{doc.description}</P>
      <Sums width={300}
        rows={[
          ...(doc.vat !== null ? [{ label: 'VAT included', value: money(doc.vat, c), note: `fixed on ${day(doc.receivedOn)}, the day it was received` }] : []),
          { label: 'Amount received', value: money(doc.amount, c), strong: true },
        ]}
      />
      {doc.notes.length > 0 && (
        <View style={{ marginTop: 8 }}>
          {doc.notes.map((n, i) => (
            <P key={i}>{n}</P>
          ))}
        </View>
      )}
      <Text style={s.note}>Amounts in {c === 'GBP' ? 'pounds sterling' : c}. Thank you for your payment.</Text>
    </DocumentFrame>
  );
}
