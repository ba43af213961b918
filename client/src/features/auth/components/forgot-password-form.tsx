import { zodResolver } from '@hookform/resolvers/zod';
import { passwordResetRequestSchema } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { useRequestPasswordReset } from '../api/request-password-reset';

const LABELS = { email: 'E-mail' };

export function ForgotPasswordForm() {
  const [summary, setSummary] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const request = useRequestPasswordReset();
  const { register, handleSubmit, setError, formState } = useForm<
    z.input<typeof passwordResetRequestSchema>,
    unknown,
    z.output<typeof passwordResetRequestSchema>
  >({ resolver: zodResolver(passwordResetRequestSchema), defaultValues: { email: '' } });

  const onSubmit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (values) => {
      await request.mutateAsync(values);
      setSentTo(values.email);
    }),
  );

  if (sentTo) {
    return (
      <Notice title="Check your e-mail">
        <p>
          If {sentTo} has a Wingstage sign-in, a link to choose a new password is on its way. The link works once and
          expires soon, so use it today.
        </p>
      </Notice>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <FormErrorSummary message={summary} errors={formState.errors} labels={LABELS} />
      <TextField label={LABELS.email} type="email" autoComplete="email" inputMode="email" required error={formState.errors.email?.message} {...register('email')} />
      <Button type="submit" size="lg" busy={formState.isSubmitting}>
        Send the reset link
      </Button>
    </form>
  );
}
