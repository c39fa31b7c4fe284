import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ScreeningAgreementCounts } from '../../../../shared/schemas/screening';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getAgreement = () => api<ScreeningAgreementCounts>('/api/screening/agreement');
export const agreementQueryOptions = () => queryOptions({ queryKey: [...queryKeys.screening.all, 'agreement'] as const, queryFn: getAgreement });

export function useScreeningAgreement() {
  return useQuery(agreementQueryOptions());
}
