import { zodResolver } from '@hookform/resolvers/zod';
import { JOB_TYPES, JOB_TYPE_LABELS, jobUpdateSchema, type JobDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { useUpdateJob } from '../api/update-job';

const LABELS = { title: 'Title', type: 'Kind of work', bookedInOn: 'Booked in on', dueOn: 'Due back', notes: 'Notes' };

/** Edits carry the version the person started from; a newer save by someone else is refused. */
export function JobEditForm({ job, onDone }: { job: JobDto; onDone: (notice?: string) => void }) {
  const [summary, setSummary] = useState<string | null>(null);
  const update = useUpdateJob(job.id);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof jobUpdateSchema>, unknown, z.output<typeof jobUpdateSchema>>({
    resolver: zodResolver(jobUpdateSchema),
    defaultValues: { version: job.version, title: job.title, type: job.type, bookedInOn: job.bookedInOn, dueOn: job.dueOn, notes: job.notes },
  });
  const e = formState.errors;

  const submit = handleSubmit(
    withServerErrors(
      setError,
      setSummary,
      Object.keys(LABELS),
      async (values) => {
        await update.mutateAsync(values);
        onDone();
      },
      (err) => {
        if (!(isApiError(err) && err.code === 'stale_version')) return false;
        onDone('Someone else changed this job while you were editing, so your change was not saved. The page now shows their version; make your change again.');
        return true;
      },
    ),
  );

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <TextField label={LABELS.title} required error={e.title?.message} {...register('title')} />
      <SelectField label={LABELS.type} error={e.type?.message} {...register('type')}>
        {JOB_TYPES.map((t) => (
          <option key={t} value={t}>
            {JOB_TYPE_LABELS[t]}
          </option>
        ))}
      </SelectField>
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={LABELS.bookedInOn} type="date" error={e.bookedInOn?.message} {...register('bookedInOn')} />
        <TextField label={LABELS.dueOn} type="date" error={e.dueOn?.message} {...register('dueOn', { setValueAs: (v: unknown) => (v === '' || v == null ? null : v) })} />
      </div>
      <TextAreaField label={LABELS.notes} rows={3} error={e.notes?.message} {...register('notes')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          Save changes
        </Button>
        <Button variant="secondary" onClick={() => onDone()}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
