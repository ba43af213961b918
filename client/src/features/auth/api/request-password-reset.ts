import type { PasswordResetRequestInput } from '@wingstage/shared';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

export const requestPasswordReset = (body: PasswordResetRequestInput) =>
  apiRequest<void>('/auth/password-reset', { method: 'POST', body, skipUnauthorizedRedirect: true });

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
