import { CUSTOMER_KIND_LABELS, type CustomerDto, type Page } from '@wingstage/shared';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { ListTable } from '@/components/ui/data-table';
import type { ListParams } from '@/lib/list-params';

const col = createColumnHelper<CustomerDto>();
const columns = [
  col.accessor('name', {
    header: 'Name',
    meta: { primary: true },
    cell: (c) => <Link to={`/owners/${c.row.original.id}`}>{c.getValue()}</Link>,
  }),
  col.accessor('kind', { header: 'Kind', enableSorting: false, cell: (c) => CUSTOMER_KIND_LABELS[c.getValue()] }),
  col.accessor('email', { header: 'E-mail', cell: (c) => <span className="break-all">{c.getValue()}</span> }),
  col.accessor('aircraftCount', { header: 'Aircraft', enableSorting: false, meta: { numeric: true } }),
  col.accessor('hasSignIn', { header: 'Wingstage sign-in', enableSorting: false, cell: (c) => (c.getValue() ? 'Yes' : 'Not yet') }),
];

export function CustomersTable({ page, params, onChange, busy }: { page: Page<CustomerDto>; params: ListParams; onChange: (p: Record<string, string | number | undefined>) => void; busy?: boolean }) {
  return (
    <ListTable
      caption="Owners"
      columns={columns}
      page={page}
      params={params}
      onChange={onChange}
      busy={busy}
      empty={params.q ? `No owners match “${params.q}”.` : 'No owners yet.'}
    />
  );
}
