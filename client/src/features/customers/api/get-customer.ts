import type { CustomerDto } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { customerKeys } from './keys';

export const getCustomer = (id: string, signal?: AbortSignal) => api.get<CustomerDto>(`/customers/${id}`, undefined, signal);

export const customerQueryOptions = (id: string) =>
  queryOptions({ queryKey: customerKeys.detail(id), queryFn: ({ signal }) => getCustomer(id, signal) });

export function useCustomer(id: string) {
  return useQuery(customerQueryOptions(id));
}
