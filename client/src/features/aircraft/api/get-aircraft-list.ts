import type { AircraftDto, Page } from '@wingstage/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { aircraftKeys } from './keys';

export type AircraftListParams = Partial<ListParams> & { customerId?: string };

export const getAircraftList = (params: AircraftListParams, signal?: AbortSignal) => api.get<Page<AircraftDto>>('/aircraft', params, signal);

export const aircraftListQueryOptions = (params: AircraftListParams) =>
  queryOptions({ queryKey: aircraftKeys.list(params), queryFn: ({ signal }) => getAircraftList(params, signal), placeholderData: keepPreviousData });

export function useAircraftList(params: AircraftListParams) {
  return useQuery(aircraftListQueryOptions(params));
}
