import type { CheckoutCreateInput, CheckoutSyncDto, DepositAccountsDto, DepositRequestCancelInput, DepositRequestCreateInput, DepositRequestDto, DepositWaitingRow, Page } from '@wingstage/shared';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const paymentKeys = {
  all: ['payments'] as const,
  jobDeposits: (jobId: string) => ['payments', 'job-deposits', jobId] as const,
  waiting: (page: number) => ['payments', 'waiting', page] as const,
  accounts: (receivedPage = 1, waitingPage = 1) => ['payments', 'accounts', receivedPage, waitingPage] as const,
  sync: (jobId: string, sessionId: string) => ['payments', 'sync', jobId, sessionId] as const,
};

/** A job's deposits with their payments (owners get theirs without the workshop's fees). */
export const jobDepositsQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: paymentKeys.jobDeposits(jobId), queryFn: ({ signal }) => api.get<DepositRequestDto[]>(`/jobs/${jobId}/deposits`, undefined, signal) });

export const waitingDepositsQueryOptions = (page: number) =>
  queryOptions({ queryKey: paymentKeys.waiting(page), queryFn: ({ signal }) => api.get<Page<DepositWaitingRow>>('/deposits/waiting', { page, pageSize: 25 }, signal) });

/** Accounts' deposits page: one page of each list (received newest first, waiting oldest first). */
export const depositAccountsQueryOptions = (receivedPage = 1, waitingPage = 1) =>
  queryOptions({
    queryKey: paymentKeys.accounts(receivedPage, waitingPage),
    queryFn: ({ signal }) => api.get<DepositAccountsDto>('/deposits/accounts', { receivedPage, waitingPage, pageSize: 50 }, signal),
    placeholderData: keepPreviousData,
  });

/**
 * Back from the payment page: the server reads the session from the card processor and records it.
 * Kept fresh (no cache) so "paid" is only ever what the server said just now.
 */
export const checkoutSyncQueryOptions = (jobId: string, sessionId: string) =>
  queryOptions({
    queryKey: paymentKeys.sync(jobId, sessionId),
    queryFn: () => api.post<CheckoutSyncDto>(`/jobs/${jobId}/payments/sync`, { sessionId }),
    staleTime: 0,
    gcTime: 0,
    retry: false,
  });

export const openCheckout = (jobId: string, body: CheckoutCreateInput) => api.post<{ url: string }>(`/jobs/${jobId}/payments/checkout`, body);
export const createDeposit = (jobId: string, body: DepositRequestCreateInput) => api.post<DepositRequestDto>(`/jobs/${jobId}/deposits`, body);
export const cancelDeposit = (jobId: string, depositId: string, body: DepositRequestCancelInput) => api.post<DepositRequestDto>(`/jobs/${jobId}/deposits/${depositId}/cancel`, body);
