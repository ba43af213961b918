import type { FindingDto, JobChecklistItemDto, TimeLogDto } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobWorkKeys } from './keys';

export const checklistQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: jobWorkKeys.checklist(jobId), queryFn: ({ signal }) => api.get<JobChecklistItemDto[]>(`/jobs/${jobId}/checklist`, undefined, signal) });

export const findingsQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: jobWorkKeys.findings(jobId), queryFn: ({ signal }) => api.get<FindingDto[]>(`/jobs/${jobId}/findings`, undefined, signal) });

export const timeQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: jobWorkKeys.time(jobId), queryFn: ({ signal }) => api.get<TimeLogDto[]>(`/jobs/${jobId}/time`, undefined, signal) });
