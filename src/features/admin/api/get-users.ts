import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Role } from '../../../../shared/roles';
import type { UserListQuery } from '../../../../shared/schemas/users';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface AdminUser {
  id: number;
  login: string;
  name: string | null;
  email: string | null;
  createdAt: string;
  lastSeenAt: string | null;
  roles: Role[];
}

export const getUsers = (q: Partial<UserListQuery>) =>
  api<{ items: AdminUser[]; total: number; page: number; pageSize: number }>(`/api/admin/users${queryString(q)}`);

export const usersQueryOptions = (q: Partial<UserListQuery>) =>
  queryOptions({ queryKey: queryKeys.users.list(q), queryFn: () => getUsers(q), placeholderData: keepPreviousData });

export function useUsers(q: Partial<UserListQuery>) {
  return useQuery(usersQueryOptions(q));
}
