import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Pager } from '@/components/ui/pager';
import { Card, PageHeader } from '@/components/ui/page';
import { Loading, Notice } from '@/components/ui/notice';
import { Button } from '@/components/ui/button';
import { formatDate } from '@/lib/format';
import { agedDebtQuery, useSendReminder } from '../api';
import { ACCOUNTS_WORDS as W } from '../words';
import { AccountsNav } from './accounts-nav';
import { Money, td, tdNum, th, thNum } from './money-cell';

const COLUMNS = [
  { key: 'd0_30', label: '0–30 days' },
  { key: 'd31_60', label: '31–60 days' },
  { key: 'd61_90', label: '61–90 days' },
  { key: 'over90', label: 'Over 90 days' },
] as const;

export function AgedDebtPage() {
  const [page, setPage] = useState(1);
  const q = useQuery(agedDebtQuery(page));
  const remind = useSendReminder();
  const d = q.data;
  return (
    <>
      <PageHeader title={W.area} lead={W.agedDebt.lead} />
      <AccountsNav />
      {remind.isSuccess ? <div className="mb-4"><Notice title={`Reminder e-mailed to ${remind.data.sentTo}.`} /></div> : null}
      {remind.isError ? <div className="mb-4"><Notice tone="problem" title={(remind.error as Error).message} /></div> : null}
      <Card title={d ? `${W.agedDebt.title} on ${formatDate(d.asOf)}` : W.agedDebt.title}>
        {!d ? (
          <Loading />
        ) : d.ownerCount === 0 ? (
          <p>No owner owes anything on an issued invoice.</p>
        ) : (
          <div className="flex flex-col gap-3">
          <div className="relative overflow-x-auto">
            <table className="w-full min-w-[48rem] border-collapse">
              <caption className="sr-only">Days are counted from each invoice's due date; an invoice not yet due counts in 0–30 days.</caption>
              <thead className="border-b border-seam-strong">
                <tr>
                  <th scope="col" className={th}>Owner</th>
                  {COLUMNS.map((c) => <th key={c.key} scope="col" className={thNum}>{c.label}</th>)}
                  <th scope="col" className={thNum}>Total</th>
                  <th scope="col" className={th}><span className="sr-only">Reminder</span></th>
                </tr>
              </thead>
              <tbody>
                {d.rows.map((r) => (
                  <tr key={r.customerId} className="border-b border-seam">
                    <th scope="row" className={`${td} font-semibold`}>
                      {r.ownerName}
                      <span className="block text-xs font-normal text-slate-soft">{r.invoices.map((i) => `${i.number} due ${formatDate(i.dueOn)}`).join('; ')}</span>
                    </th>
                    {COLUMNS.map((c) => <td key={c.key} className={tdNum}><Money amount={r.buckets[c.key]} currency={d.currency} /></td>)}
                    <td className={`${tdNum} font-semibold`}><Money amount={r.total} currency={d.currency} /></td>
                    <td className={td}>
                      <Button variant="secondary" disabled={!r.email} busy={remind.isPending && remind.variables === r.customerId} onClick={() => remind.mutate(r.customerId)} aria-label={`E-mail a reminder to ${r.ownerName}`}>
                        E-mail a reminder
                      </Button>
                    </td>
                  </tr>
                ))}
              </tbody>
              <tfoot className="border-t-2 border-seam-strong font-semibold">
                <tr>
                  <th scope="row" className={th}>{d.ownerCount > d.pageSize ? `All ${d.ownerCount} owners (every page)` : 'All owners'}</th>
                  {COLUMNS.map((c) => <td key={c.key} className={tdNum}><Money amount={d.totals[c.key]} currency={d.currency} /></td>)}
                  <td className={tdNum}><Money amount={d.totals.total} currency={d.currency} /></td>
                  <td />
                </tr>
              </tfoot>
            </table>
          </div>
          <Pager label="Aged debt: pages" page={d.page} pageSize={d.pageSize} total={d.ownerCount} onPage={setPage} />
          </div>
        )}
      </Card>
    </>
  );
}
