import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Manipulation } from './get-manipulations';
import { manipulationKeys } from './keys';

export const updateManipulation = ({ term, ...body }: { term: string; version: number; label?: string; description?: string; retired?: boolean }) =>
  api<{ manipulation: Manipulation }>(`/api/manipulations/${term}`, { method: 'PATCH', body });

export function useUpdateManipulation() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updateManipulation, onSettled: () => qc.invalidateQueries({ queryKey: manipulationKeys.all }) });
}
