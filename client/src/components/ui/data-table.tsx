import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type RowData,
  type SortingState,
} from '@tanstack/react-table';
import type { Page } from '@wingstage/shared';
import { useEffect, useId, useState, type ReactNode } from 'react';
import type { ListParams } from '@/lib/list-params';
import { ArrowDownIcon, ArrowUpIcon, LensIcon } from './icons';
import { Button } from './button';

declare module '@tanstack/react-table' {
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Shown as the card's heading on a phone. */
    primary?: boolean;
    /** Right-aligned, tabular figures. */
    numeric?: boolean;
    /** Hidden in the phone card (e.g. a repeat of the heading). */
    hideOnCard?: boolean;
    /** How the two sort directions read in the phone's sort menu; default "A to Z" / "Z to A". */
    sortWords?: [asc: string, desc: string];
    _unused?: [TData, TValue];
  }
}

export interface ServerTableProps<T> {
  caption: string;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- each column's value type differs; TanStack's own column arrays are typed this way
  columns: ColumnDef<T, any>[];
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
  sort?: string;
  dir: 'asc' | 'desc';
  onSort: (sort: string, dir: 'asc' | 'desc') => void;
  onPage: (page: number) => void;
  getRowId: (row: T) => string;
  empty?: ReactNode;
  busy?: boolean;
}

/**
 * A table whose searching, sorting and paging happen on the server. On a desktop it is a real
 * table; below the `md` breakpoint each row becomes a card so nothing scrolls sideways on a phone.
 */
/**
 * A list page's table: one page of records from the server, with its sort and page kept in the
 * list's parameters (the address bar). `onChange` receives the patch to those parameters.
 */
export function ListTable<T extends { id: string }>({
  caption,
  columns,
  page,
  params,
  onChange,
  empty,
  busy,
}: {
  caption: string;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- each column's value type differs; TanStack's own column arrays are typed this way
  columns: ColumnDef<T, any>[];
  page: Page<T>;
  params: Pick<ListParams, 'sort' | 'dir'>;
  onChange: (patch: Record<string, string | number | undefined>) => void;
  empty?: ReactNode;
  busy?: boolean;
}) {
  return (
    <ServerTable
      caption={caption}
      columns={columns}
      rows={page.items}
      total={page.total}
      page={page.page}
      pageSize={page.pageSize}
      sort={params.sort}
      dir={params.dir}
      onSort={(sort, dir) => onChange({ sort, dir })}
      onPage={(p) => onChange({ page: p })}
      getRowId={(r) => r.id}
      empty={empty}
      busy={busy}
    />
  );
}

export function ServerTable<T>({ caption, columns, rows, total, page, pageSize, sort, dir, onSort, onPage, getRowId, empty, busy }: ServerTableProps<T>) {
  const sorting: SortingState = sort ? [{ id: sort, desc: dir === 'desc' }] : [];
  const table = useReactTable({
    data: rows,
    columns,
    getRowId,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    rowCount: total,
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const first = next[0];
      if (first) onSort(first.id, first.desc ? 'desc' : 'asc');
      else if (sort) onSort(sort, dir === 'asc' ? 'desc' : 'asc');
    },
    enableSortingRemoval: false,
    getCoreRowModel: getCoreRowModel(),
  });
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);

  return (
    <div aria-busy={busy || undefined} className={busy ? 'opacity-70' : ''}>
      <table className="hidden w-full border-collapse text-left md:table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id} className="border-b-2 border-seam-strong">
              {hg.headers.map((h) => {
                const can = h.column.getCanSort();
                const s = h.column.getIsSorted();
                const numeric = h.column.columnDef.meta?.numeric;
                const label = flexRender(h.column.columnDef.header, h.getContext());
                return (
                  <th
                    key={h.id}
                    scope="col"
                    aria-sort={s === 'asc' ? 'ascending' : s === 'desc' ? 'descending' : undefined}
                    className={`px-3 py-2 text-sm font-semibold text-slate-soft ${numeric ? 'text-right' : ''}`}
                  >
                    {can ? (
                      <button
                        type="button"
                        onClick={h.column.getToggleSortingHandler()}
                        className="inline-flex min-h-8 items-center gap-1 rounded-control px-1 hover:bg-cloth-sunk"
                      >
                        {label}
                        {s === 'asc' ? <ArrowUpIcon size={14} /> : s === 'desc' ? <ArrowDownIcon size={14} /> : <span className="w-3.5" />}
                        <span className="sr-only">{s ? `, sorted ${s === 'asc' ? 'ascending' : 'descending'}` : ', sortable'}</span>
                      </button>
                    ) : (
                      label
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} className="border-b border-seam hover:bg-cloth-raised">
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className={`px-3 py-2.5 align-top ${cell.column.columnDef.meta?.numeric ? 'text-right tabular-nums' : ''}`}>
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>

      <PhoneSort
        options={table
          .getAllLeafColumns()
          .filter((c) => c.getCanSort())
          .map((c) => ({ id: c.id, label: typeof c.columnDef.header === 'string' ? c.columnDef.header : c.id, words: c.columnDef.meta?.sortWords ?? ['A to Z', 'Z to A'] }))}
        sort={sort}
        dir={dir}
        onSort={onSort}
      />
      <ul className="flex flex-col gap-3 md:hidden" aria-label={caption}>
        {table.getRowModel().rows.map((row) => {
          const cells = row.getVisibleCells();
          const primary = cells.find((c) => c.column.columnDef.meta?.primary);
          return (
            <li key={row.id} className="rounded-card border border-seam bg-cloth-raised p-3">
              {primary ? <div className="mb-2 text-lg font-semibold">{flexRender(primary.column.columnDef.cell, primary.getContext())}</div> : null}
              <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
                {cells
                  .filter((c) => c !== primary && !c.column.columnDef.meta?.hideOnCard)
                  .map((c) => (
                    <div key={c.id} className="contents">
                      <dt className="text-slate-soft">{typeof c.column.columnDef.header === 'string' ? c.column.columnDef.header : c.column.id}</dt>
                      <dd className="tabular-nums">{flexRender(c.column.columnDef.cell, c.getContext())}</dd>
                    </div>
                  ))}
              </dl>
            </li>
          );
        })}
      </ul>

      {rows.length === 0 ? <div className="py-8 text-center text-slate-soft">{empty ?? 'Nothing to show.'}</div> : null}

      <nav aria-label={`${caption}: pages`} className="mt-4 flex flex-wrap items-center justify-between gap-3 text-sm">
        <p className="tabular-nums text-slate-soft">{total === 0 ? 'No rows' : `${from}–${to} of ${total}`}</p>
        <div className="flex items-center gap-2">
          <Button variant="secondary" onClick={() => onPage(page - 1)} disabled={page <= 1}>
            Previous
          </Button>
          <span className="tabular-nums">
            Page {page} of {pages}
          </span>
          <Button variant="secondary" onClick={() => onPage(page + 1)} disabled={page >= pages}>
            Next
          </Button>
        </div>
      </nav>
    </div>
  );
}

/** A search box that waits for a pause in typing before asking the server. */
/**
 * A row's name, as a button that opens the row for editing when the person may edit, else as text.
 * Screen readers hear "(edit)" after the name, so the button says what it does.
 */
export function EditableName({ name, onEdit }: { name: ReactNode; onEdit?: () => void }) {
  return onEdit ? (
    <button type="button" className="min-h-8 text-left font-semibold text-harbour-deep underline underline-offset-2" onClick={onEdit}>
      {name}
      <span className="sr-only"> (edit)</span>
    </button>
  ) : (
    <span className="font-semibold">{name}</span>
  );
}

export function SearchBox({ value, onChange, label }: { value: string; onChange: (q: string) => void; label: string }) {
  const [draft, setDraft] = useState(value);
  const id = useId();
  useEffect(() => setDraft(value), [value]);
  useEffect(() => {
    if (draft === value) return;
    const t = setTimeout(() => onChange(draft.trim()), 300);
    return () => clearTimeout(t);
  }, [draft, value, onChange]);
  return (
    <div className="relative w-full sm:max-w-xs">
      <label htmlFor={id} className="sr-only">
        {label}
      </label>
      <span className="pointer-events-none absolute top-1/2 left-3 -translate-y-1/2 text-slate-soft">
        <LensIcon size={16} />
      </span>
      <input
        id={id}
        type="search"
        value={draft}
        placeholder={label}
        onChange={(e) => setDraft(e.target.value)}
        className="block min-h-10 w-full rounded-control border border-seam-strong bg-cloth-raised py-2 pr-3 pl-9 text-base placeholder:text-slate-soft"
      />
    </div>
  );
}

/** On a phone the column headers are gone, so sorting moves into one drop-down above the cards. */
function PhoneSort({ options, sort, dir, onSort }: { options: { id: string; label: string; words: [string, string] }[]; sort?: string; dir: 'asc' | 'desc'; onSort: (s: string, d: 'asc' | 'desc') => void }) {
  const id = useId();
  if (options.length === 0) return null;
  return (
    <div className="mb-3 flex items-center gap-2 md:hidden">
      <label htmlFor={id} className="text-sm font-semibold">
        Sort by
      </label>
      <select
        id={id}
        value={sort ? `${sort}:${dir}` : ''}
        onChange={(e) => {
          const [s, d] = e.target.value.split(':');
          if (s) onSort(s, d === 'desc' ? 'desc' : 'asc');
        }}
        className="min-h-10 flex-1 rounded-control border border-seam-strong bg-cloth-raised px-2 text-base"
      >
        {sort ? null : <option value="">Default order</option>}
        {options.flatMap((o) => [
          <option key={`${o.id}:asc`} value={`${o.id}:asc`}>
            {o.label}, {o.words[0]}
          </option>,
          <option key={`${o.id}:desc`} value={`${o.id}:desc`}>
            {o.label}, {o.words[1]}
          </option>,
        ])}
      </select>
    </div>
  );
}
