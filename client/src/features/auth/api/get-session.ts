import type { SessionDto } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiRequest, isApiError } from '@/lib/api-client';
import { authKeys } from './keys';

/** The signed-in session, or null when nobody is signed in (a 401 is an answer, not a failure). */
export async function getSession(): Promise<SessionDto | null> {
  try {
    return await apiRequest<SessionDto>('/auth/session', { skipUnauthorizedRedirect: true });
  } catch (e) {
    if (isApiError(e) && e.status === 401) return null;
    throw e;
  }
}

export const sessionQueryOptions = () =>
  queryOptions({ queryKey: authKeys.session(), queryFn: getSession, staleTime: 5 * 60_000 });

export function useSession() {
  return useQuery(sessionQueryOptions());
}
