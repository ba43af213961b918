import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, JOB_TYPES, JOB_TYPE_LABELS, jobUpdateSchema, type JobDto } from '@wingstage/shared';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { changedFields, TheirChangesNotice } from '@/components/ui/their-changes';
import { isApiError } from '@/lib/api-client';
import { formatDate } from '@/lib/format';
import { withServerErrors } from '@/lib/form-errors';
import { jobQueryOptions } from '../api/get-job';
import { useUpdateJob } from '../api/update-job';

const LABELS = { title: 'Title', type: 'Kind of work', bookedInOn: 'Booked in on', dueOn: 'Due back', notes: 'Notes' };
type Editable = keyof typeof LABELS;
type FormIn = z.input<typeof jobUpdateSchema>;

/** How one field reads to a person, for the "what they saved" list. */
function shown(field: Editable, v: unknown): string {
  if (field === 'type') return JOB_TYPE_LABELS[v as JobDto['type']] ?? String(v);
  if (field === 'bookedInOn' || field === 'dueOn') return formatDate(String(v));
  return String(v);
}

/** The fields where the other person's saved job differs from what this person started from. */
export const changedByOthers = (started: JobDto, theirs: JobDto) => changedFields<JobDto>(started, theirs, LABELS, (f, v) => shown(f as Editable, v));

/**
 * Edits carry the version the person started from. When someone else saved first, nothing typed
 * is lost: the form stays open with this person's changes, lists what the other person changed,
 * and lets them save theirs over it on purpose or drop theirs and take the saved job.
 */
export function JobEditForm({ job, onDone }: { job: JobDto; onDone: (notice?: string) => void }) {
  const [summary, setSummary] = useState<string | null>(null);
  const [started, setStarted] = useState(job);
  const [theirs, setTheirs] = useState<JobDto | null>(null);
  const update = useUpdateJob(job.id);
  const qc = useQueryClient();
  const valuesOf = (j: JobDto): FormIn => ({ version: j.version, title: j.title, type: j.type, bookedInOn: j.bookedInOn, dueOn: j.dueOn, notes: j.notes });
  const { register, handleSubmit, setError, setValue, reset, formState } = useForm<FormIn, unknown, z.output<typeof jobUpdateSchema>>({
    resolver: zodResolver(jobUpdateSchema),
    defaultValues: valuesOf(job),
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
        void qc.fetchQuery({ ...jobQueryOptions(job.id), staleTime: 0 }).then(
          (latest) => {
            setTheirs(latest);
            // The next save is a deliberate "mine over theirs", so it carries their version.
            setValue('version', latest.version);
          },
          () => setSummary('Someone else changed this job, and their version could not be loaded. Your changes are still here; try Save changes again.'),
        );
        return true;
      },
    ),
  );

  const takeTheirs = () => {
    if (!theirs) return;
    reset(valuesOf(theirs));
    setStarted(theirs);
    setTheirs(null);
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      {theirs ? <TheirChangesNotice what="job" changes={changedByOthers(started, theirs)} savedAt={theirs.updatedAt} onTakeTheirs={takeTheirs} /> : null}
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
      <TextAreaField label={LABELS.notes} rows={3} maxChars={TEXT_MAX.jobNotes} error={e.notes?.message} {...register('notes')} />
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
