import { zodResolver } from '@hookform/resolvers/zod';
import { PASSWORD_MIN, ROLE_LABELS, invitationAcceptSchema, type SessionDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { useAcceptInvitation } from '../api/accept-invitation';
import type { InvitationPreview } from '../api/get-invitation';

const LABELS = { token: 'Link', name: 'Your name', password: 'Choose a password', confirmPassword: 'Password again' };

export function AcceptInvitationForm({ token, invitation, onAccepted }: { token: string; invitation: InvitationPreview; onAccepted: (s: SessionDto) => void }) {
  const [summary, setSummary] = useState<string | null>(null);
  const accept = useAcceptInvitation();
  const { register, handleSubmit, setError, formState } = useForm<
    z.input<typeof invitationAcceptSchema>,
    unknown,
    z.output<typeof invitationAcceptSchema>
  >({ resolver: zodResolver(invitationAcceptSchema), defaultValues: { token, name: invitation.name, password: '', confirmPassword: '' } });

  const onSubmit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (values) => {
      onAccepted(await accept.mutateAsync(values));
    }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 rounded-control bg-cloth-sunk p-3 text-sm">
        <dt className="text-slate-soft">Workshop</dt>
        <dd className="font-semibold">{invitation.workshopName}</dd>
        <dt className="text-slate-soft">E-mail</dt>
        <dd className="font-semibold break-all">{invitation.email}</dd>
        <dt className="text-slate-soft">Signing in as</dt>
        <dd className="font-semibold">{ROLE_LABELS[invitation.role]}</dd>
      </dl>
      <FormErrorSummary message={summary} errors={formState.errors} labels={LABELS} />
      <input type="hidden" {...register('token')} />
      <TextField label={LABELS.name} autoComplete="name" required error={formState.errors.name?.message} {...register('name')} />
      <TextField
        label={LABELS.password}
        type="password"
        autoComplete="new-password"
        required
        hint={`At least ${PASSWORD_MIN} characters.`}
        error={formState.errors.password?.message}
        {...register('password')}
      />
      <TextField label={LABELS.confirmPassword} type="password" autoComplete="new-password" required error={formState.errors.confirmPassword?.message} {...register('confirmPassword')} />
      <Button type="submit" size="lg" busy={formState.isSubmitting}>
        Accept and sign in
      </Button>
    </form>
  );
}
