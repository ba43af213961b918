/** The owner's own view: its own keys so a staff cache and an owner cache never mix. */
export const ownerKeys = {
  all: ['owner'] as const,
  aircraft: () => [...ownerKeys.all, 'aircraft'] as const,
  jobs: () => [...ownerKeys.all, 'jobs'] as const,
  jobEstimate: (jobId: string) => [...ownerKeys.all, 'jobs', jobId, 'estimate'] as const,
  jobRequests: (jobId: string) => [...ownerKeys.all, 'jobs', jobId, 'approval-requests'] as const,
  jobFindings: (jobId: string) => [...ownerKeys.all, 'jobs', jobId, 'findings'] as const,
};
