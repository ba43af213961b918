import type { WorkshopDto, WorkshopUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { workshopKeys } from './keys';

export const updateWorkshop = (body: WorkshopUpdateInput) => api.patch<WorkshopDto>('/workshop', body);

export function useUpdateWorkshop() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: updateWorkshop,
    onSuccess: (w) => qc.setQueryData(workshopKeys.current(), w),
    onError: (e) => {
      if (isApiError(e) && e.code === 'stale_version') return qc.invalidateQueries({ queryKey: workshopKeys.all });
    },
  });
}
