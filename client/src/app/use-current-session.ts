import type { SessionDto } from '@wingstage/shared';
import { useSuspenseQuery } from '@tanstack/react-query';
import { sessionQueryOptions } from '@/features/auth/api/get-session';

/** Inside the signed-in layout the loader has already made sure there is a session. */
export function useCurrentSession(): SessionDto {
  const { data } = useSuspenseQuery(sessionQueryOptions());
  if (!data) throw new Error('No session inside a signed-in page.');
  return data;
}
