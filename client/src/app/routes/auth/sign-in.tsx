import { redirect, useNavigate, useSearchParams } from 'react-router-dom';
import { PublicFrame } from '@/components/layout/app-shell';
import { sessionQueryOptions } from '@/features/auth/api/get-session';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { queryClient } from '@/lib/query-client';
import { homeFor } from '@/lib/permissions';
import { safeReturnTo } from '@/lib/return-to';

export async function loader() {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (session) return redirect(homeFor(session.user.role));
  return null;
}

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const returnTo = safeReturnTo(search.get('returnTo'));
  return (
    <PublicFrame>
      <h1 className="mb-1 text-2xl font-bold">Sign in</h1>
      <p className="mb-5 text-slate-soft">Workshop staff and aircraft owners sign in here.</p>
      <SignInForm
        onSignedIn={(s) => {
          // An owner's link to a staff page (or the reverse) lands on their own start page instead.
          const target = returnTo && (s.user.role === 'owner') === returnTo.startsWith('/my-aircraft') ? returnTo : homeFor(s.user.role);
          void navigate(target, { replace: true });
        }}
      />
    </PublicFrame>
  );
}
