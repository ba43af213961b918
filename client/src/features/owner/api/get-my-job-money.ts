import type { ApprovalRequestDto, EstimateDto, FindingDto } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { ownerKeys } from './keys';

/** The estimate of one of the owner's own jobs: the server prices it with the engine. */
export const myJobEstimateQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: ownerKeys.jobEstimate(jobId), queryFn: ({ signal }) => api.get<EstimateDto>(`/jobs/${jobId}/estimate`, undefined, signal) });

/** Requests sent to the owner on one of their jobs, newest first. */
export const myJobRequestsQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: ownerKeys.jobRequests(jobId), queryFn: ({ signal }) => api.get<ApprovalRequestDto[]>(`/jobs/${jobId}/approval-requests`, undefined, signal) });

/** What was found on one of the owner's jobs (the server leaves out drafts the workshop has not priced). */
export const myJobFindingsQueryOptions = (jobId: string) =>
  queryOptions({ queryKey: ownerKeys.jobFindings(jobId), queryFn: ({ signal }) => api.get<FindingDto[]>(`/jobs/${jobId}/findings`, undefined, signal) });
