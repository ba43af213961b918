import { SUPPLIER_KIND_LABELS, type Page, type SupplierDto } from '@wingstage/shared';
import { createColumnHelper } from '@tanstack/react-table';
import { EditableName, ListTable } from '@/components/ui/data-table';
import type { ListParams } from '@/lib/list-params';

const col = createColumnHelper<SupplierDto>();

export function SuppliersTable({
  page,
  params,
  onChange,
  onEdit,
  busy,
}: {
  page: Page<SupplierDto>;
  params: ListParams;
  onChange: (p: Record<string, string | number | undefined>) => void;
  onEdit?: (s: SupplierDto) => void;
  busy?: boolean;
}) {
  const columns = [
    col.accessor('name', {
      header: 'Name',
      meta: { primary: true },
      cell: (c) => <EditableName name={c.getValue()} onEdit={onEdit ? () => onEdit(c.row.original) : undefined} />,
    }),
    col.accessor('kind', { header: 'What they do', cell: (c) => SUPPLIER_KIND_LABELS[c.getValue()] }),
    col.accessor('email', { header: 'E-mail', enableSorting: false, cell: (c) => c.getValue() || '—' }),
    col.accessor('phone', { header: 'Phone', enableSorting: false, cell: (c) => c.getValue() || '—' }),
    col.accessor('active', { header: 'In use', enableSorting: false, cell: (c) => (c.getValue() ? 'Yes' : 'No (hidden from new lines)') }),
  ];
  return (
    <ListTable
      caption="Suppliers"
      columns={columns}
      page={page}
      params={params}
      onChange={onChange}
      busy={busy}
      empty={params.q ? 'No suppliers match this search.' : 'No suppliers yet.'}
    />
  );
}
