import type { AircraftDto, Page } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { ownerKeys } from './keys';

// The server limits an owner to their own aircraft; 100 is the list maximum and far above any owner's fleet.
export const getMyAircraft = (signal?: AbortSignal) =>
  api.get<Page<AircraftDto>>('/aircraft', { pageSize: 100, sort: 'registration', dir: 'asc' }, signal);

export const myAircraftQueryOptions = () => queryOptions({ queryKey: ownerKeys.aircraft(), queryFn: ({ signal }) => getMyAircraft(signal) });

export function useMyAircraft() {
  return useQuery(myAircraftQueryOptions());
}
