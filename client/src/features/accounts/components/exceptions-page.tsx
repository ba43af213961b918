import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { EXCEPTION_KIND_LABELS, type AccountExceptionDto } from '@wingstage/shared';
import { Card, PageHeader } from '@/components/ui/page';
import { Loading, Notice } from '@/components/ui/notice';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { formatDate, formatDateTime } from '@/lib/format';
import { exceptionsQuery, useResolveException } from '../api';
import { ACCOUNTS_WORDS as W } from '../words';
import { AccountsNav } from './accounts-nav';

function ResolveForm({ ex }: { ex: AccountExceptionDto }) {
  const [note, setNote] = useState('');
  const resolve = useResolveException();
  const err = resolve.error as { message?: string; fields?: Record<string, string> } | null;
  return (
    <form
      className="mt-3 flex flex-col gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        resolve.mutate({ id: ex.id, note });
      }}
    >
      <TextAreaField label="How it was settled" hint="Required. Kept with the exception and in the job's history." value={note} onChange={(e) => setNote(e.target.value)} rows={2} error={err?.fields?.note ?? (err ? err.message : undefined)} maxChars={1000} />
      <div>
        <Button type="submit" busy={resolve.isPending}>Resolve with this note</Button>
      </div>
    </form>
  );
}

export function ExceptionsPage() {
  const [state, setState] = useState<'open' | 'resolved'>('open');
  const q = useQuery(exceptionsQuery(state));
  return (
    <>
      <PageHeader title={W.area} lead={W.exceptions.lead} />
      <AccountsNav />
      <div role="group" aria-label="Show exceptions" className="mb-4 flex gap-2">
        {(['open', 'resolved'] as const).map((s) => (
          <button key={s} type="button" aria-pressed={state === s} onClick={() => setState(s)} className={`min-h-10 rounded-control border px-4 font-semibold ${state === s ? 'border-harbour bg-harbour text-on-harbour' : 'border-seam-strong bg-cloth-raised hover:bg-cloth-sunk'}`}>
            {state === s ? <span aria-hidden="true">● </span> : null}
            {s === 'open' ? 'Open' : 'Resolved'}
          </button>
        ))}
      </div>
      {!q.data ? (
        <Loading />
      ) : q.data.length === 0 ? (
        <Notice title={state === 'open' ? 'Nothing is waiting: every payment, invoice, refund and payout matches.' : 'Nothing has been resolved yet.'} />
      ) : (
        <ul className="flex flex-col gap-3">
          {q.data.map((ex) => (
            <li key={ex.id}>
              <Card title={<span><span aria-hidden="true">{ex.state === 'open' ? '▲ ' : '✓ '}</span>{EXCEPTION_KIND_LABELS[ex.kind]}</span>}>
                <p>{ex.reason}</p>
                <p className="mt-1 text-sm text-slate-soft">
                  Found {formatDate(ex.createdAt)}
                  {ex.jobNumber ? ` · job ${ex.jobNumber}` : ''}
                </p>
                {ex.state === 'open' ? (
                  <ResolveForm ex={ex} />
                ) : (
                  <p className="mt-2 border-l-4 border-seam-strong pl-3">
                    Resolved {ex.resolvedAt ? formatDateTime(ex.resolvedAt) : ''} by {ex.resolvedByName ?? 'someone no longer here'}: {ex.note}
                  </p>
                )}
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
