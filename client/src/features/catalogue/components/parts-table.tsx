import type { Page, PartDto } from '@wingstage/shared';
import { createColumnHelper } from '@tanstack/react-table';
import { EditableName, ListTable } from '@/components/ui/data-table';
import { formatMoney } from '@/lib/format';
import type { ListParams } from '@/lib/list-params';
import { VAT_RATE_LABELS } from '@/lib/pricing-preview';

const col = createColumnHelper<PartDto>();

export function PartsTable({
  page,
  params,
  currency,
  onChange,
  onEdit,
  busy,
}: {
  page: Page<PartDto>;
  params: ListParams;
  currency: string;
  onChange: (p: Record<string, string | number | undefined>) => void;
  onEdit?: (p: PartDto) => void;
  busy?: boolean;
}) {
  const columns = [
    col.accessor('partNumber', {
      header: 'Part number',
      meta: { primary: true },
      cell: (c) => <EditableName name={c.getValue()} onEdit={onEdit ? () => onEdit(c.row.original) : undefined} />,
    }),
    col.accessor('description', {
      header: 'Description',
      cell: (c) => (
        <span>
          {c.getValue()}
          {!c.row.original.active ? <span className="ml-2 rounded-full border border-dashed border-slate-soft px-2 text-xs">no longer stocked</span> : null}
        </span>
      ),
    }),
    col.accessor('unitCost', { header: 'Cost', meta: { numeric: true, sortWords: ['lowest first', 'highest first'] }, cell: (c) => formatMoney(c.getValue(), currency, { exact: true }) }),
    col.accessor('sellPrice', {
      header: 'Sell price excl. VAT',
      enableSorting: false,
      meta: { numeric: true },
      cell: (c) => (
        <span>
          {formatMoney(c.getValue(), currency)}
          <span className="block text-xs text-slate-soft">
            {c.row.original.unitPrice ? 'fixed' : c.row.original.markupPercent ? `+${c.row.original.markupPercent}%` : 'workshop mark-up'}
          </span>
        </span>
      ),
    }),
    col.accessor('vatRate', { header: 'VAT', enableSorting: false, cell: (c) => VAT_RATE_LABELS[c.getValue()] }),
    col.accessor('supplierName', { header: 'Supplier', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
    col.accessor('leadTimeDays', {
      header: 'Lead time',
      meta: { numeric: true, sortWords: ['shortest first', 'longest first'] },
      cell: (c) => (c.getValue() === 0 ? 'in stock' : `${c.getValue()} ${c.getValue() === 1 ? 'day' : 'days'}`),
    }),
  ];
  return (
    <ListTable
      caption="Parts"
      columns={columns}
      page={page}
      params={params}
      onChange={onChange}
      busy={busy}
      empty={params.q ? 'No parts match this search.' : 'No parts in the catalogue yet.'}
    />
  );
}
