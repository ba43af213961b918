import type { SessionDto, SignInInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { authKeys } from './keys';

export const signIn = (body: SignInInput) =>
  apiRequest<SessionDto>('/auth/sign-in', { method: 'POST', body, skipUnauthorizedRedirect: true });

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => {
      // A different person may have been signed in on this browser before: start clean.
      qc.clear();
      qc.setQueryData(authKeys.session(), session);
    },
  });
}
