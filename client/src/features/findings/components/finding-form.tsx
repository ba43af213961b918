import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, describeLimit, findingCreateSchema, type ChecklistLimit, type FindingCategory, type FindingCreateInput, type PartDto, type WorkshopDto } from '@wingstage/shared';
import { useState, type ReactNode } from 'react';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { PickerField } from '@/components/ui/picker-field';
import { partPickerSource } from '@/lib/catalogue-pickers';
import { withServerErrors } from '@/lib/form-errors';
import { CategoryChoice } from './category-choice';
import { PhotoPicker } from './photo-picker';

type FormIn = z.input<typeof findingCreateSchema>;
type FormOut = z.output<typeof findingCreateSchema>;
const LABELS = { title: 'Title', location: 'Where on the aircraft', category: 'Category', seen: 'What was seen', 'remedy.hours': 'Hours', 'remedy.accessTask': 'Access task' };
const nullable = { setValueAs: (v: unknown) => (v === '' || v == null ? null : String(v)) };

export interface FindingPrefill {
  title?: string;
  location?: string;
  seen?: string;
  checklistItemId?: string | null;
  measuredValue?: string | null;
  limit?: ChecklistLimit | null;
}

export function FindingForm({
  prefill,
  workshop,
  onSubmit,
  onCancel,
  sending,
}: {
  prefill?: FindingPrefill;
  workshop: Pick<WorkshopDto, 'labourRates'>;
  /** Receives the checked values and the photos chosen (kept here if it throws, so nothing is lost). */
  onSubmit: (v: FormOut, photos: File[]) => Promise<unknown>;
  onCancel: () => void;
  /** Shown by the submit button while the photos go up after the finding is saved. */
  sending?: ReactNode;
}) {
  const [summary, setSummary] = useState<string | null>(null);
  const [photos, setPhotos] = useState<File[]>([]);
  const { register, handleSubmit, control, setError, formState } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(findingCreateSchema),
    defaultValues: {
      title: prefill?.title ?? '',
      location: prefill?.location ?? '',
      seen: prefill?.seen ?? '',
      checklistItemId: prefill?.checklistItemId ?? null,
      measuredValue: prefill?.measuredValue ?? null,
      remedy: { description: '', hours: null, labourRateCode: workshop.labourRates[0]?.code ?? null, parts: [], accessTask: null },
    } satisfies Partial<FindingCreateInput>,
  });
  const remedyParts = useFieldArray({ control, name: 'remedy.parts' });
  const category = useWatch({ control, name: 'category' }) as FindingCategory | undefined;
  const e = formState.errors;

  const submit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (v) => {
      await onSubmit(v, photos);
    }),
  );

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Raise finding">
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      {prefill?.measuredValue && prefill.limit ? (
        <p className="rounded-control border border-seam-strong bg-cloth-sunk px-3 py-2 text-sm tabular-nums">
          Measured <strong>{prefill.measuredValue} {prefill.limit.unit}</strong> against the example limit{' '}
          ({describeLimit(prefill.limit)}); both are recorded with the finding.
        </p>
      ) : null}
      <TextField label={LABELS.title} required autoComplete="off" error={e.title?.message} {...register('title')} />
      <TextField label={LABELS.location} required autoComplete="off" hint="e.g. Engine, cylinder 2, lower plug" error={e.location?.message} {...register('location')} />
      <CategoryChoice current={category ?? null} error={e.category?.message} {...register('category')} />
      <TextAreaField label={LABELS.seen} required rows={4} maxChars={TEXT_MAX.seen} error={e.seen?.message} {...register('seen')} />

      <fieldset className="flex flex-col gap-3 rounded-card border border-seam p-3">
        <legend className="px-1 font-semibold">Photos</legend>
        <PhotoPicker files={photos} onChange={setPhotos} disabled={formState.isSubmitting} />
      </fieldset>

      <fieldset className="flex flex-col gap-3 rounded-card border border-seam p-3">
        <legend className="px-1 font-semibold">Proposed remedy</legend>
        <TextAreaField label="What should be done" rows={2} maxChars={TEXT_MAX.remedy} error={e.remedy?.description?.message} {...register('remedy.description')} />
        <div className="grid grid-cols-2 gap-3">
          <TextField label={LABELS['remedy.hours']} inputMode="decimal" error={e.remedy?.hours?.message} {...register('remedy.hours', nullable)} />
          <SelectField label="Labour rate" {...register('remedy.labourRateCode', nullable)}>
            {workshop.labourRates.map((r) => (
              <option key={r.code} value={r.code}>
                {r.name}
              </option>
            ))}
          </SelectField>
        </div>
        <TextField
          label={LABELS['remedy.accessTask']}
          hint="The opening-up this needs, e.g. “Cowlings off”. Name it the same as on other findings so it is charged once."
          autoComplete="off"
          error={e.remedy?.accessTask?.message}
          {...register('remedy.accessTask', nullable)}
        />
        <div className="flex flex-col gap-2">
          <p className="text-sm font-semibold">Parts</p>
          {remedyParts.fields.map((f, i) => (
            <div key={f.id} className="grid grid-cols-[1fr_5rem] items-end gap-2">
              <PickerField<PartDto, FormIn>
                control={control}
                name={`remedy.parts.${i}.partId`}
                label={`Part ${i + 1}`}
                source={partPickerSource}
                placeholder="Type a part number or name"
                error={e.remedy?.parts?.[i]?.partId ? 'Choose a part from the catalogue.' : undefined}
              />
              <TextField label="Qty" inputMode="decimal" error={e.remedy?.parts?.[i]?.quantity?.message} {...register(`remedy.parts.${i}.quantity`)} />
              <Button variant="quiet" className="col-span-2 justify-self-end" onClick={() => remedyParts.remove(i)}>
                Remove part {i + 1}
              </Button>
            </div>
          ))}
          <div>
            <Button variant="secondary" size="lg" onClick={() => remedyParts.append({ partId: '', quantity: '1' })}>
              + Part from the catalogue
            </Button>
          </div>
        </div>
      </fieldset>
      {sending}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" size="lg" busy={formState.isSubmitting}>
          Raise finding
        </Button>
        {/* Not while saving: the finding may already exist and its photos be on their way. */}
        <Button variant="secondary" size="lg" onClick={onCancel} disabled={formState.isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
