import type { AircraftDto, AircraftUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { aircraftKeys } from './keys';

export const updateAircraft = (id: string, body: AircraftUpdateInput) => api.patch<AircraftDto>(`/aircraft/${id}`, body);

export function useUpdateAircraft(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: AircraftUpdateInput) => updateAircraft(id, body),
    onSuccess: (a) => {
      qc.setQueryData(aircraftKeys.detail(a.id), a);
      return qc.invalidateQueries({ queryKey: aircraftKeys.lists() });
    },
  });
}
