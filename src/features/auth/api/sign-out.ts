import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const signOut = () => api<void>('/auth/logout', { method: 'POST' });

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      qc.clear();
      window.location.assign('/');
    },
  });
}
