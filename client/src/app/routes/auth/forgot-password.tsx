import { Link } from 'react-router-dom';
import { PublicFrame } from '@/components/layout/app-shell';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';

export function Component() {
  return (
    <PublicFrame>
      <h1 className="mb-1 text-2xl font-bold">Choose a new password</h1>
      <p className="mb-5 text-slate-soft">Enter the e-mail you sign in with and we will send you a link.</p>
      <ForgotPasswordForm />
      <p className="mt-5 text-sm">
        <Link to="/sign-in">Back to sign in</Link>
      </p>
    </PublicFrame>
  );
}
