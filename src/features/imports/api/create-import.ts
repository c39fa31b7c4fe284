import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportFormat, ImportResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type ImportInput = { format: ImportFormat; text: string; label?: string } | { format?: ImportFormat; file: File };

export const createImport = (input: ImportInput) => {
  if ('file' in input) {
    const form = new FormData();
    if (input.format) form.append('format', input.format);
    form.append('file', input.file);
    return api<ImportResult>('/api/imports', { body: form });
  }
  return api<ImportResult>('/api/imports', { body: input });
};

export function useCreateImport() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createImport,
    onSuccess: (data) => {
      qc.setQueryData(queryKeys.imports.detail(data.batch.id), data);
      // New references, queue entries and likely duplicates appear elsewhere too.
      for (const queryKey of [queryKeys.imports.lists(), queryKeys.references.all, queryKeys.screening.all, queryKeys.duplicates.all, queryKeys.search.all]) {
        void qc.invalidateQueries({ queryKey });
      }
    },
  });
}
