import type { FindingPhotoDto } from '@wingstage/shared';
import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { api, uploadWithProgress } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';

/** A photo changes the finding's card and writes a history entry; prices are untouched. */
function refreshAfterPhotos(qc: QueryClient, jobId: string) {
  return qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId), predicate: (q) => q.queryKey[3] === 'findings' || q.queryKey[3] === 'history' });
}

export function uploadFindingPhotos(jobId: string, findingId: string, files: readonly File[], onProgress?: (fraction: number) => void) {
  const path = `/jobs/${jobId}/findings/${findingId}/photos`;
  // Progress needs XMLHttpRequest; without it (or without a listener) the plain fetch path serves.
  return onProgress && typeof XMLHttpRequest !== 'undefined' ? uploadWithProgress<FindingPhotoDto[]>(path, files, onProgress, 'photos') : api.upload<FindingPhotoDto[]>(path, files, 'photos');
}

export function useUploadFindingPhotos(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { findingId: string; files: readonly File[]; onProgress?: (fraction: number) => void }) => uploadFindingPhotos(jobId, v.findingId, v.files, v.onProgress),
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
