import type { InvitationCreateInput, UserDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

export const inviteUser = (body: InvitationCreateInput) => api.post<UserDto>('/users/invitations', body);

export function useInviteUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: inviteUser, onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.lists() }) });
}
