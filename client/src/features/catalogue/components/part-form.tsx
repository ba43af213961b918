import { zodResolver } from '@hookform/resolvers/zod';
import { partCreateSchema, VAT_RATE_CODES, type PartDto, type WorkshopPricing } from '@wingstage/shared';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { PickerField } from '@/components/ui/picker-field';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { formatMoney, moneyForInput } from '@/lib/format';
import { partSellPrice, vatRateLabel } from '@/lib/pricing-preview';
import { supplierPickerSource, type SupplierOption } from '@/lib/catalogue-pickers';
import { useSavePart } from '../api/save-part';

const LABELS = {
  partNumber: 'Part number',
  description: 'Description',
  unitCost: 'Unit cost (excl. VAT)',
  unitPrice: 'Fixed sell price (excl. VAT)',
  markupPercent: 'Mark-up on cost (%)',
  vatRate: 'VAT rate',
  supplierId: 'Supplier',
  leadTimeDays: 'Lead time (days)',
};

type Mode = 'workshop' | 'markup' | 'fixed';
type FormIn = z.input<typeof partCreateSchema>;
type FormOut = z.output<typeof partCreateSchema>;

export function PartForm({ part, pricing, onDone }: { part: PartDto | null; pricing: WorkshopPricing; onDone: (saved: PartDto | null) => void }) {
  const save = useSavePart();
  const [summary, setSummary] = useState<string | null>(null);
  const [mode, setMode] = useState<Mode>(part?.unitPrice ? 'fixed' : part?.markupPercent ? 'markup' : 'workshop');
  const { register, handleSubmit, setError, setValue, control, formState } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(partCreateSchema),
    defaultValues: {
      partNumber: part?.partNumber ?? '',
      description: part?.description ?? '',
      unitCost: part ? moneyForInput(part.unitCost) : '',
      unitPrice: part?.unitPrice ? moneyForInput(part.unitPrice) : null,
      markupPercent: part?.markupPercent ?? null,
      vatRate: part?.vatRate ?? 'standard',
      supplierId: part?.supplierId ?? null,
      leadTimeDays: part?.leadTimeDays ?? 0,
    },
  });
  const e = formState.errors;
  const watched = useWatch({ control });
  const sell = partSellPrice(
    { unitCost: watched.unitCost ?? '', unitPrice: watched.unitPrice ?? null, markupPercent: watched.markupPercent ?? null, vatRate: watched.vatRate ?? 'standard' },
    pricing,
  );

  const chooseMode = (m: Mode) => {
    setMode(m);
    // Only one way of setting the price is stored, so the other field is cleared.
    if (m !== 'fixed') setValue('unitPrice', null);
    if (m !== 'markup') setValue('markupPercent', null);
  };

  const submit = handleSubmit(
    withServerErrors(
      setError,
      setSummary,
      Object.keys(LABELS),
      async (v) => {
        const saved = part ? await save.mutateAsync({ id: part.id, body: { ...v, version: part.version } }) : await save.mutateAsync({ id: null, body: v });
        onDone(saved);
      },
      (err) => {
        if (!(isApiError(err) && err.code === 'stale_version')) return false;
        setSummary('Someone else changed this part while you were editing. Close the form and open it again to see their version.');
        return true;
      },
    ),
  );

  const nullable = { setValueAs: (v: unknown) => (v === '' || v == null ? null : String(v)) };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label={part ? `Edit part ${part.partNumber}` : 'Add a part'}>
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <div className="grid gap-4 sm:grid-cols-[1fr_2fr]">
        <TextField label={LABELS.partNumber} required autoComplete="off" error={e.partNumber?.message} {...register('partNumber')} />
        <TextField label={LABELS.description} required autoComplete="off" error={e.description?.message} {...register('description')} />
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <TextField label={LABELS.unitCost} required inputMode="decimal" error={e.unitCost?.message} {...register('unitCost')} />
        <SelectField label={LABELS.vatRate} error={e.vatRate?.message} {...register('vatRate')}>
          {VAT_RATE_CODES.map((c) => (
            <option key={c} value={c}>
              {vatRateLabel(c, pricing)}
            </option>
          ))}
        </SelectField>
        <TextField
          label={LABELS.leadTimeDays}
          type="number"
          min={0}
          max={365}
          inputMode="numeric"
          error={e.leadTimeDays?.message}
          {...register('leadTimeDays', { valueAsNumber: true })}
        />
      </div>
      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-semibold">How the sell price is set</legend>
        <div className="flex flex-wrap gap-x-5 gap-y-1">
          {(
            [
              ['workshop', `Workshop mark-up (${pricing.partsMarkupPercent}%)`],
              ['markup', 'Its own mark-up'],
              ['fixed', 'A fixed sell price'],
            ] as const
          ).map(([m, label]) => (
            <label key={m} className="flex min-h-11 items-center gap-2">
              <input type="radio" name="price-mode" className="size-5" checked={mode === m} onChange={() => chooseMode(m)} />
              {label}
            </label>
          ))}
        </div>
        {mode === 'markup' ? (
          <TextField label={LABELS.markupPercent} inputMode="decimal" error={e.markupPercent?.message} {...register('markupPercent', nullable)} />
        ) : null}
        {mode === 'fixed' ? <TextField label={LABELS.unitPrice} inputMode="decimal" error={e.unitPrice?.message} {...register('unitPrice', nullable)} /> : null}
      </fieldset>
      <p className="rounded-control bg-cloth-sunk px-3 py-2 tabular-nums" aria-live="polite">
        Sell price per unit:{' '}
        <strong data-testid="part-sell-price">{sell === null ? 'enter a valid cost' : formatMoney(sell, pricing.currency, { vat: 'excl' })}</strong>
      </p>
      <PickerField<SupplierOption, FormIn>
        control={control}
        name="supplierId"
        empty={null}
        label={LABELS.supplierId}
        source={supplierPickerSource}
        selected={part?.supplierId ? { id: part.supplierId, name: part.supplierName ?? '' } : null}
        placeholder="No supplier — type to search"
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          {part ? 'Save part' : 'Add part'}
        </Button>
        <Button variant="secondary" onClick={() => onDone(null)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
