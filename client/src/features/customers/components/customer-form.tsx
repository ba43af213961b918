import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, CUSTOMER_KINDS, CUSTOMER_KIND_LABELS, customerCreateSchema, type CustomerCreate, type CustomerDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { ButtonLink } from '@/components/ui/button-link';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';

export const CUSTOMER_LABELS = { name: 'Name', kind: 'Kind of owner', email: 'E-mail', phone: 'Phone', addressLines: 'Address', postcode: 'Postcode', notes: 'Notes' };

export function CustomerForm({
  initial,
  submitLabel,
  cancelTo,
  onSubmit,
}: {
  initial?: CustomerDto;
  submitLabel: string;
  cancelTo: string;
  onSubmit: (values: CustomerCreate) => Promise<unknown>;
}) {
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof customerCreateSchema>, unknown, z.output<typeof customerCreateSchema>>({
    resolver: zodResolver(customerCreateSchema),
    defaultValues: {
      name: initial?.name ?? '',
      kind: initial?.kind ?? 'private',
      email: initial?.email ?? '',
      phone: initial?.phone ?? '',
      addressLines: initial?.addressLines ?? '',
      postcode: initial?.postcode ?? '',
      notes: initial?.notes ?? '',
    },
  });
  const e = formState.errors;

  const submit = handleSubmit(withServerErrors(setError, setSummary, Object.keys(CUSTOMER_LABELS), onSubmit));

  return (
    <form onSubmit={submit} noValidate className="flex max-w-2xl flex-col gap-4">
      <FormErrorSummary message={summary} errors={e} labels={CUSTOMER_LABELS} />
      <TextField label={CUSTOMER_LABELS.name} required autoComplete="off" error={e.name?.message} {...register('name')} />
      <SelectField label={CUSTOMER_LABELS.kind} error={e.kind?.message} {...register('kind')}>
        {CUSTOMER_KINDS.map((k) => (
          <option key={k} value={k}>
            {CUSTOMER_KIND_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={CUSTOMER_LABELS.email} type="email" inputMode="email" required autoComplete="off" error={e.email?.message} {...register('email')} />
        <TextField label={CUSTOMER_LABELS.phone} type="tel" inputMode="tel" autoComplete="off" error={e.phone?.message} {...register('phone')} />
      </div>
      <TextAreaField label={CUSTOMER_LABELS.addressLines} rows={3} maxChars={TEXT_MAX.address} error={e.addressLines?.message} {...register('addressLines')} />
      <TextField label={CUSTOMER_LABELS.postcode} className="sm:max-w-40" autoComplete="off" error={e.postcode?.message} {...register('postcode')} />
      <TextAreaField label={CUSTOMER_LABELS.notes} rows={3} maxChars={TEXT_MAX.notes} error={e.notes?.message} {...register('notes')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          {submitLabel}
        </Button>
        <ButtonLink to={cancelTo} variant="secondary">
          Cancel
        </ButtonLink>
      </div>
    </form>
  );
}
