import { Link, useSearchParams } from 'react-router-dom';
import { PublicFrame } from '@/components/layout/app-shell';
import { Notice } from '@/components/ui/notice';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';

export function Component() {
  const [search] = useSearchParams();
  const token = search.get('token') ?? '';
  return (
    <PublicFrame>
      <h1 className="mb-5 text-2xl font-bold">Set a new password</h1>
      {token ? (
        <ResetPasswordForm token={token} />
      ) : (
        <Notice tone="problem" title="This link is incomplete">
          <p>
            Open the link from the e-mail again, or <Link to="/forgot-password">ask for a new one</Link>.
          </p>
        </Notice>
      )}
    </PublicFrame>
  );
}
