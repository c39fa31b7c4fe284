import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SavedSheet, Sheet } from '../../../../shared/schemas/extraction';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const saveExtraction = ({ id, version, sheet }: { id: number; version: number; sheet: Sheet }) =>
  api<SavedSheet>(`/api/extractions/${id}`, { method: 'PUT', body: { version, sheet } });

/**
 * The autosave and the explicit save; the caller keeps the version it returns. The cached sheet is marked out of
 * date without refetching (that would redraw the form being typed in), so the next visit opens the saved version.
 */
export function useSaveExtraction() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: saveExtraction,
    onSuccess: (_r, v) => qc.invalidateQueries({ queryKey: queryKeys.extractions.detail(v.id), refetchType: 'none' }),
  });
}
