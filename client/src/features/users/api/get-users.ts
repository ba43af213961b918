import type { Page, UserDto } from '@wingstage/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { userKeys } from './keys';

export const getUsers = (params: Partial<ListParams>, signal?: AbortSignal) => api.get<Page<UserDto>>('/users', params, signal);

export const usersQueryOptions = (params: Partial<ListParams>) =>
  queryOptions({ queryKey: userKeys.list(params), queryFn: ({ signal }) => getUsers(params, signal), placeholderData: keepPreviousData });

export function useUsers(params: Partial<ListParams>) {
  return useQuery(usersQueryOptions(params));
}
