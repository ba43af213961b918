import type { CreditNoteDto, CreditNoteInput, InvoiceDto, InvoiceIssueInput, InvoicePreviewDto, OfflinePaymentInput, RefundInput } from '@wingstage/shared';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';

export const invoiceKeys = {
  all: ['invoices'] as const,
  ofJob: (jobId: string) => ['invoices', 'job', jobId] as const,
  preview: (jobId: string) => ['invoices', 'preview', jobId] as const,
};

export const jobInvoiceQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: invoiceKeys.ofJob(jobId),
    queryFn: async ({ signal }) => (await api.get<{ invoice: InvoiceDto | null }>(`/jobs/${jobId}/invoice`, undefined, signal)).invoice,
  });

export const invoicePreviewQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: invoiceKeys.preview(jobId), queryFn: ({ signal }) => api.get<InvoicePreviewDto>(`/jobs/${jobId}/invoice/preview`, undefined, signal), staleTime: 0 });

/** After any money move the job's invoice, the job (its state) and its history are read again. */
function useRefresh(jobId: string) {
  const qc = useQueryClient();
  return () =>
    Promise.all([
      qc.invalidateQueries({ queryKey: invoiceKeys.ofJob(jobId) }),
      // The job's detail key is the prefix of its history and estimate: all are read again.
      qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId) }),
      qc.invalidateQueries({ queryKey: jobKeysBase.lists() }),
    ]);
}

export function useIssueInvoice(jobId: string) {
  const refresh = useRefresh(jobId);
  return useMutation({ mutationFn: (body: InvoiceIssueInput) => api.post<InvoiceDto>(`/jobs/${jobId}/invoice`, body), onSuccess: refresh });
}

export function useRecordPayment(jobId: string) {
  const refresh = useRefresh(jobId);
  return useMutation({ mutationFn: (body: OfflinePaymentInput) => api.post<{ paymentId: string; invoice: InvoiceDto }>(`/jobs/${jobId}/payments/offline`, body), onSuccess: refresh });
}

export function useRefund(jobId: string, invoiceId: string) {
  const refresh = useRefresh(jobId);
  return useMutation({ mutationFn: (body: RefundInput) => api.post<CreditNoteDto>(`/invoices/${invoiceId}/refunds`, body), onSuccess: refresh });
}

export function useCreditNote(jobId: string, invoiceId: string) {
  const refresh = useRefresh(jobId);
  return useMutation({ mutationFn: (body: CreditNoteInput) => api.post<CreditNoteDto>(`/invoices/${invoiceId}/credit-notes`, body), onSuccess: refresh });
}

/** "Resend": an invoice or credit note whose e-mail was given up is queued to the owner afresh. */
export function useResendDocument(jobId: string) {
  const refresh = useRefresh(jobId);
  return useMutation({
    mutationFn: (doc: { kind: 'invoice' | 'credit_note'; id: string }) => api.post<{ queued: true }>(`/${doc.kind === 'invoice' ? 'invoices' : 'credit-notes'}/${doc.id}/resend`, {}),
    onSuccess: refresh,
  });
}
