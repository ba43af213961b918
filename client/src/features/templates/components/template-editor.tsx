import { zodResolver } from '@hookform/resolvers/zod';
import {
  CAUTION_MAX,
  TEXT_MAX,
  confirmLargeMessage,
  largeFigures,
  JOB_TYPES,
  JOB_TYPE_LABELS,
  LIMIT_UNITS,
  LINE_KINDS,
  templateSaveSchema,
  VAT_RATE_CODES,
  type LineKind,
  type PartDto,
  type SupplierDto,
  type TemplateDto,
  type WorkshopDto,
} from '@wingstage/shared';
import { useState } from 'react';
import { useFieldArray, useForm, useWatch, type Control, type FieldErrors, type UseFormGetValues, type UseFormRegister, type UseFormSetValue } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { PickerField } from '@/components/ui/picker-field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { partPickerSource, supplierPickerSource, type SupplierOption } from '@/lib/catalogue-pickers';
import { useTemplateLineRecords } from '@/features/templates/api/get-line-records';
import { LINE_KIND_LABELS } from '@/lib/line-kinds';
import { isApiError } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { VAT_RATE_LABELS } from '@/lib/pricing-preview';

type FormIn = z.input<typeof templateSaveSchema>;
type FormOut = z.output<typeof templateSaveSchema>;
const LABELS = { name: 'Name', jobType: 'Kind of work', description: 'Description', lines: 'Scope lines', checklist: 'Checklist' };
const nullable = { setValueAs: (v: unknown) => (v === '' || v == null ? null : String(v)) };

export const EXAMPLE_LIMITS_CAUTION = "Limits in templates are examples: use the manufacturer's current data.";

export function TemplateEditor({
  template,
  workshop,
  onSave,
  onReload,
}: {
  template: TemplateDto | null;
  workshop: WorkshopDto;
  onSave: (values: FormOut) => Promise<unknown>;
  /** After a stale save: fetch the other person's version (the form is rebuilt from it). */
  onReload: () => void;
}) {
  const [summary, setSummary] = useState<string | null>(null);
  const [stale, setStale] = useState(false);
  /** Figures larger than a light-aircraft job usually needs, shown for confirmation before saving. */
  const [large, setLarge] = useState<string | null>(null);
  const { register, handleSubmit, control, setError, setValue, getValues, formState } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(templateSaveSchema),
    defaultValues: {
      name: template?.name ?? '',
      jobType: template?.jobType ?? 'annual_permit_inspection',
      description: template?.description ?? '',
      lines: template?.lines ?? [],
      checklist: template?.checklist ?? [],
      active: template?.active ?? true,
    },
  });
  const lines = useFieldArray({ control, name: 'lines' });
  const checklist = useFieldArray({ control, name: 'checklist' });
  const e = formState.errors;
  // Names for the parts and suppliers the saved lines already hold; the pickers search for the rest.
  const named = useTemplateLineRecords(template?.lines ?? []);

  const save = async (v: FormOut) => {
    setSummary(null);
    setStale(false);
    setLarge(null);
    if (!v.confirmLarge) {
      const found = largeFigures(v.lines);
      if (found.length > 0) {
        setLarge(confirmLargeMessage(found));
        return;
      }
    }
    try {
      await onSave(v);
    } catch (err) {
      if (isApiError(err) && err.code === 'stale_version') {
        setStale(true);
        return;
      }
      if (isApiError(err) && err.fields.confirmLarge) {
        setLarge(err.fields.confirmLarge);
        return;
      }
      setSummary(applyServerErrors(err, setError, Object.keys(LABELS)));
    }
  };
  const submit = handleSubmit((v) => save({ ...v, confirmLarge: false }));
  const submitConfirmed = handleSubmit((v) => save({ ...v, confirmLarge: true }));

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-5">
      {stale ? (
        <Notice tone="problem" title="Not saved: someone else changed this template">
          <p>Another person saved this template after you opened it. Your changes are still in the form below; load their version to see what they changed, then make your edits again.</p>
          <div className="mt-2">
            <Button variant="secondary" onClick={onReload}>
              Load their version
            </Button>
          </div>
        </Notice>
      ) : null}
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      {large ? (
        <div data-testid="confirm-large">
          <Notice title="Check these figures before saving">
            <p>{large}</p>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button onClick={() => void submitConfirmed()}>They are right: save</Button>
              <Button variant="secondary" onClick={() => setLarge(null)}>
                Let me correct them
              </Button>
            </div>
          </Notice>
        </div>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={LABELS.name} required autoComplete="off" error={e.name?.message} {...register('name')} />
        <SelectField label={LABELS.jobType} error={e.jobType?.message} {...register('jobType')}>
          {JOB_TYPES.map((t) => (
            <option key={t} value={t}>
              {JOB_TYPE_LABELS[t]}
            </option>
          ))}
        </SelectField>
      </div>
      <TextAreaField label={LABELS.description} rows={2} maxChars={TEXT_MAX.templateDescription} error={e.description?.message} {...register('description')} />
      <label className="flex min-h-11 items-center gap-2">
        <input type="checkbox" className="size-5" {...register('active')} />
        Offered when booking in
      </label>

      <fieldset className="flex flex-col gap-3 rounded-card border border-seam p-3 sm:p-4">
        <legend className="px-1 text-lg font-semibold">Inspection scope</legend>
        <p className="text-sm text-slate-soft">These lines become the job's inspection scope when it is booked in, priced with the workshop's rates on that day.</p>
        {lines.fields.length === 0 ? <p className="text-sm">No scope lines yet.</p> : null}
        <ol className="flex flex-col gap-3">
          {lines.fields.map((f, i) => (
            <li key={f.id} className="rounded-control border border-seam bg-cloth p-3">
              <ScopeLineFields
                index={i}
                control={control}
                register={register}
                getValues={getValues}
                setValue={setValue}
                workshop={workshop}
                parts={named.parts}
                suppliers={named.suppliers}
                errors={e.lines?.[i]}
              />
              <RowTools
                label={`scope line ${i + 1}`}
                first={i === 0}
                last={i === lines.fields.length - 1}
                onUp={() => lines.move(i, i - 1)}
                onDown={() => lines.move(i, i + 1)}
                onRemove={() => lines.remove(i)}
              />
            </li>
          ))}
        </ol>
        <div className="flex flex-wrap gap-2">
          {LINE_KINDS.map((k) => (
            <Button
              key={k}
              variant="secondary"
              onClick={() =>
                lines.append({
                  kind: k,
                  description: '',
                  quantity: '1',
                  labourRateCode: k === 'labour' ? (workshop.labourRates[0]?.code ?? null) : null,
                  partId: null,
                  supplierId: null,
                  amount: null,
                  vatRate: 'standard',
                  caution: '',
                })
              }
            >
              Add {LINE_KIND_LABELS[k].toLowerCase()} line
            </Button>
          ))}
        </div>
      </fieldset>

      <fieldset className="flex flex-col gap-3 rounded-card border border-seam p-3 sm:p-4">
        <legend className="px-1 text-lg font-semibold">Checklist</legend>
        <Notice title="Example limits">
          <p>{EXAMPLE_LIMITS_CAUTION}</p>
        </Notice>
        {checklist.fields.length === 0 ? <p className="text-sm">No checklist items yet.</p> : null}
        <ol className="flex flex-col gap-3">
          {checklist.fields.map((f, i) => (
            <li key={f.id} className="rounded-control border border-seam bg-cloth p-3">
              <ChecklistItemFields
                index={i}
                control={control}
                register={register}
                errors={e.checklist?.[i]}
                onLimit={(on) => setValue(`checklist.${i}.limit`, on ? { min: null, max: null, unit: 'mm', source: 'Example only: use the manufacturer’s current data' } : null)}
              />
              <RowTools
                label={`checklist item ${i + 1}`}
                first={i === 0}
                last={i === checklist.fields.length - 1}
                onUp={() => checklist.move(i, i - 1)}
                onDown={() => checklist.move(i, i + 1)}
                onRemove={() => checklist.remove(i)}
              />
            </li>
          ))}
        </ol>
        <div>
          <Button variant="secondary" onClick={() => checklist.append({ section: '', text: '', limit: null, caution: '' })}>
            Add checklist item
          </Button>
        </div>
      </fieldset>

      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          Save template
        </Button>
      </div>
    </form>
  );
}

function RowTools({ label, first, last, onUp, onDown, onRemove }: { label: string; first: boolean; last: boolean; onUp: () => void; onDown: () => void; onRemove: () => void }) {
  return (
    <div className="mt-2 flex flex-wrap gap-2">
      <Button variant="quiet" disabled={first} onClick={onUp} aria-label={`Move ${label} up`}>
        ↑ Up
      </Button>
      <Button variant="quiet" disabled={last} onClick={onDown} aria-label={`Move ${label} down`}>
        ↓ Down
      </Button>
      <Button variant="quiet" onClick={onRemove} aria-label={`Remove ${label}`} className="ml-auto">
        Remove
      </Button>
    </div>
  );
}

type LineErrors = NonNullable<FieldErrors<FormIn>['lines']>[number];
type ItemErrors = NonNullable<FieldErrors<FormIn>['checklist']>[number];

function ScopeLineFields({
  index: i,
  control,
  register,
  getValues,
  setValue,
  workshop,
  parts,
  suppliers,
  errors,
}: {
  index: number;
  control: Control<FormIn>;
  register: UseFormRegister<FormIn>;
  getValues: UseFormGetValues<FormIn>;
  setValue: UseFormSetValue<FormIn>;
  workshop: WorkshopDto;
  /** The saved lines' parts and suppliers, only to label the values the form opens with. */
  parts: PartDto[];
  suppliers: SupplierDto[];
  errors: LineErrors;
}) {
  const kind = useWatch({ control, name: `lines.${i}.kind` }) as LineKind;
  const partId = useWatch({ control, name: `lines.${i}.partId` });
  const supplierId = useWatch({ control, name: `lines.${i}.supplierId` });
  return (
    <div className="grid gap-3 sm:grid-cols-6">
      <SelectField label="Kind" className="sm:col-span-1" {...register(`lines.${i}.kind`)}>
        {LINE_KINDS.map((k) => (
          <option key={k} value={k}>
            {LINE_KIND_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <div className="sm:col-span-3">
        <TextField label="Description" required error={errors?.description?.message} {...register(`lines.${i}.description`)} />
      </div>
      <div className="sm:col-span-2">
        <TextField label={kind === 'labour' ? 'Hours' : 'Quantity'} inputMode="decimal" error={errors?.quantity?.message} {...register(`lines.${i}.quantity`)} />
      </div>
      {kind === 'labour' ? (
        <div className="sm:col-span-3">
          <SelectField label="Labour rate" {...register(`lines.${i}.labourRateCode`, nullable)}>
            {workshop.labourRates.map((r) => (
              <option key={r.code} value={r.code}>
                {r.name} ({r.ratePerHour}/h)
              </option>
            ))}
          </SelectField>
        </div>
      ) : null}
      {kind === 'part' ? (
        <div className="sm:col-span-3">
          <PickerField<PartDto, FormIn>
            control={control}
            name={`lines.${i}.partId`}
            empty={null}
            label="Catalogue part"
            source={partPickerSource}
            selected={parts.find((p) => p.id === partId) ?? null}
            placeholder="None — type to search"
            error={errors?.partId?.message}
            onPick={(p) => {
              // A blank description takes the part's own; one already written is kept.
              if (p && !String(getValues(`lines.${i}.description`) ?? '').trim()) setValue(`lines.${i}.description`, p.description, { shouldValidate: true });
            }}
          />
        </div>
      ) : null}
      {kind === 'subcontract' ? (
        <div className="sm:col-span-3">
          <PickerField<SupplierOption, FormIn>
            control={control}
            name={`lines.${i}.supplierId`}
            empty={null}
            label="Supplier"
            source={supplierPickerSource}
            selected={suppliers.find((s) => s.id === supplierId) ?? null}
            placeholder="Choose later — type to search"
            error={errors?.supplierId?.message}
          />
        </div>
      ) : null}
      {kind !== 'labour' ? (
        <div className="sm:col-span-2">
          <TextField
            label={kind === 'fee' ? 'Fee (excl. VAT)' : kind === 'subcontract' ? "Supplier's cost (excl. VAT)" : 'Unit cost if not catalogued'}
            inputMode="decimal"
            error={errors?.amount?.message}
            {...register(`lines.${i}.amount`, nullable)}
          />
        </div>
      ) : null}
      <div className="sm:col-span-1">
        <SelectField label="VAT" {...register(`lines.${i}.vatRate`)}>
          {VAT_RATE_CODES.map((c) => (
            <option key={c} value={c}>
              {VAT_RATE_LABELS[c]}
            </option>
          ))}
        </SelectField>
      </div>
      <div className="sm:col-span-6">
        <TextAreaField
          label="Caution (hazard in this work)"
          hint="Shown to the engineers in the hangar for jobs booked from this template. Leave empty when there is none."
          rows={2}
          maxChars={CAUTION_MAX}
          error={errors?.caution?.message}
          {...register(`lines.${i}.caution`)}
        />
      </div>
    </div>
  );
}

function ChecklistItemFields({
  index: i,
  control,
  register,
  errors,
  onLimit,
}: {
  index: number;
  control: Control<FormIn>;
  register: UseFormRegister<FormIn>;
  errors: ItemErrors;
  onLimit: (on: boolean) => void;
}) {
  const limit = useWatch({ control, name: `checklist.${i}.limit` });
  return (
    <div className="flex flex-col gap-3">
      <div className="grid gap-3 sm:grid-cols-[1fr_2fr]">
        <TextField label="Section" hint="e.g. Engine, Wing, Undercarriage" error={errors?.section?.message} {...register(`checklist.${i}.section`)} />
        <TextField label="What to check" required error={errors?.text?.message} {...register(`checklist.${i}.text`)} />
      </div>
      <label className="flex min-h-11 items-center gap-2">
        <input type="checkbox" className="size-5" checked={limit != null} onChange={(ev) => onLimit(ev.target.checked)} />
        Measured against a limit
      </label>
      {limit != null ? (
        <div className="grid gap-3 sm:grid-cols-4">
          <TextField label="Minimum" inputMode="decimal" error={errors?.limit?.min?.message} {...register(`checklist.${i}.limit.min`, nullable)} />
          <TextField label="Maximum" inputMode="decimal" error={errors?.limit?.max?.message} {...register(`checklist.${i}.limit.max`, nullable)} />
          <SelectField label="Unit" {...register(`checklist.${i}.limit.unit`)}>
            {LIMIT_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </SelectField>
          <TextField label="Where the figure comes from" error={errors?.limit?.source?.message} {...register(`checklist.${i}.limit.source`)} />
        </div>
      ) : null}
      <TextAreaField
        label="Caution (hazard to the people doing this check)"
        hint="Shown to the engineer beside the item, e.g. treat the propeller as live; no ignition sources near fuel. Leave empty when there is none."
        rows={2}
        maxChars={CAUTION_MAX}
        error={errors?.caution?.message}
        {...register(`checklist.${i}.caution`)}
      />
    </div>
  );
}
