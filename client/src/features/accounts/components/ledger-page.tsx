import { useQuery } from '@tanstack/react-query';
import { PAYMENT_STATE_LABELS, LEDGER_KINDS, LEDGER_KIND_LABELS, EXCEPTION_KIND_LABELS, type LedgerRowDto } from '@wingstage/shared';
import { useSearchParams } from 'react-router-dom';
import { Card, PageHeader } from '@/components/ui/page';
import { Loading, Notice } from '@/components/ui/notice';
import { SelectField, TextField } from '@/components/ui/field';
import { buttonClass } from '@/components/ui/button';
import { formatDate } from '@/lib/format';
import { csvUrl, ledgerQuery, type LedgerParams } from '../api';
import { ACCOUNTS_WORDS as W } from '../words';
import { AccountsNav } from './accounts-nav';
import { Money, td, tdNum, th, thNum } from './money-cell';

const REFUND_STATE_WORDS: Record<string, string> = { pending: 'Being refunded', succeeded: 'Refunded', failed: 'Refund failed' };

/** A row's state in words: the payment states' own labels, or a refund's. */
function statusWords(kind: string, status: string): string {
  if (kind === 'refund') return REFUND_STATE_WORDS[status] ?? status;
  return (PAYMENT_STATE_LABELS as Record<string, string>)[status] ?? status;
}

const SORTABLE: { key: string; label: string; num?: boolean }[] = [
  { key: 'date', label: 'Date' },
  { key: 'job', label: 'Job' },
  { key: 'owner', label: 'Owner' },
  { key: 'kind', label: 'Kind' },
  { key: 'gross', label: 'Gross', num: true },
  { key: 'fee', label: 'Fee', num: true },
  { key: 'net', label: 'Net', num: true },
];

function readParams(sp: URLSearchParams): LedgerParams {
  const get = (k: string) => sp.get(k) ?? undefined;
  return { from: get('from'), to: get('to'), kind: get('kind'), q: get('q'), sort: get('sort') ?? 'date', dir: sp.get('dir') === 'asc' ? 'asc' : 'desc', page: Number(sp.get('page') ?? 1) || 1, pageSize: 50 };
}

function ExceptionMark({ row }: { row: LedgerRowDto }) {
  if (!row.exception) return null;
  const e = row.exception;
  return (
    <span className="mt-1 block text-xs">
      <span aria-hidden="true">{e.state === 'open' ? '▲ ' : '✓ '}</span>
      {EXCEPTION_KIND_LABELS[e.kind]}: {e.state === 'open' ? 'open' : `resolved — ${e.note ?? ''}`}
    </span>
  );
}

export function LedgerPage() {
  const [sp, setSp] = useSearchParams();
  const p = readParams(sp);
  const q = useQuery(ledgerQuery(p));
  const set = (patch: Partial<Record<keyof LedgerParams, string | undefined>>) => {
    const next = new URLSearchParams(sp);
    for (const [k, v] of Object.entries(patch)) {
      if (v) next.set(k, v);
      else next.delete(k);
    }
    if (!('page' in patch)) next.delete('page');
    setSp(next, { replace: true });
  };
  const err = q.error as { message?: string } | null;
  const data = q.data;
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  return (
    <>
      <PageHeader title={W.area} lead={W.ledger.lead} actions={<a className={buttonClass('secondary')} href={csvUrl('/accounts/ledger.csv', { ...p, page: undefined, pageSize: undefined })} download>Export ledger (CSV)</a>} />
      <AccountsNav />
      <Card title={W.ledger.title}>
        <form className="mb-4 grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4" onSubmit={(e) => e.preventDefault()}>
          <TextField label="From" type="date" value={p.from ?? ''} onChange={(e) => set({ from: e.target.value })} />
          <TextField label="To" type="date" value={p.to ?? ''} onChange={(e) => set({ to: e.target.value })} />
          <SelectField label="Kind" value={p.kind ?? ''} onChange={(e) => set({ kind: e.target.value })}>
            <option value="">All kinds</option>
            {LEDGER_KINDS.map((k) => (
              <option key={k} value={k}>{LEDGER_KIND_LABELS[k]}</option>
            ))}
          </SelectField>
          <TextField label="Job, owner or registration" type="search" defaultValue={p.q ?? ''} onChange={(e) => set({ q: e.target.value })} />
        </form>
        {err ? <Notice tone="problem" title={err.message ?? 'The ledger could not be read.'} /> : null}
        {!data ? (
          <Loading />
        ) : (
          <div className="relative overflow-x-auto">
            <table className="w-full min-w-[60rem] border-collapse" aria-busy={q.isPlaceholderData || undefined}>
              <caption className="sr-only">Ledger, sorted by {p.sort} {p.dir === 'asc' ? 'ascending' : 'descending'}</caption>
              <thead className="border-b border-seam-strong">
                <tr>
                  {SORTABLE.map((c) => {
                    const active = p.sort === c.key;
                    return (
                      <th key={c.key} scope="col" className={c.num ? thNum : th} aria-sort={active ? (p.dir === 'asc' ? 'ascending' : 'descending') : undefined}>
                        <button type="button" className="font-semibold underline-offset-2 hover:underline" onClick={() => set({ sort: c.key, dir: active && p.dir === 'desc' ? 'asc' : 'desc' })}>
                          {c.label}
                          {active ? <span aria-hidden="true">{p.dir === 'asc' ? ' ↑' : ' ↓'}</span> : null}
                        </button>
                      </th>
                    );
                  })}
                  <th scope="col" className={th}>Status</th>
                  <th scope="col" className={th}>Payout</th>
                  <th scope="col" className={th}>Settles</th>
                </tr>
              </thead>
              <tbody>
                {data.items.length === 0 ? (
                  <tr>
                    <td colSpan={10} className={td}>Nothing matches these filters.</td>
                  </tr>
                ) : (
                  data.items.map((r) => (
                    <tr key={r.id} className="border-b border-seam">
                      <td className={td}>{formatDate(r.date)}</td>
                      <td className={`${td} whitespace-nowrap`}>{r.jobNumber}</td>
                      <td className={td}>{r.ownerName}</td>
                      <td className={td}>{LEDGER_KIND_LABELS[r.kind]}</td>
                      <td className={tdNum}><Money amount={r.gross} currency={r.currency} /></td>
                      <td className={tdNum}><Money amount={r.fee} currency={r.currency} /></td>
                      <td className={tdNum}><Money amount={r.net} currency={r.currency} /></td>
                      <td className={td}>{statusWords(r.kind, r.status)}</td>
                      <td className={`${td} break-all`}>{r.payout ?? '—'}</td>
                      <td className={td}>
                        {r.settles ?? '—'}
                        <ExceptionMark row={r} />
                      </td>
                    </tr>
                  ))
                )}
              </tbody>
              <tfoot className="border-t-2 border-seam-strong font-semibold">
                <tr>
                  <th scope="row" colSpan={4} className={th}>Total of {data.total} {data.total === 1 ? 'row' : 'rows'} (all pages)</th>
                  <td className={tdNum}><Money amount={data.totals.gross} currency={data.currency} /></td>
                  <td className={tdNum}><Money amount={data.totals.fee} currency={data.currency} /></td>
                  <td className={tdNum}><Money amount={data.totals.net} currency={data.currency} /></td>
                  <td colSpan={3} />
                </tr>
              </tfoot>
            </table>
          </div>
        )}
        {data && pages > 1 ? (
          <div className="mt-3 flex items-center gap-3">
            <button type="button" className={buttonClass('secondary')} disabled={(p.page ?? 1) <= 1} onClick={() => set({ page: String((p.page ?? 1) - 1) })}>Previous page</button>
            <span className="text-sm">Page {p.page} of {pages}</span>
            <button type="button" className={buttonClass('secondary')} disabled={(p.page ?? 1) >= pages} onClick={() => set({ page: String((p.page ?? 1) + 1) })}>Next page</button>
          </div>
        ) : null}
      </Card>
    </>
  );
}
