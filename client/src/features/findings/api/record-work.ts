import type { ChecklistRecordInput, FindingCreateInput, FindingDto, JobChecklistItemDto, TimeLogCreateInput, TimeLogDto, TimeLogRemoveInput, TimeLogUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';
import { jobWorkKeys } from './keys';

export function useRecordChecklist(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { itemId: string; body: ChecklistRecordInput }) => api.patch<JobChecklistItemDto>(`/jobs/${jobId}/checklist/${v.itemId}`, v.body),
    onSuccess: (item) => {
      qc.setQueryData<JobChecklistItemDto[]>(jobWorkKeys.checklist(jobId), (old) => old?.map((i) => (i.id === item.id ? item : i)));
    },
    onError: (e) => {
      if (isApiError(e) && e.code === 'stale_version') return qc.invalidateQueries({ queryKey: jobWorkKeys.checklist(jobId) });
    },
  });
}

export function useRaiseFinding(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: FindingCreateInput) => api.post<FindingDto>(`/jobs/${jobId}/findings`, body),
    // The checklist item now names its finding, and the job's history has a new entry.
    onSuccess: () => qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId), predicate: (q) => q.queryKey[3] !== 'estimate' }),
  });
}

export function useLogTime(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: TimeLogCreateInput) => api.post<TimeLogDto>(`/jobs/${jobId}/time`, body),
    onSuccess: () => qc.invalidateQueries({ queryKey: jobWorkKeys.time(jobId) }),
  });
}

/** Correcting or removing a time entry; the list (and the job's history) are read again after. */
export function useChangeTime(jobId: string) {
  const qc = useQueryClient();
  const settle = () => qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId), predicate: (q) => q.queryKey[3] !== 'estimate' });
  const update = useMutation({
    mutationFn: (v: { timeId: string; body: TimeLogUpdateInput }) => api.patch<TimeLogDto>(`/jobs/${jobId}/time/${v.timeId}`, v.body),
    onSettled: settle,
  });
  const remove = useMutation({
    mutationFn: (v: { timeId: string; body: TimeLogRemoveInput }) => api.delete(`/jobs/${jobId}/time/${v.timeId}`, v.body),
    onSettled: settle,
  });
  return { update, remove };
}
