import type { CustomerCreate, CustomerDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { customerKeys } from './keys';

export const createCustomer = (body: CustomerCreate) => api.post<CustomerDto>('/customers', body);

export function useCreateCustomer() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createCustomer,
    onSuccess: (c) => {
      qc.setQueryData(customerKeys.detail(c.id), c);
      return qc.invalidateQueries({ queryKey: customerKeys.lists() });
    },
  });
}
