import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AgreementQuery, OverallAgreement, ReferenceAgreementPage } from '../../../../shared/schemas/reconciliation';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { AgreementSummary, ReferenceAgreement } from '../../../../shared/schemas/reconciliation';

export const getAgreement = () => api<OverallAgreement>('/api/agreement');

export const agreementQueryOptions = () => queryOptions({ queryKey: queryKeys.agreement.overall(), queryFn: getAgreement });

export function useAgreement() {
  return useQuery(agreementQueryOptions());
}

export type ReferenceAgreementQuery = AgreementQuery;

export const getReferenceAgreement = (q: ReferenceAgreementQuery) => api<ReferenceAgreementPage>(`/api/agreement/references${queryString({ ...q })}`);

export function useReferenceAgreement(q: ReferenceAgreementQuery) {
  return useQuery({ queryKey: queryKeys.agreement.references(q), queryFn: () => getReferenceAgreement(q), placeholderData: keepPreviousData });
}
