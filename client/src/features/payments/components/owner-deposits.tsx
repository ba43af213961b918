import type { DepositRequestDto } from '@wingstage/shared';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { jobDepositsQueryOptions, openCheckout } from '../api';
import { OWNER_PAY_WORDS as W } from '../words';
import { DepositBadge } from './deposit-badge';

/** Sends the owner to the card payment page for one deposit; the server names the amount. */
export function PayDepositButton({ jobId, depositId, label = W.pay }: { jobId: string; depositId: string; label?: string }) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-1">
      <Button
        size="lg"
        busy={busy}
        data-pay-deposit={depositId}
        onClick={async () => {
          setBusy(true);
          setProblem(null);
          try {
            const { url } = await openCheckout(jobId, { for: 'deposit', depositRequestId: depositId });
            window.location.assign(url);
          } catch (e) {
            setProblem(isApiError(e) ? e.message : 'The payment page could not be opened. Please try again.');
            setBusy(false);
          }
        }}
      >
        {busy ? W.opening : label}
      </Button>
      {problem ? (
        <p role="alert" className="text-sm text-fault">
          {problem}
        </p>
      ) : null}
    </div>
  );
}

function OwnerDeposit({ jobId, d }: { jobId: string; d: DepositRequestDto }) {
  const amount = formatMoney(d.amount, d.currency, { vat: 'incl' });
  return (
    <li data-owner-deposit={d.id} className="flex flex-col gap-2 border-t border-seam pt-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="font-semibold tabular-nums">{amount}</p>
        <DepositBadge state={d.state} words={W.state} />
      </div>
      <p>
        {W.forWhat}: {d.reason}
      </p>
      {d.state === 'paid' && d.paidAt ? <p>{W.paidOn(formatDateTime(d.paidAt))}</p> : null}
      {d.state === 'cancelled' ? <p>{W.cancelled}</p> : null}
      {d.state === 'waiting' && d.lastDecline ? (
        <div role="status" data-deposit-declined className="rounded-card border-2 border-fault bg-fault-tint p-3">
          <p className="font-semibold">{W.declined}: {d.lastDecline}</p>
          <p>{W.declinedHelp}</p>
        </div>
      ) : null}
      {d.state === 'waiting' ? (
        <>
          <p>{W.asked(amount)} {W.taken}</p>
          <PayDepositButton jobId={jobId} depositId={d.id} label={d.lastDecline ? W.payAgain : W.pay} />
        </>
      ) : null}
    </li>
  );
}

/** The deposits on one of the owner's jobs, with "Pay deposit" for those still waiting. */
export function OwnerDeposits({ jobId }: { jobId: string }) {
  const q = useQuery(jobDepositsQueryOptions(jobId));
  if (!q.data || q.data.length === 0) return null;
  return (
    <section className="mt-3 flex flex-col gap-2" aria-label={W.heading} data-testid="owner-deposits">
      <h4 className="font-semibold">{W.heading}</h4>
      <ul className="flex flex-col gap-3">
        {q.data.map((d) => (
          <OwnerDeposit key={d.id} jobId={jobId} d={d} />
        ))}
      </ul>
    </section>
  );
}
