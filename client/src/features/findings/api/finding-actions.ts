import type { FindingActionInput, FindingDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';

/**
 * Withdrawing a finding removes its discovered-work lines; recording it rectified may clear the
 * release block. Both change the estimate, the findings and the history: refresh the whole job.
 */
function useFindingAction(jobId: string, action: 'withdraw' | 'rectified') {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { findingId: string; body: FindingActionInput }) => api.post<FindingDto>(`/jobs/${jobId}/findings/${v.findingId}/${action}`, v.body),
    onSettled: () => qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId) }),
  });
}

export const useWithdrawFinding = (jobId: string) => useFindingAction(jobId, 'withdraw');
export const useMarkRectified = (jobId: string) => useFindingAction(jobId, 'rectified');
