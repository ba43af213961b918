import type { AircraftDto } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { aircraftKeys } from './keys';

export const getAircraft = (id: string, signal?: AbortSignal) => api.get<AircraftDto>(`/aircraft/${id}`, undefined, signal);

export const aircraftQueryOptions = (id: string) =>
  queryOptions({ queryKey: aircraftKeys.detail(id), queryFn: ({ signal }) => getAircraft(id, signal) });

export function useAircraft(id: string) {
  return useQuery(aircraftQueryOptions(id));
}
