import type { AircraftDto, Page } from '@wingstage/shared';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { ListTable } from '@/components/ui/data-table';
import { formatHours } from '@/lib/format';
import type { ListParams } from '@/lib/list-params';

const col = createColumnHelper<AircraftDto>();
const columns = [
  col.accessor('registration', {
    header: 'Registration',
    meta: { primary: true },
    cell: (c) => (
      <Link to={`/aircraft/${c.row.original.id}`} className="font-semibold tracking-wide">
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('type', { header: 'Type' }),
  col.accessor('customerName', { header: 'Owner' }),
  col.accessor('airframeHours', { header: 'Airframe hours', enableSorting: false, meta: { numeric: true }, cell: (c) => formatHours(c.getValue()) }),
  col.accessor('openJobCount', { header: 'Open jobs', enableSorting: false, meta: { numeric: true } }),
];

export function AircraftTable({ page, params, onChange, busy }: { page: Page<AircraftDto>; params: ListParams; onChange: (p: Record<string, string | number | undefined>) => void; busy?: boolean }) {
  return (
    <ListTable
      caption="Aircraft"
      columns={columns}
      page={page}
      params={params}
      onChange={onChange}
      busy={busy}
      empty={params.q ? `No aircraft match “${params.q}”.` : 'No aircraft yet.'}
    />
  );
}
