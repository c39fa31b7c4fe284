import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { SynthesisRequest } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { SynthesisResponse } from './types';

export const runSynthesis = (request: SynthesisRequest, signal?: AbortSignal) =>
  api<SynthesisResponse>('/api/syntheses', { body: request, signal });

export const synthesisQueryOptions = (request: SynthesisRequest) =>
  queryOptions({
    queryKey: queryKeys.synthesis.run(request),
    queryFn: ({ signal }) => runSynthesis(request, signal),
    placeholderData: keepPreviousData,
    retry: false,
    staleTime: 30_000,
  });

/** Runs a synthesis (POST, but safe to repeat) whenever the request is given. */
export function useSynthesis(request: SynthesisRequest | null) {
  return useQuery({ ...synthesisQueryOptions(request ?? ({} as SynthesisRequest)), enabled: request !== null });
}
