import type { ApprovalRequestCreateInput, ApprovalRequestDto, SendForApprovalResultDto } from '@wingstage/shared';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';
import { approvalKeys } from './keys';

export const approvalRequestsQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: approvalKeys.requests(jobId),
    queryFn: ({ signal }) => api.get<ApprovalRequestDto[]>(`/jobs/${jobId}/approval-requests`, undefined, signal),
  });

/**
 * Sending moves findings (priced → sent or approved within limit), their lines, the job's state and
 * the history: the whole job is refreshed afterwards.
 */
export function useSendForApproval(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ApprovalRequestCreateInput) => api.post<SendForApprovalResultDto>(`/jobs/${jobId}/approval-requests`, body),
    onSettled: () => qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId) }),
  });
}

/** Revoke puts the findings back to priced; resend issues a new link. Both touch the history. */
export function useRequestAction(jobId: string, action: 'revoke' | 'resend') {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (requestId: string) => api.post<ApprovalRequestDto>(`/approval-requests/${requestId}/${action}`),
    onSettled: () => qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId) }),
  });
}
