import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { extractionKeys } from './keys';

export const submitExtraction = ({ id, version }: { id: number; version: number }) =>
  api<{ state: string; pairState: string | null; discrepancies: number; recordId?: number }>(`/api/extractions/${id}/submit`, { method: 'POST', body: { version } });

export function useSubmitExtraction() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: submitExtraction, onSuccess: () => qc.invalidateQueries({ queryKey: extractionKeys.all }) });
}
