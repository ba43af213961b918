import type { JobDto } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeys } from './keys';

export const getJob = (id: string, signal?: AbortSignal) => api.get<JobDto>(`/jobs/${id}`, undefined, signal);

export const jobQueryOptions = (id: string) => queryOptions({ queryKey: jobKeys.detail(id), queryFn: ({ signal }) => getJob(id, signal) });

export function useJob(id: string) {
  return useQuery(jobQueryOptions(id));
}
