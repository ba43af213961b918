import { zodResolver } from '@hookform/resolvers/zod';
import { compareAmounts, instantFromWorkshopInput, quotePhoneAgreementSchema, workshopDateTimeInput, type AgreedHow, type EstimateDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm, type Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { Facts } from '@/components/ui/page';
import { QuoteStateBadge } from '@/components/ui/quote-badge';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { formatDateTime, formatMoney } from '@/lib/format';
import { useRecordPhoneAgreement } from '../api/record-phone-agreement';

export const AGREED_HOW_WORDS: Record<AgreedHow, string> = {
  owner_link: 'online, through the owner’s link',
  phone: 'by phone, recorded by the workshop',
  recorded_before: 'recorded before owners agreed quotes online',
};

/**
 * The quote on the job page: its state in words and icon, what waits for the owner, who agreed it
 * and how. The office sends it (through the send panel) or records that the owner agreed by phone.
 * Nothing in the inspection scope counts as agreed without one of those records.
 */
export function QuotePanel({ jobId, estimate, canAct, onSendQuote }: { jobId: string; estimate: EstimateDto; canAct: boolean; onSendQuote: () => void }) {
  const q = estimate.quote;
  const [recording, setRecording] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const awaiting = compareAmounts(q.awaitingGross, '0') > 0;
  const open = awaiting && q.state !== 'sent';
  return (
    <div className="flex flex-col gap-3" data-testid="quote-panel">
      <div>
        <QuoteStateBadge state={q.state} />
      </div>
      {notice ? (
        <p role="status" className="text-sm font-semibold">
          {notice}
        </p>
      ) : null}
      <Facts
        items={[
          { label: 'Not yet agreed', value: awaiting ? formatMoney(q.awaitingGross, estimate.currency, { vat: 'incl' }) : 'Nothing' },
          {
            label: 'Agreed',
            value: q.agreedAt ? `${q.agreedBy ? `${q.agreedBy}, ` : ''}${q.agreedHow ? `${AGREED_HOW_WORDS[q.agreedHow]}, ` : ''}${formatDateTime(q.agreedAt)}` : 'Not yet',
          },
        ]}
      />
      {q.state === 'sent' ? <p className="text-sm">The quote is with the owner; their decision shows under Approval requests.</p> : null}
      {q.state === 'declined' ? <p className="text-sm">The owner declined the quote. Talk it through with them, then send a changed quote or record their agreement by phone.</p> : null}
      {q.state === 'changed' ? <p className="text-sm">Lines of the inspection scope changed or were added after the owner agreed it: the changes wait for their agreement.</p> : null}
      {awaiting ? <p className="text-xs text-slate-soft">Work on the quoted scope starts once the owner has agreed it.</p> : null}
      {canAct && open && !recording ? (
        <div className="flex flex-wrap gap-2">
          <Button onClick={onSendQuote}>Send quote to owner</Button>
          <Button
            variant="secondary"
            onClick={() => {
              setNotice(null);
              setRecording(true);
            }}
          >
            Record agreement by phone
          </Button>
        </div>
      ) : null}
      {recording ? (
        <PhoneAgreementForm
          jobId={jobId}
          estimateVersion={estimate.version}
          onDone={(n) => {
            setRecording(false);
            setNotice(n ?? null);
          }}
        />
      ) : null}
    </div>
  );
}

const LABELS = { agreedWith: 'Who agreed it on the phone', agreedAt: 'When (UK time)', note: 'Note' };

type FormIn = z.input<typeof quotePhoneAgreementSchema>;
type FormOut = z.output<typeof quotePhoneAgreementSchema>;

/** "2026-12-02T10:30" in the date-time box is the workshop's wall-clock time, whatever the device's clock. */
export const localDateTimeInput = (d: Date) => workshopDateTimeInput(d);

/** The date-time box's value (workshop time) as an ISO instant; anything unreadable is passed on for the schema to refuse. */
export const isoFromLocalInput = (v: string) => instantFromWorkshopInput(v);

/** The shared schema checks the form, after the local date-time is read as an instant. */
const resolver: Resolver<FormIn, unknown, FormOut> = (values, ctx, opts) =>
  zodResolver(quotePhoneAgreementSchema)({ ...values, agreedAt: isoFromLocalInput(values.agreedAt) }, ctx, opts);

function PhoneAgreementForm({ jobId, estimateVersion, onDone }: { jobId: string; estimateVersion: number; onDone: (n?: string) => void }) {
  const record = useRecordPhoneAgreement(jobId);
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<FormIn, unknown, FormOut>({
    resolver,
    defaultValues: { agreedWith: '', agreedAt: localDateTimeInput(new Date()), note: '', estimateVersion },
  });
  const e = formState.errors;
  const submit = handleSubmit(
    withServerErrors(
      setError,
      setSummary,
      Object.keys(LABELS),
      async (values: FormOut) => {
        await record.mutateAsync(values);
        onDone('Agreement by phone recorded: the quote counts as agreed.');
      },
      (err) => {
        if (!(isApiError(err) && err.code === 'stale_version')) return false;
        onDone('The estimate changed meanwhile, so nothing was recorded. Check the quote as it now stands, then record the agreement again.');
        return true;
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Record agreement by phone" className="flex flex-col gap-3 rounded-card border border-seam bg-cloth p-3">
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <TextField label={LABELS.agreedWith} placeholder="e.g. the owner" required error={e.agreedWith?.message} {...register('agreedWith')} />
      <TextField label={LABELS.agreedAt} type="datetime-local" required error={e.agreedAt?.message} {...register('agreedAt')} />
      <TextAreaField label={LABELS.note} rows={2} hint="Optional: what was said, any limits they gave." error={e.note?.message} {...register('note')} />
      <p className="text-xs text-slate-soft">Recorded with your name in the job’s history. Every line of the inspection scope not yet agreed counts as agreed from then.</p>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          Record agreement
        </Button>
        <Button variant="secondary" onClick={() => onDone()}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
