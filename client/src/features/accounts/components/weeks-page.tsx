import { lazy, Suspense } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Card, PageHeader } from '@/components/ui/page';
import { Loading } from '@/components/ui/notice';
import { formatDate } from '@/lib/format';
import { weeklyQuery } from '../api';
import { ACCOUNTS_WORDS as W } from '../words';
import { AccountsNav } from './accounts-nav';
import { Money, td, tdNum, th, thNum } from './money-cell';

const WeeksChart = lazy(() => import('./weeks-chart'));

export function WeeksPage() {
  const q = useQuery(weeklyQuery());
  const d = q.data;
  return (
    <>
      <PageHeader title={W.area} lead={W.weeks.lead} />
      <AccountsNav />
      {!d ? (
        <Loading />
      ) : (
        <div className="grid grid-cols-1 gap-5 xl:grid-cols-[3fr_2fr]">
          <Card title="Per week, as a chart">
            <p className="mb-2 text-sm text-slate-soft">Each week has three bars, left to right: invoiced, received, paid out. The same figures are in the table.</p>
            <Suspense fallback={<Loading label="Drawing the chart…" />}>
              <WeeksChart data={d} />
            </Suspense>
          </Card>
          <Card title="Per week, as a table">
            <div className="relative overflow-x-auto">
              <table className="w-full border-collapse">
                <caption className="sr-only">Invoiced, received and paid out per week, week starting Monday</caption>
                <thead className="border-b border-seam-strong">
                  <tr>
                    <th scope="col" className={th}>Week from</th>
                    <th scope="col" className={thNum}>Invoiced</th>
                    <th scope="col" className={thNum}>Received</th>
                    <th scope="col" className={thNum}>Paid out</th>
                  </tr>
                </thead>
                <tbody>
                  {d.weeks.map((w) => (
                    <tr key={w.weekStart} className="border-b border-seam">
                      <th scope="row" className={`${td} font-normal`}>{formatDate(w.weekStart)}</th>
                      <td className={tdNum}><Money amount={w.invoiced} currency={d.currency} /></td>
                      <td className={tdNum}><Money amount={w.received} currency={d.currency} /></td>
                      <td className={tdNum}><Money amount={w.paidOut} currency={d.currency} /></td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </Card>
        </div>
      )}
    </>
  );
}
