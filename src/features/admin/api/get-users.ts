import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AdminUserPage, UserListQuery } from '../../../../shared/schemas/users';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { AdminUser } from '../../../../shared/schemas/users';

export const getUsers = (q: Partial<UserListQuery>) =>
  api<AdminUserPage>(`/api/admin/users${queryString(q)}`);

export const usersQueryOptions = (q: Partial<UserListQuery>) =>
  queryOptions({ queryKey: queryKeys.users.list(q), queryFn: () => getUsers(q), placeholderData: keepPreviousData });

export function useUsers(q: Partial<UserListQuery>) {
  return useQuery(usersQueryOptions(q));
}
