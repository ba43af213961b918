import { jobKeysBase } from '@/lib/job-keys';

/** Approval requests and the pre-authorised limit hang under their job, so a job refresh reaches them. */
export const approvalKeys = {
  requests: (jobId: string) => [...jobKeysBase.detail(jobId), 'approval-requests'] as const,
  preAuthorisation: (jobId: string) => [...jobKeysBase.detail(jobId), 'pre-authorisation'] as const,
};
