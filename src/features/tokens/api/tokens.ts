import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApiTokenList, CreatedToken } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { ApiToken } from '../../../../shared/schemas/users';

export const getTokens = () => api<ApiTokenList>('/api/tokens');

export const tokensQueryOptions = () => queryOptions({ queryKey: queryKeys.tokens.lists(), queryFn: getTokens });

export function useTokens() {
  return useQuery(tokensQueryOptions());
}

export const createToken = (body: { name: string }) => api<CreatedToken>('/api/tokens', { body });

export function useCreateToken() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createToken, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.tokens.all }) });
}

export function useRevokeToken() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<void>(`/api/tokens/${id}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.tokens.all }),
  });
}
