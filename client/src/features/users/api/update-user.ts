import type { UserDto, UserUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

export const updateUser = (id: string, body: UserUpdateInput) => api.patch<UserDto>(`/users/${id}`, body);

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UserUpdateInput }) => updateUser(id, body),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.lists() }),
  });
}
