import { JOB_TYPE_LABELS, type JobDto, type Page } from '@wingstage/shared';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { ListTable } from '@/components/ui/data-table';
import { DecisionsFlag } from '@/components/ui/decisions-flag';
import { StateBadge } from '@/components/ui/state-badge';
import { formatDate } from '@/lib/format';
import type { ListParams } from '@/lib/list-params';

const col = createColumnHelper<JobDto>();
const columns = [
  col.accessor('number', {
    header: 'Job',
    meta: { primary: true, sortWords: ['lowest number first', 'highest number first'] },
    cell: (c) => (
      <Link to={`/jobs/${c.row.original.id}`} className="font-semibold">
        <span className="tabular-nums">{c.getValue()}</span> · {c.row.original.registration}
      </Link>
    ),
  }),
  col.accessor('title', {
    header: 'Work',
    enableSorting: false,
    cell: (c) => (
      <span>
        {c.getValue()}
        {c.getValue() !== JOB_TYPE_LABELS[c.row.original.type] ? <span className="block text-xs text-slate-soft">{JOB_TYPE_LABELS[c.row.original.type]}</span> : null}
      </span>
    ),
  }),
  col.accessor('customerName', { header: 'Owner', enableSorting: false }),
  col.accessor('state', {
    header: 'State',
    cell: (c) => (
      <span className="flex flex-col items-start gap-1">
        <StateBadge state={c.getValue()} />
        <DecisionsFlag toSee={c.row.original.decisionsToSee} />
      </span>
    ),
  }),
  col.accessor('bookedInOn', { header: 'Booked in', meta: { sortWords: ['oldest first', 'newest first'] }, cell: (c) => <span className="tabular-nums">{formatDate(c.getValue())}</span> }),
];

export function JobsTable({ page, params, onChange, busy }: { page: Page<JobDto>; params: ListParams; onChange: (p: Record<string, string | number | undefined>) => void; busy?: boolean }) {
  return (
    <ListTable
      caption="Jobs"
      columns={columns}
      page={page}
      params={params}
      onChange={onChange}
      busy={busy}
      empty={params.q || params.state ? 'No jobs match these filters.' : 'No jobs yet.'}
    />
  );
}
