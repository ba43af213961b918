import { zodResolver } from '@hookform/resolvers/zod';
import { invitationCreateSchema, type CustomerDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { useInviteOwner } from '../api/invite-owner';

// The shared invitation schema is a union keyed by role: its owner branch, minus what this panel
// already knows (the role and the customer).
const schema = invitationCreateSchema.options[1].omit({ role: true, customerId: true });
const LABELS = { email: 'E-mail for the sign-in', name: 'Name on the sign-in' };

export function InviteOwnerPanel({ customer }: { customer: CustomerDto }) {
  const [summary, setSummary] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const invite = useInviteOwner(customer.id);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof schema>, unknown, z.output<typeof schema>>({
    resolver: zodResolver(schema),
    defaultValues: { email: customer.email, name: customer.name },
  });

  const submit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (values) => {
      await invite.mutateAsync(values);
      setSentTo(values.email);
    }),
  );

  if (sentTo) {
    return (
      <Notice title="Invitation sent">
        <p>We e-mailed {sentTo} a link to choose a password. They will see their aircraft and jobs once they accept.</p>
      </Notice>
    );
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-3">
      <p className="text-sm text-slate-soft">
        {customer.hasSignIn
          ? 'This owner already has a sign-in or an open invitation. Inviting again sends a fresh link.'
          : 'Give this owner their own sign-in so they can follow their aircraft’s jobs from a phone.'}
      </p>
      <FormErrorSummary message={summary} errors={formState.errors} labels={LABELS} />
      <TextField label={LABELS.name} required error={formState.errors.name?.message} {...register('name')} />
      <TextField label={LABELS.email} type="email" required error={formState.errors.email?.message} {...register('email')} />
      <div>
        <Button type="submit" busy={formState.isSubmitting}>
          Invite to Wingstage
        </Button>
      </div>
    </form>
  );
}
