import type { EstimateDto, EstimateSaveInput } from '@wingstage/shared';
import { apiRequest } from '@/lib/api-client';

export const saveEstimate = (jobId: string, body: EstimateSaveInput) => apiRequest<EstimateDto>(`/jobs/${jobId}/estimate`, { method: 'PUT', body });
