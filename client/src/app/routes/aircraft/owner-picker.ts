import type { CustomerDto } from '@wingstage/shared';
import { PICKER_PAGE_SIZE, type PickerSource } from '@/components/ui/search-picker';
import { customerQueryOptions } from '@/features/customers/api/get-customer';
import { customersQueryOptions } from '@/features/customers/api/get-customers';

/** The aircraft form's owner picker: searches owners' names, e-mail and phone on the server. */
export const ownerPickerSource: PickerSource<CustomerDto> = {
  search: (q) => customersQueryOptions({ q: q || undefined, pageSize: PICKER_PAGE_SIZE, sort: 'name', dir: 'asc' }),
  byId: (id) => customerQueryOptions(id),
  id: (c) => c.id,
  label: (c) => c.name,
  detail: (c) => c.email || c.phone || null,
};
