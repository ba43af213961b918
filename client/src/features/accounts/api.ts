import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccountExceptionDto, AgedDebtDto, LedgerPageDto, PayoutDetailDto, PayoutDto, VatSummaryDto, WeeklyMoneyDto } from '@wingstage/shared';
import { api, buildUrl } from '@/lib/api-client';

export type LedgerParams = { from?: string; to?: string; kind?: string; q?: string; sort?: string; dir?: 'asc' | 'desc'; page?: number; pageSize?: number };

const clean = <T extends object>(p: T) => Object.fromEntries(Object.entries(p).filter(([, v]) => v !== undefined && v !== '')) as Record<string, string | number>;

export const accountKeys = {
  all: ['accounts'] as const,
  ledger: (p: LedgerParams) => ['accounts', 'ledger', clean(p)] as const,
  payouts: () => ['accounts', 'payouts'] as const,
  payout: (id: string) => ['accounts', 'payouts', id] as const,
  exceptions: (state: string) => ['accounts', 'exceptions', state] as const,
  agedDebt: (page = 1) => ['accounts', 'aged-debt', page] as const,
  vat: (from: string, to: string) => ['accounts', 'vat', from, to] as const,
  weekly: () => ['accounts', 'weekly'] as const,
};

export const ledgerQuery = (p: LedgerParams) =>
  queryOptions({ queryKey: accountKeys.ledger(p), queryFn: ({ signal }) => api.get<LedgerPageDto>('/accounts/ledger', clean(p), signal), placeholderData: keepPreviousData });
export const payoutsQuery = () => queryOptions({ queryKey: accountKeys.payouts(), queryFn: ({ signal }) => api.get<PayoutDto[]>('/accounts/payouts', undefined, signal) });
export const payoutQuery = (id: string) => queryOptions({ queryKey: accountKeys.payout(id), queryFn: ({ signal }) => api.get<PayoutDetailDto>(`/accounts/payouts/${id}`, undefined, signal) });
export const exceptionsQuery = (state: 'open' | 'resolved' | 'all') =>
  queryOptions({ queryKey: accountKeys.exceptions(state), queryFn: ({ signal }) => api.get<AccountExceptionDto[]>('/accounts/exceptions', { state }, signal) });
/** One page of owners (50 a page); the totals cover every owner. */
export const agedDebtQuery = (page = 1) =>
  queryOptions({ queryKey: accountKeys.agedDebt(page), queryFn: ({ signal }) => api.get<AgedDebtDto>('/accounts/aged-debt', { page, pageSize: AGED_DEBT_PAGE_SIZE }, signal), placeholderData: keepPreviousData });
export const AGED_DEBT_PAGE_SIZE = 50;
export const vatQuery = (from: string, to: string) =>
  queryOptions({ queryKey: accountKeys.vat(from, to), queryFn: ({ signal }) => api.get<VatSummaryDto>('/accounts/vat-summary', { from, to }, signal), retry: false });
export const weeklyQuery = () => queryOptions({ queryKey: accountKeys.weekly(), queryFn: ({ signal }) => api.get<WeeklyMoneyDto>('/accounts/weekly', undefined, signal) });

/** The address of a CSV export with the same filters as the page. */
export const csvUrl = (path: string, p: object) => buildUrl(path, clean(p));

export function useFetchPayouts() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<{ fetched: number; stored: number }>('/accounts/payouts/fetch'),
    onSuccess: () => qc.invalidateQueries({ queryKey: accountKeys.all }),
  });
}

export function useResolveException() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, note }: { id: string; note: string }) => api.post<AccountExceptionDto>(`/accounts/exceptions/${id}/resolve`, { note }),
    onSuccess: () => qc.invalidateQueries({ queryKey: accountKeys.all }),
  });
}

export function useSendReminder() {
  return useMutation({ mutationFn: (customerId: string) => api.post<{ sentTo: string; invoices: number }>('/accounts/aged-debt/reminders', { customerId }) });
}
