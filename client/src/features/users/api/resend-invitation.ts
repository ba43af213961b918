import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const resendInvitation = (id: string) => api.post<void>(`/users/${id}/resend-invitation`);

export function useResendInvitation() {
  return useMutation({ mutationFn: resendInvitation });
}
