import type { JobDto, JobTransitionInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { jobKeys } from './keys';

export const transitionJob = (id: string, body: JobTransitionInput) => api.post<JobDto>(`/jobs/${id}/transition`, body);

export function useTransitionJob(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: JobTransitionInput) => transitionJob(id, body),
    onSuccess: (j) => {
      qc.setQueryData(jobKeys.detail(j.id), j);
      return Promise.all([qc.invalidateQueries({ queryKey: jobKeys.lists() }), qc.invalidateQueries({ queryKey: jobKeys.history(id) })]);
    },
    onError: (e) => {
      if (isApiError(e) && (e.code === 'stale_version' || e.code === 'invalid_transition')) {
        return qc.invalidateQueries({ queryKey: jobKeys.detail(id) });
      }
    },
  });
}
