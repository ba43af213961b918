import type { WorkshopDto } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { workshopKeys } from './keys';

export const getWorkshop = (signal?: AbortSignal) => api.get<WorkshopDto>('/workshop', undefined, signal);

export const workshopQueryOptions = () => queryOptions({ queryKey: workshopKeys.current(), queryFn: ({ signal }) => getWorkshop(signal) });

export function useWorkshop() {
  return useQuery(workshopQueryOptions());
}
