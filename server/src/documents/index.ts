import type { CreditNoteDocument, InvoiceDocument, ReceiptDocument } from '@wingstage/shared';
import type { DecisionRecordDocument, EstimateDocument } from './types.js';
import { renderDocument } from './renderer.js';

export type { DecisionRecordDocument, EstimateDocument } from './types.js';

/*
 * The PDF documents, rendered on the server with @react-pdf/renderer and the Source Sans 3 fonts
 * shipped in server/assets/fonts. Each takes the frozen document data and returns the PDF's bytes.
 */

export function renderInvoicePdf(doc: InvoiceDocument): Promise<Buffer> {
  return renderDocument({ kind: 'invoice', doc });
}

export function renderCreditNotePdf(doc: CreditNoteDocument): Promise<Buffer> {
  return renderDocument({ kind: 'credit_note', doc });
}

export function renderReceiptPdf(doc: ReceiptDocument): Promise<Buffer> {
  return renderDocument({ kind: 'receipt', doc });
}

export function renderEstimatePdf(doc: EstimateDocument): Promise<Buffer> {
  return renderDocument({ kind: 'estimate', doc });
}

export function renderDecisionRecordPdf(doc: DecisionRecordDocument): Promise<Buffer> {
  return renderDocument({ kind: 'decision_record', doc });
}
