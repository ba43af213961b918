import { jobKeysBase } from '@/lib/job-keys';

/** The estimate hangs under its job's key, so invalidating a job's detail refreshes its estimate too. */
export const estimateKeys = {
  detail: (jobId: string) => [...jobKeysBase.detail(jobId), 'estimate'] as const,
};
