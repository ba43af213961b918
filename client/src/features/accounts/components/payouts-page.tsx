import { useQuery } from '@tanstack/react-query';
import type { PayoutDto } from '@wingstage/shared';
import { Link } from 'react-router-dom';
import { Card, PageHeader } from '@/components/ui/page';
import { Loading, Notice } from '@/components/ui/notice';
import { Button, buttonClass } from '@/components/ui/button';
import { formatDate, formatDateTime } from '@/lib/format';
import { csvUrl, payoutQuery, payoutsQuery, useFetchPayouts } from '../api';
import { ACCOUNTS_WORDS as W } from '../words';
import { AccountsNav } from './accounts-nav';
import { Money, td, tdNum, th, thNum } from './money-cell';

/** Whether a payout adds up, in words and a mark, never by colour alone. */
export function AddsUp({ p }: { p: PayoutDto }) {
  return p.addsUp ? (
    <span className="font-semibold"><span aria-hidden="true">✓ </span>{W.addsUp}</span>
  ) : (
    <span className="font-semibold text-fault">
      <span aria-hidden="true">▲ </span>
      {W.doesNotAddUp} (difference <Money amount={p.difference} currency={p.currency} />)
    </span>
  );
}

export function PayoutsPage() {
  const q = useQuery(payoutsQuery());
  const fetchNow = useFetchPayouts();
  return (
    <>
      <PageHeader
        title={W.area}
        lead={W.payouts.lead}
        actions={
          <>
            <Button busy={fetchNow.isPending} onClick={() => fetchNow.mutate()}>Fetch payouts now</Button>
            <a className={buttonClass('secondary')} href={csvUrl('/accounts/payouts.csv', {})} download>Export payouts (CSV)</a>
          </>
        }
      />
      <AccountsNav />
      {fetchNow.isSuccess ? <div className="mb-4"><Notice title={`Fetched ${fetchNow.data.fetched} ${fetchNow.data.fetched === 1 ? 'payout' : 'payouts'} from the card processor.`} /></div> : null}
      {fetchNow.isError ? <div className="mb-4"><Notice tone="problem" title={(fetchNow.error as Error).message} /></div> : null}
      <Card title={W.payouts.title}>
        {!q.data ? (
          <Loading />
        ) : q.data.length === 0 ? (
          <p>No payouts yet. They appear here when the card processor sends money to the bank.</p>
        ) : (
          <div className="relative overflow-x-auto">
            <table className="w-full min-w-[44rem] border-collapse">
              <thead className="border-b border-seam-strong">
                <tr>
                  <th scope="col" className={th}>Arrives</th>
                  <th scope="col" className={th}>Payout</th>
                  <th scope="col" className={thNum}>Sent to the bank</th>
                  <th scope="col" className={thNum}>Payments net</th>
                  <th scope="col" className={th}>Check</th>
                </tr>
              </thead>
              <tbody>
                {q.data.map((p) => (
                  <tr key={p.id} className="border-b border-seam">
                    <td className={td}>{formatDate(p.arrivalOn)}</td>
                    <td className={td}><Link to={`/accounts/payouts/${p.id}`}>{p.stripePayoutId}</Link> <span className="text-slate-soft">({p.transactionsCount} {p.transactionsCount === 1 ? 'item' : 'items'}, {p.status})</span></td>
                    <td className={tdNum}><Money amount={p.amount} currency={p.currency} /></td>
                    <td className={tdNum}><Money amount={p.transactionsNet} currency={p.currency} /></td>
                    <td className={td}><AddsUp p={p} /></td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>
    </>
  );
}

export function PayoutDetailPage({ id }: { id: string }) {
  const q = useQuery(payoutQuery(id));
  const p = q.data;
  return (
    <>
      <PageHeader title={p ? `Payout ${p.stripePayoutId}` : 'Payout'} back={{ to: '/accounts/payouts', label: W.payouts.title }} lead={p ? <AddsUp p={p} /> : null} />
      <AccountsNav />
      {!p ? (
        <Loading />
      ) : (
        <Card title={`Arrives ${formatDate(p.arrivalOn)}: ${p.transactionsCount} ${p.transactionsCount === 1 ? 'item' : 'items'}`}>
          <div className="relative overflow-x-auto">
            <table className="w-full min-w-[40rem] border-collapse">
              <thead className="border-b border-seam-strong">
                <tr>
                  <th scope="col" className={th}>When</th>
                  <th scope="col" className={th}>What</th>
                  <th scope="col" className={th}>Job</th>
                  <th scope="col" className={thNum}>Gross</th>
                  <th scope="col" className={thNum}>Fee</th>
                  <th scope="col" className={thNum}>Net</th>
                </tr>
              </thead>
              <tbody>
                {p.transactions.map((t) => (
                  <tr key={t.id} className="border-b border-seam">
                    <td className={td}>{formatDateTime(t.occurredAt)}</td>
                    <td className={td}>{t.type === 'charge' ? 'Card payment' : t.type === 'refund' ? 'Refund' : t.type}{!t.paymentId && !t.refundId ? ' (not matched to a record)' : ''}</td>
                    <td className={td}>{t.jobNumber ?? '—'}</td>
                    <td className={tdNum}><Money amount={t.gross} currency={p.currency} /></td>
                    <td className={tdNum}><Money amount={t.fee} currency={p.currency} /></td>
                    <td className={tdNum}><Money amount={t.net} currency={p.currency} /></td>
                  </tr>
                ))}
              </tbody>
              <tfoot className="border-t-2 border-seam-strong font-semibold">
                <tr>
                  <th scope="row" colSpan={5} className={th}>Payments net</th>
                  <td className={tdNum}><Money amount={p.transactionsNet} currency={p.currency} /></td>
                </tr>
                <tr>
                  <th scope="row" colSpan={5} className={th}>Sent to the bank</th>
                  <td className={tdNum}><Money amount={p.amount} currency={p.currency} /></td>
                </tr>
              </tfoot>
            </table>
          </div>
        </Card>
      )}
    </>
  );
}
