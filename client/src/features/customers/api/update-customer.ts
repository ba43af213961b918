import type { CustomerDto, CustomerUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { customerKeys } from './keys';

export const updateCustomer = (id: string, body: CustomerUpdateInput) => api.patch<CustomerDto>(`/customers/${id}`, body);

export function useUpdateCustomer(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CustomerUpdateInput) => updateCustomer(id, body),
    onSuccess: (c) => {
      qc.setQueryData(customerKeys.detail(c.id), c);
      return qc.invalidateQueries({ queryKey: customerKeys.lists() });
    },
  });
}
