import type { Role } from '@wingstage/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { authKeys } from './keys';

export interface InvitationPreview {
  email: string;
  name: string;
  role: Role;
  workshopName: string;
}

export const getInvitation = (token: string) =>
  apiRequest<InvitationPreview>(`/auth/invitations/${encodeURIComponent(token)}`, { skipUnauthorizedRedirect: true });

export const invitationQueryOptions = (token: string) =>
  queryOptions({ queryKey: authKeys.invitation(token), queryFn: () => getInvitation(token), retry: false, staleTime: Infinity });

export function useInvitation(token: string) {
  return useQuery({ ...invitationQueryOptions(token), enabled: token.length > 0 });
}
