import { zodResolver } from '@hookform/resolvers/zod';
import { timeLogCreateSchema, type TimeLogDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { formatDate, formatHours, todayIso } from '@/lib/format';
import { useLogTime } from '../api/record-work';

const LABELS = { hours: 'Hours', workedOn: 'Date', note: 'What you did' };

export function TimeLog({ jobId, entries, canLog }: { jobId: string; entries: TimeLogDto[]; canLog: boolean }) {
  const log = useLogTime(jobId);
  const [summary, setSummary] = useState<string | null>(null);
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
  return (
    <div className="flex flex-col gap-4">
      {canLog ? (
        <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label="Log time">
          <FormErrorSummary message={summary} errors={e} labels={LABELS} />
          <div className="grid grid-cols-2 gap-3">
            <TextField label={LABELS.hours} inputMode="decimal" required error={e.hours?.message} {...register('hours')} />
            <TextField label={LABELS.workedOn} type="date" required error={e.workedOn?.message} {...register('workedOn')} />
          </div>
          <TextField label={LABELS.note} autoComplete="off" error={e.note?.message} {...register('note')} />
          <div>
            <Button type="submit" size="lg" busy={formState.isSubmitting}>
              Log time
            </Button>
          </div>
        </form>
      ) : null}
      {entries.length === 0 ? (
        <p className="text-sm text-slate-soft">No time logged yet.</p>
      ) : (
        <ul className="divide-y divide-seam text-sm">
          {entries.map((t) => (
            <li key={t.id} className="flex flex-wrap justify-between gap-2 py-2">
              <span>
                <span className="font-semibold">{t.userName}</span> · {formatDate(t.workedOn)}
                {t.note ? <span className="block text-slate-soft">{t.note}</span> : null}
              </span>
              <span className="tabular-nums">{formatHours(t.hours)}</span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
