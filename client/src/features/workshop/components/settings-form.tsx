import { zodResolver } from '@hookform/resolvers/zod';
import { APPROVAL_LINK_DAYS, CHASE_AFTER_HOURS, DEPOSIT_POLICY_KINDS, TEXT_MAX, VAT_ROUNDING_LABELS, VAT_ROUNDING_METHODS, workshopUpdateSchema, type WorkshopDto } from '@wingstage/shared';
import { useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/page';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { formatMoney } from '@/lib/format';
import { useUpdateWorkshop } from '../api/update-workshop';

// The rounding methods' words live in shared (vat-rounding-words.ts): the documents print them too.
const ROUNDING_LABELS = VAT_ROUNDING_LABELS;

const DEPOSIT_KIND_LABELS: Record<(typeof DEPOSIT_POLICY_KINDS)[number], string> = {
  none: 'No deposit',
  quote_percent: 'A share of the inspection quote, when the owner accepts it',
  approved_work_percent: 'A share of newly approved work, when it is worth more than a threshold',
};

const LABELS: Record<string, string> = {
  name: 'Workshop name',
  addressLines: 'Address',
  postcode: 'Postcode',
  vatNumber: 'VAT number',
  labourRates: 'Labour rates',
  'settings.vatRounding': 'How VAT is rounded',
  'settings.approvalLinkDays': 'Days an approval link works',
  'settings.chaseAfterHours': 'Hours before a reminder',
  'settings.contactPhone': 'Phone for owners',
  'settings.contactEmail': 'E-mail for owners',
  'settings.depositPolicy.kind': 'When a deposit is asked for',
  'settings.depositPolicy.percent': 'Deposit percentage',
  'settings.depositPolicy.threshold': 'Threshold',
};

const DECIMAL = /^\d+(\.\d{1,2})?$/;

type FormIn = z.input<typeof workshopUpdateSchema>;

/** What was typed, as a number for the schema: blank or not a number stays as NaN, which the schema explains. */
const wholeNumber = (v: unknown) => (typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' && /^-?\d+(\.\d+)?$/.test(v.trim()) ? Number(v.trim()) : Number.NaN);

const toForm = (w: WorkshopDto): FormIn => ({
  version: w.version,
  name: w.name,
  addressLines: w.addressLines,
  postcode: w.postcode,
  vatNumber: w.vatNumber,
  labourRates: w.labourRates,
  settings: {
    vatRounding: w.settings.vatRounding,
    approvalLinkDays: w.settings.approvalLinkDays,
    chaseAfterHours: w.settings.chaseAfterHours,
    contactPhone: w.settings.contactPhone,
    contactEmail: w.settings.contactEmail,
    depositPolicy: w.settings.depositPolicy,
  },
});

export function SettingsForm({ workshop }: { workshop: WorkshopDto }) {
  const [summary, setSummary] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const update = useUpdateWorkshop();
  const { register, control, handleSubmit, setError, reset, watch, formState } = useForm<FormIn, unknown, z.output<typeof workshopUpdateSchema>>({
    resolver: zodResolver(workshopUpdateSchema),
    defaultValues: toForm(workshop),
  });
  const rates = useFieldArray({ control, name: 'labourRates' });
  const e = formState.errors;
  // One error shape for the three kinds: the fields a kind lacks simply never carry an error.
  const de = e.settings?.depositPolicy as { kind?: { message?: string }; percent?: { message?: string }; threshold?: { message?: string }; message?: string } | undefined;
  const depositKind = watch('settings.depositPolicy.kind') ?? 'none';
  const typedPercent = String(watch('settings.depositPolicy.percent') ?? '').trim();
  const typedThreshold = String(watch('settings.depositPolicy.threshold') ?? '').trim();

  const submit = handleSubmit(async (values) => {
    setSummary(null);
    setSaved(false);
    try {
      // The saved record carries the new version, which the next save must send.
      reset(toForm(await update.mutateAsync(values)));
      setSaved(true);
    } catch (err) {
      if (isApiError(err) && err.code === 'stale_version') {
        setSummary('Someone else saved the settings while you were editing, so yours were not saved. Reload the page to see theirs, then make your change again.');
        return;
      }
      setSummary(applyServerErrors(err, setError, Object.keys(LABELS)));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-5">
      {saved ? <Notice title="Settings saved" /> : null}
      <FormErrorSummary message={summary} errors={{
          name: e.name,
          addressLines: e.addressLines,
          postcode: e.postcode,
          vatNumber: e.vatNumber,
          // Per-rate errors sit beside each rate; the summary says only that the rates need a look.
          labourRates: e.labourRates ? { message: e.labourRates.message ?? 'Check the rates below.' } : undefined,
          'settings.vatRounding': e.settings?.vatRounding,
          'settings.approvalLinkDays': e.settings?.approvalLinkDays,
          'settings.chaseAfterHours': e.settings?.chaseAfterHours,
          'settings.contactPhone': e.settings?.contactPhone,
          'settings.contactEmail': e.settings?.contactEmail,
          'settings.depositPolicy.kind': de?.kind ?? (de?.message ? { message: de.message } : undefined),
          'settings.depositPolicy.percent': de?.percent,
          'settings.depositPolicy.threshold': de?.threshold,
        }} labels={LABELS} />
      <Card title="The workshop">
        <div className="flex flex-col gap-4">
          <TextField label={LABELS.name!} required error={e.name?.message} {...register('name')} />
          <TextAreaField label={LABELS.addressLines!} rows={3} maxChars={TEXT_MAX.address} error={e.addressLines?.message} {...register('addressLines')} />
          <div className="grid items-end gap-4 sm:grid-cols-2">
            <TextField label={LABELS.postcode!} error={e.postcode?.message} {...register('postcode')} />
            <TextField label={LABELS.vatNumber!} hint="Printed on every VAT invoice." error={e.vatNumber?.message} {...register('vatNumber')} />
          </div>
          <div className="grid items-end gap-4 sm:grid-cols-2">
            <TextField
              label={LABELS['settings.contactPhone']!}
              type="tel"
              autoComplete="off"
              hint="Shown to owners wherever a page asks them to contact the workshop."
              error={e.settings?.contactPhone?.message}
              {...register('settings.contactPhone')}
            />
            <TextField label={LABELS['settings.contactEmail']!} type="email" autoComplete="off" error={e.settings?.contactEmail?.message} {...register('settings.contactEmail')} />
          </div>
        </div>
      </Card>
      <Card title="Owner approvals">
        <div className="grid items-start gap-4 sm:grid-cols-2">
          <TextField
            label={LABELS['settings.approvalLinkDays']!}
            inputMode="numeric"
            className="tabular-nums"
            hint={`How long the link in an approval e-mail opens the owner's decision page: ${APPROVAL_LINK_DAYS.min} to ${APPROVAL_LINK_DAYS.max} days. After that the owner asks for a new one. Applies to links sent from now on.`}
            error={e.settings?.approvalLinkDays?.message}
            {...register('settings.approvalLinkDays', { setValueAs: wholeNumber })}
          />
          <TextField
            label={LABELS['settings.chaseAfterHours']!}
            inputMode="numeric"
            className="tabular-nums"
            hint={`An undecided request gets one reminder e-mail this many hours after it was sent or last chased: ${CHASE_AFTER_HOURS.min} to ${CHASE_AFTER_HOURS.max} hours (48 is two days). Keep it shorter than the link's life.`}
            error={e.settings?.chaseAfterHours?.message}
            {...register('settings.chaseAfterHours', { setValueAs: wholeNumber })}
          />
        </div>
      </Card>
      <Card title="Labour rates" actions={<Button variant="secondary" onClick={() => rates.append({ code: '', name: '', ratePerHour: '' })}>Add a rate</Button>}>
        <p className="mb-3 text-sm text-slate-soft">Per hour, in {workshop.currency}, excl. VAT.</p>
        <ul className="flex flex-col gap-4">
          {rates.fields.map((f, i) => {
            const re = e.labourRates?.[i];
            const typed = watch(`labourRates.${i}.ratePerHour`) ?? '';
            return (
              <li key={f.id} className="grid items-end gap-3 border-b border-seam pb-4 last:border-0 sm:grid-cols-[1fr_2fr_1fr_auto]">
                <TextField label="Code" error={re?.code?.message} {...register(`labourRates.${i}.code`)} />
                <TextField label="Name" error={re?.name?.message} {...register(`labourRates.${i}.name`)} />
                <TextField
                  label="Rate per hour"
                  inputMode="decimal"
                  className="tabular-nums"
                  hint={/^\d+(\.\d{1,2})?$/.test(typed.trim()) ? `${formatMoney(typed.trim(), workshop.currency, { vat: 'excl' })} an hour` : 'For example 62.00'}
                  error={re?.ratePerHour?.message}
                  {...register(`labourRates.${i}.ratePerHour`)}
                />
                <Button variant="quiet" disabled={rates.fields.length <= 1} onClick={() => rates.remove(i)}>
                  Remove
                </Button>
              </li>
            );
          })}
        </ul>
      </Card>
      <Card title="VAT">
        <p className="mb-3 text-sm text-slate-soft">
          Rates: standard {workshop.vatRates.standard}%, reduced {workshop.vatRates.reduced}%, zero {workshop.vatRates.zero}%.
        </p>
        <SelectField label={LABELS['settings.vatRounding']!} error={e.settings?.vatRounding?.message} {...register('settings.vatRounding')}>
          {VAT_ROUNDING_METHODS.map((m) => (
            <option key={m} value={m}>
              {ROUNDING_LABELS[m]}
            </option>
          ))}
        </SelectField>
      </Card>
      <Card title="Deposits">
        <p className="mb-3 text-sm text-slate-soft">
          Asked of the owner by card before the work goes ahead. Percentages are of amounts incl. VAT, rounded to the penny.
        </p>
        <div className="flex flex-col gap-4">
          <SelectField label={LABELS['settings.depositPolicy.kind']!} error={de?.kind?.message} {...register('settings.depositPolicy.kind')}>
            {DEPOSIT_POLICY_KINDS.map((k) => (
              <option key={k} value={k}>
                {DEPOSIT_KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
          {depositKind !== 'none' ? (
            <div className="grid items-end gap-4 sm:grid-cols-2">
              <TextField
                label={LABELS['settings.depositPolicy.percent']!}
                inputMode="decimal"
                className="tabular-nums"
                required
                hint={DECIMAL.test(typedPercent) ? `${typedPercent}% of ${depositKind === 'quote_percent' ? 'the quote' : 'the approved work'}, incl. VAT` : 'For example 25'}
                error={de?.percent?.message}
                {...register('settings.depositPolicy.percent')}
              />
              {depositKind === 'approved_work_percent' ? (
                <TextField
                  label={LABELS['settings.depositPolicy.threshold']!}
                  inputMode="decimal"
                  className="tabular-nums"
                  required
                  hint={DECIMAL.test(typedThreshold) ? `Asked when approved work is over ${formatMoney(typedThreshold, workshop.currency, { vat: 'incl' })}` : 'For example 500.00'}
                  error={de?.threshold?.message}
                  {...register('settings.depositPolicy.threshold')}
                />
              ) : null}
            </div>
          ) : null}
        </div>
      </Card>
      <div>
        <Button type="submit" busy={formState.isSubmitting}>
          Save settings
        </Button>
      </div>
    </form>
  );
}
