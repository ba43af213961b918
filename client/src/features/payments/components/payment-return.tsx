import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Loading, Notice } from '@/components/ui/notice';
import { buttonClass } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { formatMoney } from '@/lib/format';
import { checkoutSyncQueryOptions } from '../api';
import { OWNER_PAY_WORDS as W } from '../words';
import { PayDepositButton } from './owner-deposits';

/**
 * Where the payment page sends the owner back. The address alone proves nothing: the page asks the
 * server, which reads the session from the card processor, and shows paid only when it says so.
 */
export function PaymentReturn({ jobId, sessionId }: { jobId: string; sessionId: string }) {
  const q = useQuery(checkoutSyncQueryOptions(jobId, sessionId));
  const back = (
    <Link to="/my-aircraft" className={buttonClass('secondary', 'lg')}>
      {W.back}
    </Link>
  );
  if (q.isPending) return <Loading label={W.checking} />;
  if (q.isError) {
    return (
      <div className="flex flex-col gap-4">
        <Notice tone="problem" title={W.problem}>
          {isApiError(q.error) ? q.error.message : String(q.error)}
        </Notice>
        {back}
      </div>
    );
  }
  const { payment, deposit, declined } = q.data;
  const amount = formatMoney(payment.amount ?? payment.expectedAmount, payment.currency, { vat: 'incl' });
  let body;
  if (payment.state === 'succeeded') {
    body = (
      <div data-payment-result="paid" className="flex flex-col gap-2 rounded-card border-2 border-slate-deep bg-cloth-raised p-4">
        <h2 className="text-xl font-semibold">{W.paidTitle}</h2>
        <p>{W.paidBody(amount)}</p>
        {deposit ? <p>{W.taken}</p> : null}
      </div>
    );
  } else if (payment.state === 'refunded' || payment.state === 'partially_refunded') {
    body = (
      <div data-payment-result="refunded" className="flex flex-col gap-2 rounded-card border-2 border-slate-deep bg-cloth-raised p-4">
        <h2 className="text-xl font-semibold">{W.refundedTitle}</h2>
        <p>{W.refundedBody}</p>
      </div>
    );
  } else if (declined || payment.state === 'failed') {
    body = (
      <div data-payment-result="declined" role="status" className="flex flex-col gap-3 rounded-card border-2 border-fault bg-fault-tint p-4">
        <h2 className="text-xl font-semibold">{W.declined}</h2>
        <p data-decline-reason>{declined ?? payment.failureMessage}</p>
        <p>{W.declinedHelp}</p>
        {deposit && deposit.state === 'waiting' ? <PayDepositButton jobId={jobId} depositId={deposit.id} label={W.payAgain} /> : null}
      </div>
    );
  } else if (payment.state === 'cancelled') {
    body = (
      <div data-payment-result="closed" className="flex flex-col gap-2 rounded-card border border-seam-strong bg-cloth-raised p-4">
        <h2 className="text-xl font-semibold">{W.closedTitle}</h2>
        <p>{W.closedBody}</p>
      </div>
    );
  } else {
    body = (
      <div data-payment-result="not-yet" className="flex flex-col gap-3 rounded-card border border-seam-strong bg-cloth-raised p-4">
        <h2 className="text-xl font-semibold">{W.notYetTitle}</h2>
        <p>{W.notYetBody}</p>
        <Button size="lg" variant="secondary" busy={q.isFetching} onClick={() => void q.refetch()}>
          {W.checkAgain}
        </Button>
      </div>
    );
  }
  return (
    <div className="flex flex-col gap-4">
      {body}
      {back}
    </div>
  );
}
