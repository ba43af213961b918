import type { JobDto, Page } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { ownerKeys } from './keys';

export const getMyJobs = (signal?: AbortSignal) =>
  api.get<Page<JobDto>>('/jobs', { pageSize: 100, sort: 'bookedInOn', dir: 'desc' }, signal);

export const myJobsQueryOptions = () => queryOptions({ queryKey: ownerKeys.jobs(), queryFn: ({ signal }) => getMyJobs(signal) });

export function useMyJobs() {
  return useQuery(myJobsQueryOptions());
}
