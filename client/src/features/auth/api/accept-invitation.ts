import type { InvitationAcceptInput, SessionDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { authKeys } from './keys';

export const acceptInvitation = (body: InvitationAcceptInput) =>
  apiRequest<SessionDto>('/auth/invitations/accept', { method: 'POST', body, skipUnauthorizedRedirect: true });

export function useAcceptInvitation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (session) => {
      // Drop anything a previous person on this browser left behind, but keep the invitation the
      // page is still showing: clearing it would refetch a now-used token and flash an error.
      const invitation = authKeys.invitation('').slice(0, 2).join('/');
      qc.removeQueries({ predicate: (q) => q.queryKey.slice(0, 2).join('/') !== invitation });
      qc.setQueryData(authKeys.session(), session);
    },
  });
}
