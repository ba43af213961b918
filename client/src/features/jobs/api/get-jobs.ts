import type { JobDto, JobState, Page } from '@wingstage/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { jobKeys } from './keys';

export type JobListParams = Partial<ListParams> & { state?: JobState; aircraftId?: string };

export const getJobs = (params: JobListParams, signal?: AbortSignal) => api.get<Page<JobDto>>('/jobs', params, signal);

export const jobsQueryOptions = (params: JobListParams) =>
  queryOptions({ queryKey: jobKeys.list(params), queryFn: ({ signal }) => getJobs(params, signal), placeholderData: keepPreviousData });

export function useJobs(params: JobListParams) {
  return useQuery(jobsQueryOptions(params));
}
