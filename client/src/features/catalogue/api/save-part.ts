import type { PartCreateInput, PartDto, PartUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { partKeys } from '@/lib/catalogue-keys';

export const createPart = (body: PartCreateInput) => api.post<PartDto>('/parts', body);
export const updatePart = (id: string, body: PartUpdateInput) => api.patch<PartDto>(`/parts/${id}`, body);

export function useSavePart() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { id: string; body: PartUpdateInput } | { id: null; body: PartCreateInput }) =>
      v.id === null ? createPart(v.body) : updatePart(v.id, v.body),
    onSuccess: () => qc.invalidateQueries({ queryKey: partKeys.all }),
    onError: (e) => {
      if (isApiError(e) && e.code === 'stale_version') return qc.invalidateQueries({ queryKey: partKeys.all });
    },
  });
}
