import type { PreAuthorisationDto, PreAuthorisationInput } from '@wingstage/shared';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest, api } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';
import { approvalKeys } from './keys';

export const preAuthorisationQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: approvalKeys.preAuthorisation(jobId),
    queryFn: ({ signal }) => api.get<PreAuthorisationDto>(`/jobs/${jobId}/pre-authorisation`, undefined, signal),
  });

/** The limit is guarded by the job's version, so the job (and its history) are refreshed after a save. */
export function useSavePreAuthorisation(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: PreAuthorisationInput) => apiRequest<PreAuthorisationDto>(`/jobs/${jobId}/pre-authorisation`, { method: 'PUT', body }),
    onSettled: () => qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId) }),
  });
}
