import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrialSet, TrialUpload } from '../../../../shared/schemas/trials';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type TrialUploadInput = TrialUpload & { extractionId: number; file: File };

export const uploadTrialSet = ({ extractionId, file, ...meta }: TrialUploadInput) => {
  const form = new FormData();
  for (const [k, v] of Object.entries(meta)) form.append(k, String(v));
  form.append('file', file);
  return api<TrialSet>(`/api/extractions/${extractionId}/trial-sets`, { body: form });
};

export function useUploadTrialSet() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: uploadTrialSet,
    onSuccess: (_set, v) => qc.invalidateQueries({ queryKey: queryKeys.trials.ofSheet(v.extractionId) }),
  });
}
