import type { AircraftDto } from '@wingstage/shared';
import { PICKER_PAGE_SIZE, type PickerSource } from '@/components/ui/search-picker';
import { aircraftListQueryOptions } from './get-aircraft-list';
import { aircraftQueryOptions } from './get-aircraft';

export const aircraftLabel = (a: Pick<AircraftDto, 'registration' | 'customerName'>) => `${a.registration} — ${a.customerName}`;

/** The aircraft picker searches registration, type and owner's name on the server, a small page at a time. */
export const aircraftPickerSource: PickerSource<AircraftDto> = {
  search: (q) => aircraftListQueryOptions({ q: q || undefined, pageSize: PICKER_PAGE_SIZE, sort: 'registration', dir: 'asc' }),
  byId: (id) => aircraftQueryOptions(id),
  id: (a) => a.id,
  label: aircraftLabel,
  detail: (a) => a.type,
};
