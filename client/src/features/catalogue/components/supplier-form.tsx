import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, SUPPLIER_KINDS, SUPPLIER_KIND_LABELS, supplierCreateSchema, type SupplierDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextAreaField, TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { withServerErrors } from '@/lib/form-errors';
import { useSaveSupplier } from '../api/save-supplier';

const LABELS = { name: 'Name', kind: 'What they do', email: 'E-mail', phone: 'Phone', notes: 'Notes' };

export function SupplierForm({ supplier, onDone }: { supplier: SupplierDto | null; onDone: () => void }) {
  const save = useSaveSupplier();
  const [summary, setSummary] = useState<string | null>(null);
  const [active, setActive] = useState(supplier?.active ?? true);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof supplierCreateSchema>, unknown, z.output<typeof supplierCreateSchema>>({
    resolver: zodResolver(supplierCreateSchema),
    defaultValues: { name: supplier?.name ?? '', kind: supplier?.kind ?? 'parts', email: supplier?.email ?? '', phone: supplier?.phone ?? '', notes: supplier?.notes ?? '' },
  });
  const e = formState.errors;
  const submit = handleSubmit(
    withServerErrors(
      setError,
      setSummary,
      Object.keys(LABELS),
      async (v) => {
        if (supplier) await save.mutateAsync({ id: supplier.id, body: { ...v, active, version: supplier.version } });
        else await save.mutateAsync({ id: null, body: v });
        onDone();
      },
      (err) => {
        if (!(isApiError(err) && err.code === 'stale_version')) return false;
        setSummary('Someone else changed this supplier while you were editing. Close the form and open it again to see their version.');
        return true;
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label={supplier ? `Edit ${supplier.name}` : 'Add a supplier'}>
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={LABELS.name} required autoComplete="off" error={e.name?.message} {...register('name')} />
        <SelectField label={LABELS.kind} error={e.kind?.message} {...register('kind')}>
          {SUPPLIER_KINDS.map((k) => (
            <option key={k} value={k}>
              {SUPPLIER_KIND_LABELS[k]}
            </option>
          ))}
        </SelectField>
        <TextField label={LABELS.email} type="email" autoComplete="off" error={e.email?.message} {...register('email')} />
        <TextField label={LABELS.phone} type="tel" autoComplete="off" error={e.phone?.message} {...register('phone')} />
      </div>
      <TextAreaField label={LABELS.notes} rows={2} maxChars={TEXT_MAX.notes} error={e.notes?.message} {...register('notes')} />
      {supplier ? (
        <label className="flex min-h-11 items-center gap-2">
          <input type="checkbox" className="size-5" checked={active} onChange={(ev) => setActive(ev.target.checked)} />
          Still used (untick to hide from new lines)
        </label>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          {supplier ? 'Save supplier' : 'Add supplier'}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
