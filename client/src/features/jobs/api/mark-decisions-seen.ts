import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeys } from './keys';

/** Clears the job's "decisions not yet seen" flag for the workshop. */
export const markDecisionsSeen = (jobId: string) => api.post<unknown>(`/jobs/${jobId}/decisions-seen`, {});

export function useMarkDecisionsSeen(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => markDecisionsSeen(jobId),
    // The flag shows on the job and in the jobs list: both are read again.
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: jobKeys.detail(jobId) }), qc.invalidateQueries({ queryKey: jobKeys.lists() })]),
  });
}
