import { zodResolver } from '@hookform/resolvers/zod';
import { signInSchema, type SessionDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { FormErrorSummary } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';
import { useSignIn } from '../api/sign-in';

const LABELS = { email: 'E-mail', password: 'Password' };

export function SignInForm({ onSignedIn }: { onSignedIn: (s: SessionDto) => void }) {
  const [summary, setSummary] = useState<string | null>(null);
  const signIn = useSignIn();
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof signInSchema>, unknown, z.output<typeof signInSchema>>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: '', password: '' },
  });

  const onSubmit = handleSubmit(
    withServerErrors(setError, setSummary, Object.keys(LABELS), async (values) => {
      onSignedIn(await signIn.mutateAsync(values));
    }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <FormErrorSummary message={summary} errors={formState.errors} labels={LABELS} />
      <TextField label={LABELS.email} type="email" autoComplete="username" inputMode="email" required error={formState.errors.email?.message} {...register('email')} />
      <TextField label={LABELS.password} type="password" autoComplete="current-password" required error={formState.errors.password?.message} {...register('password')} />
      <Button type="submit" size="lg" busy={formState.isSubmitting}>
        Sign in
      </Button>
      <p className="text-sm">
        <Link to="/forgot-password">Forgotten your password?</Link>
      </p>
    </form>
  );
}
