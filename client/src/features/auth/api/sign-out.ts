import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { authKeys } from './keys';

export const signOut = () => apiRequest<void>('/auth/sign-out', { method: 'POST', body: {}, skipUnauthorizedRedirect: true });

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      qc.clear();
      qc.setQueryData(authKeys.session(), null);
    },
  });
}
