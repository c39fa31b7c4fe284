import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Role } from '../../../../shared/roles';
import type { RoleChangeResult } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const setRole = ({ userId, role, granted }: { userId: number; role: Role; granted: boolean }) =>
  api<RoleChangeResult>(`/api/admin/users/${userId}/roles/${role}`, { method: granted ? 'PUT' : 'DELETE' });

export function useSetRole() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setRole, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.users.lists() }) });
}
