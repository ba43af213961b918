import type { PasswordResetCompleteInput } from '@wingstage/shared';
import { useMutation } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

export const completePasswordReset = (body: PasswordResetCompleteInput) =>
  apiRequest<void>('/auth/password-reset/complete', { method: 'POST', body, skipUnauthorizedRedirect: true });

export function useCompletePasswordReset() {
  return useMutation({ mutationFn: completePasswordReset });
}
