import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ContrastAnswer } from '../../../../shared/schemas/trials';
import type { ContrastRequest } from '../../../../shared/trials/contrast';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getContrast = (setId: number, req: ContrastRequest) => api<ContrastAnswer>(`/api/trial-sets/${setId}/contrast${queryString({ ...req })}`);

export const contrastQueryOptions = (setId: number, req: ContrastRequest | null) =>
  queryOptions({
    queryKey: queryKeys.trials.contrast(setId, req ?? {}),
    queryFn: () => getContrast(setId, req!),
    enabled: req !== null,
    retry: false,
  });

export function useContrast(setId: number, req: ContrastRequest | null) {
  return useQuery(contrastQueryOptions(setId, req));
}
