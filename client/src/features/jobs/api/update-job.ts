import type { JobDto, JobUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { jobKeys } from './keys';

export const updateJob = (id: string, body: JobUpdateInput) => api.patch<JobDto>(`/jobs/${id}`, body);

export function useUpdateJob(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: JobUpdateInput) => updateJob(id, body),
    onSuccess: (j) => {
      qc.setQueryData(jobKeys.detail(j.id), j);
      return Promise.all([qc.invalidateQueries({ queryKey: jobKeys.lists() }), qc.invalidateQueries({ queryKey: jobKeys.history(id) })]);
    },
    onError: (e) => {
      // Someone else saved first: fetch their version so the next attempt starts from it.
      if (isApiError(e) && e.code === 'stale_version') return qc.invalidateQueries({ queryKey: jobKeys.detail(id) });
    },
  });
}
