import type { SupplierCreateInput, SupplierDto, SupplierUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { supplierKeys } from '@/lib/catalogue-keys';

export const createSupplier = (body: SupplierCreateInput) => api.post<SupplierDto>('/suppliers', body);
export const updateSupplier = (id: string, body: SupplierUpdateInput) => api.patch<SupplierDto>(`/suppliers/${id}`, body);

export function useSaveSupplier() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { id: string; body: SupplierUpdateInput } | { id: null; body: SupplierCreateInput }) =>
      v.id === null ? createSupplier(v.body) : updateSupplier(v.id, v.body),
    onSuccess: () => qc.invalidateQueries({ queryKey: supplierKeys.all }),
    onError: (e) => {
      if (isApiError(e) && e.code === 'stale_version') return qc.invalidateQueries({ queryKey: supplierKeys.all });
    },
  });
}
