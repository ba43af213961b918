import { createQueryKeys } from '@/lib/query-keys';

const base = createQueryKeys('jobs');
export const jobKeys = {
  ...base,
  history: (id: string) => [...base.detail(id), 'history'] as const,
};
