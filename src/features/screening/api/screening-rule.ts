import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ScreeningRule, ScreeningRuleInput } from '../../../../shared/schemas/screening';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getRule = () => api<ScreeningRule>('/api/screening/rule');
export const ruleQueryOptions = () => queryOptions({ queryKey: [...queryKeys.screening.all, 'rule'] as const, queryFn: getRule });

export function useRule() {
  return useQuery(ruleQueryOptions());
}

export const setRule = (input: ScreeningRuleInput) => api<ScreeningRule>('/api/screening/rule', { method: 'PUT', body: input });

export function useSetRule() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setRule, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.screening.all }) });
}
