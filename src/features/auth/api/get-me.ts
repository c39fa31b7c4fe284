import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Me, MeAnswer } from '../../../../shared/schemas/users';
import { hasRole, type Role } from '../../../../shared/roles';
import { api, ApiRequestError } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export async function getMe(): Promise<Me | null> {
  try {
    return (await api<MeAnswer>('/api/me')).user;
  } catch (err) {
    if (err instanceof ApiRequestError && err.status === 401) return null;
    throw err;
  }
}

export const meQueryOptions = () => queryOptions({ queryKey: queryKeys.auth.me(), queryFn: getMe, staleTime: 60_000 });

export function useMe() {
  return useQuery(meQueryOptions());
}

export function useHasRole(role: Role): boolean {
  const { data } = useMe();
  return !!data && hasRole(data.roles, role);
}
