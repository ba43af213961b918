import type { EstimateDto } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { estimateKeys } from './keys';

export const getEstimate = (jobId: string, signal?: AbortSignal) => api.get<EstimateDto>(`/jobs/${jobId}/estimate`, undefined, signal);

export const estimateQueryOptions = (jobId: string) => queryOptions({ queryKey: estimateKeys.detail(jobId), queryFn: ({ signal }) => getEstimate(jobId, signal) });
