/**
 * The documents of one job that can be downloaded as PDF (GET /api/jobs/:id/documents): the
 * estimate always, a decision record for each request the owner decided, the VAT invoice once
 * issued and its credit notes. Each carries its download path, so page and server agree on it.
 */
export interface JobDocumentsDto {
  jobId: string;
  estimate: { path: string };
  decisionRecords: { requestId: string; decidedAt: string; decidedByName: string; path: string }[];
  invoice: { id: string; number: string; issuedAt: string; path: string } | null;
  creditNotes: { id: string; number: string; issuedAt: string; path: string }[];
}

/** The PDF download paths (under the API's /api prefix). */
export const DOCUMENT_PATHS = {
  estimate: (jobId: string) => `/api/jobs/${jobId}/estimate.pdf`,
  decisionRecord: (requestId: string) => `/api/approval-requests/${requestId}/decision-record.pdf`,
  invoice: (invoiceId: string) => `/api/invoices/${invoiceId}/pdf`,
  creditNote: (creditNoteId: string) => `/api/credit-notes/${creditNoteId}/pdf`,
} as const;
