import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, JOB_TYPES, JOB_TYPE_LABELS, jobCreateSchema, type JobCreate, type JobType, type TemplateSummaryDto } from '@wingstage/shared';
import { useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { ButtonLink } from '@/components/ui/button-link';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { PickerField } from '@/components/ui/picker-field';
import type { PickerSource } from '@/components/ui/search-picker';
import { FormErrorSummary } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { todayIso } from '@/lib/format';

const LABELS = { aircraftId: 'Aircraft', templateId: 'Start from a template', title: 'Title', type: 'Kind of work', bookedInOn: 'Booked in on', dueOn: 'Due back', notes: 'Notes' };

export function BookInForm<A>({
  aircraft,
  defaultAircraftId,
  cancelTo,
  onSubmit,
  templates = [],
}: {
  templates?: TemplateSummaryDto[];
  /** Searches the workshop's aircraft on the server; a fleet of any size can be picked from. */
  aircraft: PickerSource<A>;
  defaultAircraftId?: string;
  cancelTo: string;
  onSubmit: (values: JobCreate) => Promise<unknown>;
}) {
  const [summary, setSummary] = useState<string | null>(null);
  const lastType = useRef<JobType>('annual_permit_inspection');
  // The title a template filled in, so a later template choice may replace it but never a typed one.
  const lastTemplateTitle = useRef<string | null>(null);
  const { register, control, handleSubmit, setError, setValue, getValues, formState } = useForm<z.input<typeof jobCreateSchema>, unknown, z.output<typeof jobCreateSchema>>({
    resolver: zodResolver(jobCreateSchema),
    defaultValues: { aircraftId: defaultAircraftId ?? '', templateId: null, title: JOB_TYPE_LABELS.annual_permit_inspection, type: 'annual_permit_inspection', bookedInOn: todayIso(), dueOn: null, notes: '' },
  });
  const e = formState.errors;

  const submit = handleSubmit(withServerErrors(setError, setSummary, Object.keys(LABELS), onSubmit));

  return (
    <form onSubmit={submit} noValidate className="flex max-w-2xl flex-col gap-4">
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <PickerField
        control={control}
        name="aircraftId"
        label={LABELS.aircraftId}
        required
        source={aircraft}
        placeholder="Type a registration, type or owner"
        error="Choose the aircraft."
      />
      {templates.length > 0 ? (
        <SelectField
          label={LABELS.templateId}
          hint="Copies the template's inspection scope into the estimate and its checklist onto the job."
          error={e.templateId?.message}
          {...register('templateId', {
            setValueAs: (v: unknown) => (v === '' || v == null ? null : v),
            onChange: (ev: React.ChangeEvent<HTMLSelectElement>) => {
              const t = templates.find((x) => x.id === ev.target.value);
              if (!t) return;
              setValue('type', t.jobType);
              const title = getValues('title');
              // Validating as it fills clears a "give the job a title" message left from an earlier try.
              if (!title || title === JOB_TYPE_LABELS[lastType.current] || title === lastTemplateTitle.current) setValue('title', t.name, { shouldValidate: true });
              lastTemplateTitle.current = t.name;
              lastType.current = t.jobType;
            },
          })}
        >
          <option value="">No template (empty estimate and checklist)</option>
          {templates.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name}
            </option>
          ))}
        </SelectField>
      ) : null}
      <SelectField
        label={LABELS.type}
        required
        error={e.type?.message}
        {...register('type', {
          // The kind of work doubles as the title until someone types a title of their own.
          onChange: (ev: React.ChangeEvent<HTMLSelectElement>) => {
            const next = ev.target.value as JobType;
            const title = getValues('title');
            if (!title || title === JOB_TYPE_LABELS[lastType.current]) setValue('title', JOB_TYPE_LABELS[next] ?? '', { shouldValidate: true });
            lastType.current = next;
          },
        })}
      >
        {JOB_TYPES.map((t) => (
          <option key={t} value={t}>
            {JOB_TYPE_LABELS[t]}
          </option>
        ))}
      </SelectField>
      <TextField label={LABELS.title} required autoComplete="off" error={e.title?.message} {...register('title')} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={LABELS.bookedInOn} type="date" required error={e.bookedInOn?.message} {...register('bookedInOn')} />
        <TextField
          label={LABELS.dueOn}
          type="date"
          error={e.dueOn?.message}
          {...register('dueOn', { setValueAs: (v: unknown) => (v === '' || v == null ? null : v) })}
        />
      </div>
      <TextAreaField label={LABELS.notes} rows={3} maxChars={TEXT_MAX.jobNotes} error={e.notes?.message} {...register('notes')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          Book in
        </Button>
        <ButtonLink to={cancelTo} variant="secondary">
          Cancel
        </ButtonLink>
      </div>
    </form>
  );
}
