import { zodResolver } from '@hookform/resolvers/zod';
import { timeLogCreateSchema, timeLogUpdateSchema, type TimeLogDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { formatDate, formatHours, todayIso } from '@/lib/format';
import { useChangeTime, useLogTime } from '../api/record-work';
import { HANGAR_WORDS } from '../words';

const W = HANGAR_WORDS.time;
const LABELS = { hours: W.hours, workedOn: W.workedOn, note: W.note };

/**
 * Time on one job: log an entry, and correct or remove one's own (a manager or admin: anyone's).
 * Every change and removal is written to the job's history by the server.
 */
export function TimeLog({
  jobId,
  entries,
  canLog,
  canChangeAll = false,
  userId,
}: {
  jobId: string;
  entries: TimeLogDto[];
  canLog: boolean;
  canChangeAll?: boolean;
  userId?: string;
}) {
  const log = useLogTime(jobId);
  const [summary, setSummary] = useState<string | null>(null);
  const [said, setSaid] = useState<string | null>(null);
  const { register, handleSubmit, reset, setError, formState } = useForm<z.input<typeof timeLogCreateSchema>, unknown, z.output<typeof timeLogCreateSchema>>({
    resolver: zodResolver(timeLogCreateSchema),
    defaultValues: { hours: '', workedOn: todayIso(), note: '', findingId: null },
  });
  const e = formState.errors;
  const submit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (v) => {
      await log.mutateAsync(v);
      reset({ hours: '', workedOn: v.workedOn, note: '', findingId: null });
    }),
  );
  const mayChange = (t: TimeLogDto) => canLog && (canChangeAll || (userId !== undefined && t.userId === userId));
  return (
    <div className="flex flex-col gap-4">
      {canLog ? (
        <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label={W.log}>
          <FormErrorSummary message={summary} errors={e} labels={LABELS} />
          <div className="grid grid-cols-2 gap-3">
            <TextField label={LABELS.hours} inputMode="decimal" required hint={W.hoursHint} error={e.hours?.message} {...register('hours')} />
            <TextField label={LABELS.workedOn} type="date" required error={e.workedOn?.message} {...register('workedOn')} />
          </div>
          <TextField label={LABELS.note} autoComplete="off" error={e.note?.message} {...register('note')} />
          <div>
            <Button type="submit" size="lg" busy={formState.isSubmitting}>
              {W.log}
            </Button>
          </div>
        </form>
      ) : null}
      {said ? (
        <p role="status" className="text-sm font-semibold">
          {said}
        </p>
      ) : null}
      {entries.length === 0 ? (
        <p className="text-sm text-slate-soft">{W.none}</p>
      ) : (
        <ul className="divide-y divide-seam text-sm">
          {entries.map((t) => (
            <li key={t.id} className="py-2" data-time-entry={t.id}>
              <TimeEntry jobId={jobId} entry={t} canChange={mayChange(t)} onDone={setSaid} />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function TimeEntry({ jobId, entry, canChange, onDone }: { jobId: string; entry: TimeLogDto; canChange: boolean; onDone: (said: string) => void }) {
  const [mode, setMode] = useState<'view' | 'edit' | 'remove'>('view');
  const [problem, setProblem] = useState<string | null>(null);
  const { update, remove } = useChangeTime(jobId);
  const explain = (err: unknown) => setProblem(isApiError(err) ? (err.code === 'stale_version' ? W.stale : err.message) : W.failed);

  if (mode === 'edit') {
    return (
      <EditEntry
        entry={entry}
        busy={update.isPending}
        onCancel={() => setMode('view')}
        onSave={async (body) => {
          setProblem(null);
          try {
            await update.mutateAsync({ timeId: entry.id, body });
            setMode('view');
            onDone(W.changed);
            return null;
          } catch (err) {
            if (isApiError(err) && err.code === 'validation_failed') return err;
            explain(err);
            setMode('view');
            return null;
          }
        }}
      />
    );
  }

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap justify-between gap-2">
        <span>
          <span className="font-semibold">{entry.userName}</span> · {formatDate(entry.workedOn)}
          {entry.note ? <span className="block text-slate-soft">{entry.note}</span> : null}
        </span>
        <span className="tabular-nums">{formatHours(entry.hours)}</span>
      </div>
      {problem ? (
        <p role="alert" className="font-semibold text-fault">
          {problem}
        </p>
      ) : null}
      {mode === 'remove' ? (
        <div role="group" aria-label={`${W.remove}: ${formatHours(entry.hours)}, ${formatDate(entry.workedOn)}`} className="flex flex-col gap-2 rounded-control border border-seam-strong bg-cloth-raised p-3">
          <p>{W.removeQuestion(formatHours(entry.hours), formatDate(entry.workedOn))}</p>
          <div className="flex flex-wrap gap-2">
            <Button
              variant="secondary"
              busy={remove.isPending}
              onClick={async () => {
                setProblem(null);
                try {
                  await remove.mutateAsync({ timeId: entry.id, body: { version: entry.version } });
                  onDone(W.removed);
                } catch (err) {
                  explain(err);
                  setMode('view');
                }
              }}
            >
              {W.removeYes}
            </Button>
            <Button variant="quiet" onClick={() => setMode('view')}>
              {W.keep}
            </Button>
          </div>
        </div>
      ) : canChange ? (
        <div className="flex flex-wrap gap-2">
          <Button variant="quiet" aria-label={`${W.change} ${formatHours(entry.hours)} on ${formatDate(entry.workedOn)}`} onClick={() => setMode('edit')}>
            {W.change}
          </Button>
          <Button variant="quiet" aria-label={`${W.remove} ${formatHours(entry.hours)} on ${formatDate(entry.workedOn)}`} onClick={() => setMode('remove')}>
            {W.remove}
          </Button>
        </div>
      ) : null}
    </div>
  );
}

type UpdateIn = z.input<typeof timeLogUpdateSchema>;
type UpdateOut = z.output<typeof timeLogUpdateSchema>;

function EditEntry({
  entry,
  busy,
  onCancel,
  onSave,
}: {
  entry: TimeLogDto;
  busy: boolean;
  onCancel: () => void;
  /** Returns the server's validation error to show beside the fields, or null when done. */
  onSave: (body: UpdateOut) => Promise<unknown>;
}) {
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<UpdateIn, unknown, UpdateOut>({
    resolver: zodResolver(timeLogUpdateSchema),
    defaultValues: { version: entry.version, hours: entry.hours.replace(/\.00$/, ''), workedOn: entry.workedOn, note: entry.note },
  });
  const e = formState.errors;
  const submit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (v) => {
      const err = await onSave(v);
      if (err) throw err;
    }),
  );
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label={`${W.change}: ${formatDate(entry.workedOn)}`}>
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <div className="grid grid-cols-2 gap-3">
        <TextField label={LABELS.hours} inputMode="decimal" required hint={W.hoursHint} error={e.hours?.message} {...register('hours')} />
        <TextField label={LABELS.workedOn} type="date" required error={e.workedOn?.message} {...register('workedOn')} />
      </div>
      <TextField label={LABELS.note} autoComplete="off" error={e.note?.message} {...register('note')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={busy}>
          {W.save}
        </Button>
        <Button variant="quiet" onClick={onCancel}>
          {W.cancel}
        </Button>
      </div>
    </form>
  );
}
