import type { ReactNode } from 'react';
import type { DepositWaitingRow } from '@wingstage/shared';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Pager } from '@/components/ui/pager';
import { Loading, Notice } from '@/components/ui/notice';
import { Card, PageHeader } from '@/components/ui/page';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { depositAccountsQueryOptions, waitingDepositsQueryOptions } from '../api';
import { STAFF_PAY_WORDS as W } from '../words';

function WaitingTable({ rows, caption }: { rows: DepositWaitingRow[]; caption: string }) {
  return (
    <>
      <table className="hidden w-full text-left text-sm md:table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-seam-strong">
            <th className="py-2 pr-3">Job</th>
            <th className="py-2 pr-3">Aircraft</th>
            <th className="py-2 pr-3">Owner</th>
            <th className="py-2 pr-3">Reason</th>
            <th className="py-2 pr-3">Asked</th>
            <th className="py-2 pr-3">Last card</th>
            <th className="py-2 text-right">Amount</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} data-waiting-deposit={r.id} className="border-b border-seam align-top">
              <td className="py-2 pr-3">
                <Link to={`/jobs/${r.jobId}`}>{r.jobNumber}</Link>
              </td>
              <td className="py-2 pr-3">{r.registration}</td>
              <td className="py-2 pr-3">{r.ownerName}</td>
              <td className="py-2 pr-3">{r.reason}</td>
              <td className="py-2 pr-3 tabular-nums">{formatDateTime(r.createdAt)}</td>
              <td className="py-2 pr-3">{r.lastDecline ? `Declined: ${r.lastDecline}` : r.openPages ? 'Payment page open' : 'Not tried yet'}</td>
              <td className="py-2 text-right tabular-nums">{formatMoney(r.amount, r.currency)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <ul className="flex flex-col gap-3 md:hidden" aria-label={caption}>
        {rows.map((r) => (
          <li key={r.id} data-waiting-deposit={r.id} className="flex flex-col gap-1 rounded-card border border-seam bg-cloth-raised p-3">
            <p className="flex justify-between gap-2 font-semibold">
              <Link to={`/jobs/${r.jobId}`}>
                {r.registration} · {r.jobNumber}
              </Link>
              <span className="tabular-nums">{formatMoney(r.amount, r.currency)}</span>
            </p>
            <p>{r.ownerName}</p>
            <p>{r.reason}</p>
            <p className="text-sm text-slate-soft">
              Asked {formatDateTime(r.createdAt)} · {r.lastDecline ? `Declined: ${r.lastDecline}` : r.openPages ? 'Payment page open' : 'Not tried yet'}
            </p>
          </li>
        ))}
      </ul>
    </>
  );
}

/** Staff: every deposit still waiting, oldest first. */
export function WaitingDepositsPage() {
  const [page, setPage] = useState(1);
  const q = useQuery(waitingDepositsQueryOptions(page));
  return (
    <>
      <PageHeader title={W.waitingHeading} lead={W.waitingLead} />
      <Card>
        {q.isPending ? <Loading /> : null}
        {q.isError ? <Notice tone="problem">{isApiError(q.error) ? q.error.message : 'The list could not be loaded.'}</Notice> : null}
        {q.data ? (
          q.data.items.length === 0 ? (
            <p>{W.waitingEmpty}</p>
          ) : (
            <div className="flex flex-col gap-3">
              <WaitingTable rows={q.data.items} caption={W.waitingHeading} />
              {q.data.total > q.data.pageSize ? (
                <div className="flex items-center gap-2">
                  <Button variant="secondary" disabled={page <= 1} onClick={() => setPage(page - 1)}>
                    Previous
                  </Button>
                  <span className="tabular-nums">
                    Page {page} of {Math.ceil(q.data.total / q.data.pageSize)}
                  </span>
                  <Button variant="secondary" disabled={page * q.data.pageSize >= q.data.total} onClick={() => setPage(page + 1)}>
                    Next
                  </Button>
                </div>
              ) : null}
            </div>
          )
        ) : null}
      </Card>
    </>
  );
}

/** Accounts' page of deposits: received with fee and net, and waiting. `nav` is the Accounts area's section links. */
export function DepositAccountsPage({ nav }: { nav?: ReactNode } = {}) {
  const [receivedPage, setReceivedPage] = useState(1);
  const [waitingPage, setWaitingPage] = useState(1);
  const q = useQuery(depositAccountsQueryOptions(receivedPage, waitingPage));
  if (q.isPending) return <Loading />;
  if (q.isError) return <Notice tone="problem">{isApiError(q.error) ? q.error.message : 'The page could not be loaded.'}</Notice>;
  const d = q.data;
  const m = (a: string | null) => (a === null ? '—' : formatMoney(a, d.currency));
  return (
    <>
      <PageHeader title={W.accountsHeading} lead={W.accountsLead} />
      {nav}
      <div className="flex flex-col gap-4">
        <Card title={W.received}>
          <dl className="mb-3 grid grid-cols-2 gap-2 text-sm tabular-nums sm:grid-cols-4" aria-label="Totals of deposits received">
            <div>
              <dt className="text-slate-soft">Received</dt>
              <dd className="font-semibold" data-total="received">{m(d.totals.received)}</dd>
            </div>
            <div>
              <dt className="text-slate-soft">Card fees</dt>
              <dd className="font-semibold" data-total="fees">{m(d.totals.fees)}</dd>
            </div>
            <div>
              <dt className="text-slate-soft">Net to the bank</dt>
              <dd className="font-semibold" data-total="net">{m(d.totals.net)}</dd>
            </div>
            <div>
              <dt className="text-slate-soft">Still waiting</dt>
              <dd className="font-semibold" data-total="waiting">{m(d.totals.waiting)}</dd>
            </div>
          </dl>
          {d.received.length === 0 ? (
            <p>{W.receivedEmpty}</p>
          ) : (
            <>
              <table className="hidden w-full text-left text-sm md:table">
                <caption className="sr-only">{W.received}</caption>
                <thead>
                  <tr className="border-b border-seam-strong">
                    <th className="py-2 pr-3">Received</th>
                    <th className="py-2 pr-3">Job</th>
                    <th className="py-2 pr-3">Owner</th>
                    <th className="py-2 pr-3">Reason</th>
                    <th className="py-2 pr-3 text-right">Amount</th>
                    <th className="py-2 pr-3 text-right">Fee</th>
                    <th className="py-2 pr-3 text-right">Net</th>
                    <th className="py-2">Note</th>
                  </tr>
                </thead>
                <tbody>
                  {d.received.map((r) => (
                    <tr key={r.paymentId} data-received-payment={r.paymentId} className="border-b border-seam align-top">
                      <td className="py-2 pr-3 tabular-nums">{r.receivedAt ? formatDateTime(r.receivedAt) : '—'}</td>
                      <td className="py-2 pr-3">
                        <Link to={`/jobs/${r.jobId}`}>
                          {r.registration} · {r.jobNumber}
                        </Link>
                      </td>
                      <td className="py-2 pr-3">{r.ownerName}</td>
                      <td className="py-2 pr-3">{r.reason}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m(r.amount)}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m(r.fee)}</td>
                      <td className="py-2 pr-3 text-right tabular-nums">{m(r.net)}</td>
                      <td className="py-2">{r.amountMismatch ? W.flagged : r.state !== 'succeeded' ? W.paymentState[r.state] : ''}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <ul className="flex flex-col gap-3 md:hidden" aria-label={W.received}>
                {d.received.map((r) => (
                  <li key={r.paymentId} data-received-payment={r.paymentId} className="flex flex-col gap-1 rounded-card border border-seam bg-cloth-raised p-3 tabular-nums">
                    <p className="flex justify-between gap-2 font-semibold">
                      <Link to={`/jobs/${r.jobId}`}>
                        {r.registration} · {r.jobNumber}
                      </Link>
                      <span>{m(r.amount)}</span>
                    </p>
                    <p>
                      {r.ownerName} · {r.reason}
                    </p>
                    <p className="text-sm">
                      Fee {m(r.fee)} · Net {m(r.net)}
                    </p>
                    <p className="text-sm text-slate-soft">
                      {r.receivedAt ? formatDateTime(r.receivedAt) : ''}
                      {r.amountMismatch ? ` · ${W.flagged}` : r.state !== 'succeeded' ? ` · ${W.paymentState[r.state]}` : ''}
                    </p>
                  </li>
                ))}
              </ul>
              <div className="mt-3">
                <Pager label={`${W.received}: pages`} page={d.receivedPage} pageSize={d.pageSize} total={d.receivedTotal} onPage={setReceivedPage} />
              </div>
            </>
          )}
        </Card>
        <Card title={W.waitingHeading}>
          {d.waiting.length === 0 ? (
            <p>{W.waitingEmpty}</p>
          ) : (
            <div className="flex flex-col gap-3">
              <WaitingTable rows={d.waiting} caption={W.waitingHeading} />
              <Pager label={`${W.waitingHeading}: pages`} page={d.waitingPage} pageSize={d.pageSize} total={d.waitingTotal} onPage={setWaitingPage} />
            </div>
          )}
        </Card>
      </div>
    </>
  );
}
