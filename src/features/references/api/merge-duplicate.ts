import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MergeResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

export const mergeDuplicate = ({ candidateId, keep }: { candidateId: number; keep: number }) =>
  api<MergeResult>(`/api/duplicates/${candidateId}/merge`, { body: { keep } });

export function useMergeDuplicate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: mergeDuplicate,
    // The merged-away reference's effects and screening now count for the one kept.
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: queryKeys.references.all }),
        qc.invalidateQueries({ queryKey: queryKeys.duplicates.all }),
        qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
        registryChanged(qc),
      ]),
  });
}
