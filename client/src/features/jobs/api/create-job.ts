import type { JobCreate, JobDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeys } from './keys';

export const createJob = (body: JobCreate) => api.post<JobDto>('/jobs', body);

export function useCreateJob() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createJob,
    onSuccess: (j) => {
      qc.setQueryData(jobKeys.detail(j.id), j);
      return qc.invalidateQueries({ queryKey: jobKeys.lists() });
    },
  });
}
