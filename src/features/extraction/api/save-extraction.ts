import { useMutation } from '@tanstack/react-query';
import type { Sheet } from '../../../../shared/schemas/extraction';
import { api } from '../../../lib/api-client';
import type { StoredStudy } from './types';

export const saveExtraction = ({ id, version, sheet }: { id: number; version: number; sheet: Sheet }) =>
  api<{ version: number; updatedAt: string; studies: StoredStudy[] }>(`/api/extractions/${id}`, { method: 'PUT', body: { version, sheet } });

/** The autosave and the explicit save; the caller keeps the version it returns. */
export function useSaveExtraction() {
  return useMutation({ mutationFn: saveExtraction });
}
