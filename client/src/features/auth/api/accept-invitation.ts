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
      qc.clear();
      qc.setQueryData(authKeys.session(), session);
    },
  });
}
