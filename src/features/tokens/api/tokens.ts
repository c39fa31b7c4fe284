import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface ApiToken {
  id: number;
  name: string;
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

export const tokensKeys = { all: ['tokens'] as const, list: () => [...tokensKeys.all, 'list'] as const };

export function useTokens() {
  return useQuery({ queryKey: tokensKeys.list(), queryFn: () => api<{ items: ApiToken[] }>('/api/tokens') });
}

export function useCreateToken() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (name: string) => api<ApiToken & { token: string }>('/api/tokens', { body: { name } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: tokensKeys.all }),
  });
}

export function useRevokeToken() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<void>(`/api/tokens/${id}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: tokensKeys.all }),
  });
}
