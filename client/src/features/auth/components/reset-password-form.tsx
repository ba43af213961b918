import { zodResolver } from '@hookform/resolvers/zod';
import { PASSWORD_MIN, passwordResetCompleteSchema } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary, Notice } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { useCompletePasswordReset } from '../api/complete-password-reset';

const LABELS = { token: 'Link', password: 'New password', confirmPassword: 'New password again' };

export function ResetPasswordForm({ token }: { token: string }) {
  const [summary, setSummary] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const complete = useCompletePasswordReset();
  const { register, handleSubmit, setError, formState } = useForm<
    z.input<typeof passwordResetCompleteSchema>,
    unknown,
    z.output<typeof passwordResetCompleteSchema>
  >({ resolver: zodResolver(passwordResetCompleteSchema), defaultValues: { token, password: '', confirmPassword: '' } });

  const onSubmit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (values) => {
      await complete.mutateAsync(values);
      setDone(true);
    }),
  );

  if (done) {
    return (
      <Notice title="Password changed">
        <p>
          You can now <Link to="/sign-in">sign in</Link> with your new password.
        </p>
      </Notice>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <FormErrorSummary message={summary} errors={formState.errors} labels={LABELS} />
      <input type="hidden" {...register('token')} />
      <TextField
        label={LABELS.password}
        type="password"
        autoComplete="new-password"
        required
        hint={`At least ${PASSWORD_MIN} characters. A short sentence is easy to remember.`}
        error={formState.errors.password?.message}
        {...register('password')}
      />
      <TextField label={LABELS.confirmPassword} type="password" autoComplete="new-password" required error={formState.errors.confirmPassword?.message} {...register('confirmPassword')} />
      <Button type="submit" size="lg" busy={formState.isSubmitting}>
        Save the new password
      </Button>
    </form>
  );
}
