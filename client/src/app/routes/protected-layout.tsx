import { useSuspenseQuery } from '@tanstack/react-query';
import { Navigate, Outlet, useNavigate, type LoaderFunctionArgs } from 'react-router-dom';
import { AppShell } from '@/components/layout/app-shell';
import { sessionQueryOptions } from '@/features/auth/api/get-session';
import { useSignOut } from '@/features/auth/api/sign-out';
import { requireSession } from '../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request);
  return null;
}

export function Component() {
  const { data: session } = useSuspenseQuery(sessionQueryOptions());
  const signOut = useSignOut();
  const navigate = useNavigate();
  if (!session) return <Navigate to="/sign-in" replace />;
  return (
    <AppShell
      session={session}
      signingOut={signOut.isPending}
      onSignOut={() => signOut.mutate(undefined, { onSettled: () => void navigate('/sign-in', { replace: true }) })}
    >
      <Outlet />
    </AppShell>
  );
}
