import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Manipulation } from './get-manipulations';
import { manipulationKeys } from './keys';

export const createManipulation = (body: { term: string; label: string; description?: string }) =>
  api<{ manipulation: Manipulation }>('/api/manipulations', { method: 'POST', body });

export function useCreateManipulation() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createManipulation, onSuccess: () => qc.invalidateQueries({ queryKey: manipulationKeys.all }) });
}
