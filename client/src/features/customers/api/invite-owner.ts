import type { UserDto } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { customerKeys } from './keys';

/** An owner's sign-in is a user with role owner, tied to this customer record. */
export const inviteOwner = (body: { customerId: string; email: string; name: string }) =>
  api.post<UserDto>('/users/invitations', { role: 'owner', ...body });

export function useInviteOwner(customerId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; name: string }) => inviteOwner({ customerId, ...body }),
    // hasSignIn on the customer changes once invited.
    onSuccess: () => qc.invalidateQueries({ queryKey: customerKeys.all }),
  });
}
