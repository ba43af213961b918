import type { AuditEventDto } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeys } from './keys';

export const getJobHistory = (id: string, signal?: AbortSignal) => api.get<AuditEventDto[]>(`/jobs/${id}/history`, undefined, signal);

export const jobHistoryQueryOptions = (id: string) =>
  queryOptions({ queryKey: jobKeys.history(id), queryFn: ({ signal }) => getJobHistory(id, signal) });

export function useJobHistory(id: string) {
  return useQuery(jobHistoryQueryOptions(id));
}
