import { redirect } from 'react-router-dom';
import { sessionQueryOptions } from '@/features/auth/api/get-session';
import { queryClient } from '@/lib/query-client';
import { homeFor } from '@/lib/permissions';

export async function loader() {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  return redirect(session ? homeFor(session.user.role) : '/sign-in');
}

export function Component() {
  return null;
}
