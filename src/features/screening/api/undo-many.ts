import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningBatchUndoInput, ScreeningBatchUndoResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { screeningChanged } from './screening-changed';

export const undoMany = (input: ScreeningBatchUndoInput) => api<ScreeningBatchUndoResult>('/api/screening/decisions/undo', { body: input });

export function useUndoMany() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: undoMany,
    onSuccess: (answer) => screeningChanged(qc, answer.results.some((r) => r.restoredRecords.length > 0)),
  });
}
