import type { CustomerDto, Page } from '@wingstage/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { customerKeys } from './keys';

export const getCustomers = (params: Partial<ListParams>, signal?: AbortSignal) => api.get<Page<CustomerDto>>('/customers', params, signal);

export const customersQueryOptions = (params: Partial<ListParams>) =>
  queryOptions({ queryKey: customerKeys.list(params), queryFn: ({ signal }) => getCustomers(params, signal), placeholderData: keepPreviousData });

export function useCustomers(params: Partial<ListParams>) {
  return useQuery(customersQueryOptions(params));
}
