import { createElement } from 'react';
import { renderToBuffer } from '@react-pdf/renderer';
import type { CreditNoteDocument, InvoiceDocument, ReceiptDocument } from '@wingstage/shared';
import type { DecisionRecordDocument, EstimateDocument } from './types.js';
import { CreditNotePdf } from './pdf/credit-note.js';
import { DecisionRecordPdf } from './pdf/decision-record.js';
import { EstimatePdf } from './pdf/estimate.js';
import { InvoicePdf } from './pdf/invoice.js';
import { ReceiptPdf } from './pdf/receipt.js';

export type AnyDocument =
  | { kind: 'invoice'; doc: InvoiceDocument }
  | { kind: 'credit_note'; doc: CreditNoteDocument }
  | { kind: 'receipt'; doc: ReceiptDocument }
  | { kind: 'estimate'; doc: EstimateDocument }
  | { kind: 'decision_record'; doc: DecisionRecordDocument };

function element(d: AnyDocument) {
  switch (d.kind) {
    case 'invoice':
      return createElement(InvoicePdf, { doc: d.doc });
    case 'credit_note':
      return createElement(CreditNotePdf, { doc: d.doc });
    case 'receipt':
      return createElement(ReceiptPdf, { doc: d.doc });
    case 'estimate':
      return createElement(EstimatePdf, { doc: d.doc });
    case 'decision_record':
      return createElement(DecisionRecordPdf, { doc: d.doc });
  }
}

/** Renders one document to PDF bytes on this thread. */
export async function renderNow(d: AnyDocument): Promise<Buffer> {
  // The components return <Document>; renderToBuffer's type asks for that element type exactly.
  return renderToBuffer(element(d) as Parameters<typeof renderToBuffer>[0]);
}

