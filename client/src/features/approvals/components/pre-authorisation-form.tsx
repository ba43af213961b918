import { zodResolver } from '@hookform/resolvers/zod';
import { preAuthorisationSchema, type PreAuthorisationDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { Facts } from '@/components/ui/page';
import { FormErrorSummary } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { formatMoney } from '@/lib/format';
import { useSavePreAuthorisation } from '../api/pre-authorisation';
import { GO_AHEAD } from '../words';

const LABELS = { perFinding: GO_AHEAD.fieldPerFinding, perJob: GO_AHEAD.fieldPerJob, agreedHow: GO_AHEAD.fieldAgreedHow };
const blankToNull = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? null : v);

/** The owner's standing go-ahead, shown with what is left of it; the office may change it. */
export function PreAuthorisation({ jobId, jobVersion, limit, currency, canEdit }: { jobId: string; jobVersion: number; limit: PreAuthorisationDto; currency: string; canEdit: boolean }) {
  const [editing, setEditing] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const none = limit.perFinding === null && limit.perJob === null;
  return (
    <div className="flex flex-col gap-3" data-testid="pre-authorisation">
      {notice ? <p role="status" className="text-sm font-semibold">{notice}</p> : null}
      {editing ? (
        <LimitForm
          key={jobVersion}
          jobId={jobId}
          jobVersion={jobVersion}
          limit={limit}
          onDone={(n) => {
            setEditing(false);
            setNotice(n ?? null);
          }}
        />
      ) : (
        <>
          {none ? (
            <p>{GO_AHEAD.none}</p>
          ) : (
            <Facts
              items={[
                { label: GO_AHEAD.perFinding, value: limit.perFinding ? formatMoney(limit.perFinding, currency, { vat: 'incl' }) : GO_AHEAD.noneOfKind },
                { label: GO_AHEAD.perJob, value: limit.perJob ? formatMoney(limit.perJob, currency, { vat: 'incl' }) : GO_AHEAD.noneOfKind },
                { label: GO_AHEAD.usedSoFar, value: formatMoney(limit.usedSoFar, currency, { vat: 'incl' }) },
                { label: GO_AHEAD.headroom, value: limit.headroom === null ? GO_AHEAD.noJobTotal : formatMoney(limit.headroom, currency, { vat: 'incl' }) },
                { label: GO_AHEAD.agreed, value: limit.agreedHow },
              ]}
            />
          )}
          <p className="text-xs text-slate-soft">{GO_AHEAD.explain}</p>
          {canEdit ? (
            <div>
              <Button variant="secondary" onClick={() => { setNotice(null); setEditing(true); }}>
                {none ? GO_AHEAD.set : GO_AHEAD.change}
              </Button>
            </div>
          ) : null}
        </>
      )}
    </div>
  );
}

function LimitForm({ jobId, jobVersion, limit, onDone }: { jobId: string; jobVersion: number; limit: PreAuthorisationDto; onDone: (n?: string) => void }) {
  const save = useSavePreAuthorisation(jobId);
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof preAuthorisationSchema>, unknown, z.output<typeof preAuthorisationSchema>>({
    resolver: zodResolver(preAuthorisationSchema),
    defaultValues: { version: jobVersion, perFinding: limit.perFinding, perJob: limit.perJob, agreedHow: limit.agreedHow },
  });
  const e = formState.errors;
  const submit = handleSubmit(
    withServerErrors(
      setError,
      setSummary,
      Object.keys(LABELS),
      async (values) => {
        await save.mutateAsync(values);
        onDone(GO_AHEAD.saved);
      },
      (err) => {
        if (!(isApiError(err) && err.code === 'stale_version')) return false;
        onDone(GO_AHEAD.stale);
        return true;
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label={GO_AHEAD.formLabel} className="flex flex-col gap-3">
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label={LABELS.perFinding} inputMode="decimal" hint={GO_AHEAD.hintPerFinding} error={e.perFinding?.message} {...register('perFinding', { setValueAs: blankToNull })} />
        <TextField label={LABELS.perJob} inputMode="decimal" hint={GO_AHEAD.hintPerJob} error={e.perJob?.message} {...register('perJob', { setValueAs: blankToNull })} />
      </div>
      <TextField label={LABELS.agreedHow} placeholder="e.g. Phone call with the owner, 26 Nov" error={e.agreedHow?.message} {...register('agreedHow')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          {GO_AHEAD.save}
        </Button>
        <Button variant="secondary" onClick={() => onDone()}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
