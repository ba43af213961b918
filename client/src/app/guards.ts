import type { Role, SessionDto } from '@wingstage/shared';
import { redirect } from 'react-router-dom';
import { sessionQueryOptions } from '@/features/auth/api/get-session';
import { queryClient } from '@/lib/query-client';
import { homeFor } from '@/lib/permissions';
import { signInPath } from '@/lib/return-to';

/** For loaders of signed-in pages: the session, or a redirect to sign-in that remembers the page. */
export async function requireSession(request: Request, roles?: readonly Role[]): Promise<SessionDto> {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (!session) {
    const url = new URL(request.url);
    throw redirect(signInPath(url.pathname + url.search));
  }
  if (roles && !roles.includes(session.user.role)) throw redirect(homeFor(session.user.role));
  return session;
}

export const STAFF: readonly Role[] = ['admin', 'manager', 'engineer', 'accounts'];
export const OFFICE: readonly Role[] = ['admin', 'manager', 'accounts'];
export const EDITORS: readonly Role[] = ['admin', 'manager'];
export const ADMIN: readonly Role[] = ['admin'];
