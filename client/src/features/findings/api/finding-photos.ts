import type { FindingPhotoDto } from '@wingstage/shared';
import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';

/** A photo changes the finding's card and writes a history entry; prices are untouched. */
function refreshAfterPhotos(qc: QueryClient, jobId: string) {
  return qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId), predicate: (q) => q.queryKey[3] === 'findings' || q.queryKey[3] === 'history' });
}

export const uploadFindingPhotos = (jobId: string, findingId: string, files: readonly File[]) =>
  api.upload<FindingPhotoDto[]>(`/jobs/${jobId}/findings/${findingId}/photos`, files, 'photos');

export function useUploadFindingPhotos(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { findingId: string; files: readonly File[] }) => uploadFindingPhotos(jobId, v.findingId, v.files),
    onSettled: () => refreshAfterPhotos(qc, jobId),
  });
}

export function useRemoveFindingPhoto(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { findingId: string; photoId: string }) => api.delete(`/jobs/${jobId}/findings/${v.findingId}/photos/${v.photoId}`),
    onSettled: () => refreshAfterPhotos(qc, jobId),
  });
}
