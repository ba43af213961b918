import type { AircraftCreate, AircraftDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { aircraftKeys } from './keys';

export const createAircraft = (body: AircraftCreate) => api.post<AircraftDto>('/aircraft', body);

export function useCreateAircraft() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createAircraft,
    onSuccess: (a) => {
      qc.setQueryData(aircraftKeys.detail(a.id), a);
      return qc.invalidateQueries({ queryKey: aircraftKeys.lists() });
    },
  });
}
