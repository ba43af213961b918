import type { CreditNoteDocument, InvoiceDocument, ReceiptDocument } from '@wingstage/shared';

/*
 * The PDF documents, rendered on the server with @react-pdf/renderer. Each takes the frozen
 * document data and returns the PDF's bytes. (Being built: until the renderer lands these refuse.)
 */

export async function renderInvoicePdf(doc: InvoiceDocument): Promise<Buffer> {
  throw new Error(`PDF rendering is not available yet (invoice ${doc.number}).`);
}

export async function renderCreditNotePdf(doc: CreditNoteDocument): Promise<Buffer> {
  throw new Error(`PDF rendering is not available yet (credit note ${doc.number}).`);
}

export async function renderReceiptPdf(doc: ReceiptDocument): Promise<Buffer> {
  throw new Error(`PDF rendering is not available yet (receipt ${doc.paymentId}).`);
}
