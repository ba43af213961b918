import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, depositRequestCreateSchema, type DepositRequestDto, type Role } from '@wingstage/shared';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { Card } from '@/components/ui/page';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { formatDateTime, formatMoney } from '@/lib/format';
import { cancelDeposit, createDeposit, jobDepositsQueryOptions, paymentKeys } from '../api';
import { STAFF_PAY_WORDS as W } from '../words';
import { DepositBadge } from './deposit-badge';

const LABELS = { amount: 'Amount (incl. VAT)', reason: 'Reason the owner reads' };
const STAFF_STATE = { waiting: 'Waiting for payment', paid: 'Paid', cancelled: 'Cancelled' } as const;

function RequestDepositForm({ jobId, onDone }: { jobId: string; onDone: () => void }) {
  const qc = useQueryClient();
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof depositRequestCreateSchema>, unknown, z.output<typeof depositRequestCreateSchema>>({
    resolver: zodResolver(depositRequestCreateSchema),
    defaultValues: { amount: '', reason: '' },
  });
  const e = formState.errors;
  const submit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (v: z.output<typeof depositRequestCreateSchema>) => {
      await createDeposit(jobId, v);
      await qc.invalidateQueries({ queryKey: paymentKeys.all });
      onDone();
    }),
  );
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-3 border-t border-seam pt-3" aria-label={W.request}>
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <TextField label={LABELS.amount} inputMode="decimal" required error={e.amount?.message} {...register('amount')} />
      <TextAreaField label={LABELS.reason} hint="For example: Propeller overhaul ordered." required maxChars={TEXT_MAX.reason} rows={2} error={e.reason?.message} {...register('reason')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          {W.request}
        </Button>
        <Button variant="quiet" onClick={onDone}>
          Close
        </Button>
      </div>
    </form>
  );
}

function DepositRow({ jobId, d, canManage }: { jobId: string; d: DepositRequestDto; canManage: boolean }) {
  const qc = useQueryClient();
  const cancel = useMutation({
    mutationFn: () => cancelDeposit(jobId, d.id, { reason: '' }),
    onSettled: () => qc.invalidateQueries({ queryKey: paymentKeys.all }),
  });
  const paid = d.payments.find((p) => p.state === 'succeeded' || p.state === 'refunded' || p.state === 'partially_refunded');
  return (
    <li data-staff-deposit={d.id} className="flex flex-col gap-2 border-t border-seam pt-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="font-semibold tabular-nums">{formatMoney(d.amount, d.currency, { vat: 'incl' })}</p>
        <DepositBadge state={d.state} words={STAFF_STATE} />
      </div>
      <p>{d.reason}</p>
      <p className="text-sm text-slate-soft">
        {W.origin[d.origin]} · {formatDateTime(d.createdAt)}
      </p>
      {d.lastDecline ? <p className="text-sm">Last card declined: {d.lastDecline}</p> : null}
      {d.payments.length ? (
        <ul className="flex flex-col gap-1 text-sm">
          {d.payments.map((p) => (
            <li key={p.id} data-payment-state={p.state} className="tabular-nums">
              {W.paymentState[p.state]}
              {p.amount ? ` · ${formatMoney(p.amount, p.currency)}` : ''}
              {p.fee ? ` · fee ${formatMoney(p.fee, p.currency)}` : ''}
              {p.net ? ` · net ${formatMoney(p.net, p.currency)}` : ''}
              {p.amountMismatch ? ` · ${W.flagged}` : ''}
              {p.outcomeNote && !p.amountMismatch ? <span className="block text-slate-soft">{p.outcomeNote}</span> : null}
            </li>
          ))}
        </ul>
      ) : null}
      {paid?.receivedAt ? <p className="text-sm">Received {formatDateTime(paid.receivedAt)}</p> : null}
      {canManage && d.state === 'waiting' ? (
        <div>
          <Button
            variant="secondary"
            busy={cancel.isPending}
            onClick={() => {
              if (window.confirm(W.cancelConfirm)) cancel.mutate();
            }}
          >
            {W.cancel}
          </Button>
          {cancel.isError ? <p role="alert" className="mt-1 text-sm text-fault">{isApiError(cancel.error) ? cancel.error.message : 'The deposit could not be cancelled.'}</p> : null}
        </div>
      ) : null}
    </li>
  );
}

/** The deposits on a job for staff: each with its payments (fee and net), "Request deposit" and cancel for managers. */
export function JobDeposits({ jobId, role }: { jobId: string; role: Role }) {
  const q = useQuery(jobDepositsQueryOptions(jobId));
  const [asking, setAsking] = useState(false);
  const canManage = role === 'admin' || role === 'manager';
  return (
    <Card
      title={W.jobHeading}
      actions={
        canManage && !asking ? (
          <Button variant="secondary" onClick={() => setAsking(true)}>
            {W.request}
          </Button>
        ) : null
      }
    >
      <div data-testid="job-deposits" className="flex flex-col gap-3">
        {q.isError ? <Notice tone="problem">{isApiError(q.error) ? q.error.message : 'Deposits could not be loaded.'}</Notice> : null}
        {q.data && q.data.length === 0 && !asking ? <p className="text-slate-soft">{W.none}</p> : null}
        {q.data && q.data.length > 0 ? (
          <ul className="flex flex-col gap-3">
            {q.data.map((d) => (
              <DepositRow key={d.id} jobId={jobId} d={d} canManage={canManage} />
            ))}
          </ul>
        ) : null}
        {asking ? <RequestDepositForm jobId={jobId} onDone={() => setAsking(false)} /> : null}
      </div>
    </Card>
  );
}
