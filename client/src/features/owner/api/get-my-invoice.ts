import type { InvoiceDto } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { ownerKeys } from './keys';

/** The invoice of one of the owner's own jobs, null before one is issued. */
export const myJobInvoiceQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: [...ownerKeys.all, 'jobs', jobId, 'invoice'] as const,
    queryFn: async ({ signal }) => (await api.get<{ invoice: InvoiceDto | null }>(`/jobs/${jobId}/invoice`, undefined, signal)).invoice,
  });

/** The card payment page for what is left to pay on the invoice. */
export const openBalanceCheckout = (jobId: string) => api.post<{ url: string }>(`/jobs/${jobId}/payments/checkout`, { for: 'balance' });
