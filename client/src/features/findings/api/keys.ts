import { jobKeysBase } from '@/lib/job-keys';

/** Checklist, findings and time hang under their job's key. */
export const jobWorkKeys = {
  checklist: (jobId: string) => [...jobKeysBase.detail(jobId), 'checklist'] as const,
  findings: (jobId: string) => [...jobKeysBase.detail(jobId), 'findings'] as const,
  time: (jobId: string) => [...jobKeysBase.detail(jobId), 'time'] as const,
};
