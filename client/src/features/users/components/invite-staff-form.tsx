import { zodResolver } from '@hookform/resolvers/zod';
import { ROLE_LABELS, STAFF_ROLES, invitationCreateSchema } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/lib/form-errors';
import { useInviteUser } from '../api/invite-user';

// The staff branch of the shared invitation schema (owners are invited from their own page).
const schema = invitationCreateSchema.options[0];
const LABELS = { name: 'Name', email: 'E-mail', role: 'Role' };

export function InviteStaffForm() {
  const [summary, setSummary] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const invite = useInviteUser();
  const { register, handleSubmit, setError, reset, formState } = useForm<z.input<typeof schema>, unknown, z.output<typeof schema>>({
    resolver: zodResolver(schema),
    defaultValues: { name: '', email: '', role: 'engineer' },
  });
  const e = formState.errors;

  const submit = handleSubmit(async (values) => {
    setSummary(null);
    setSentTo(null);
    try {
      await invite.mutateAsync(values);
      setSentTo(values.email);
      reset();
    } catch (err) {
      setSummary(applyServerErrors(err, setError, Object.keys(LABELS)));
    }
  });

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      {sentTo ? <Notice title="Invitation sent">We e-mailed {sentTo} a link to choose a password.</Notice> : null}
      <FormErrorSummary message={summary} errors={e} labels={LABELS} />
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label={LABELS.name} required autoComplete="off" error={e.name?.message} {...register('name')} />
        <TextField label={LABELS.email} type="email" required autoComplete="off" error={e.email?.message} {...register('email')} />
        <SelectField label={LABELS.role} error={e.role?.message} {...register('role')}>
          {STAFF_ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </SelectField>
      </div>
      <div>
        <Button type="submit" busy={formState.isSubmitting}>
          Send invitation
        </Button>
      </div>
    </form>
  );
}
