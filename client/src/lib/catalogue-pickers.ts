import type { PartDto, SupplierDto } from '@wingstage/shared';
import { PICKER_PAGE_SIZE, type PickerSource } from '@/components/ui/search-picker';
import { partsQueryOptions } from './catalogue-parts';
import { suppliersQueryOptions } from './catalogue-suppliers';

export type SupplierOption = Pick<SupplierDto, 'id' | 'name'> & Partial<Pick<SupplierDto, 'kind' | 'active'>>;

/** Suppliers by name or notes, searched on the server. The list endpoint has no active filter, so retired ones say so. */
export const supplierPickerSource: PickerSource<SupplierOption> = {
  search: (q) => suppliersQueryOptions({ q: q || undefined, pageSize: PICKER_PAGE_SIZE, sort: 'name', dir: 'asc' }),
  id: (s) => s.id,
  label: (s) => s.name,
  detail: (s) => (s.active === false ? 'No longer used' : null),
};

export const partLabel = (p: Pick<PartDto, 'partNumber' | 'description'>) => `${p.partNumber} — ${p.description}`;

/** Active catalogue parts by part number or description, searched on the server. */
export const partPickerSource: PickerSource<PartDto> = {
  search: (q) => partsQueryOptions({ q: q || undefined, active: 'true', pageSize: PICKER_PAGE_SIZE, sort: 'partNumber', dir: 'asc' }),
  id: (p) => p.id,
  label: partLabel,
};
