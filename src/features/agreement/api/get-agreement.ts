import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface AgreementSummary {
  pairs: number;
  categorical: { field: string; items: number; percentAgreement: number | null; kappa: number | null; kappaSe: number | null }[];
  allCategorical: { items: number; percentAgreement: number | null; kappa: number | null };
  effectSizes: { metric: string; items: number; icc: number | null }[];
}
export interface ReferenceAgreement {
  assignmentId: number;
  referenceId: number;
  referenceLabel: string;
  coders: string;
  items: number;
  percentAgreement: number | null;
  kappa: number | null;
  effectSizes: { metric: string; items: number; icc: number | null }[];
}

export const getAgreement = () => api<{ overall: AgreementSummary; coderPairs: (AgreementSummary & { coders: string })[] }>('/api/agreement');

export const agreementQueryOptions = () => queryOptions({ queryKey: queryKeys.agreement.overall(), queryFn: getAgreement });

export function useAgreement() {
  return useQuery(agreementQueryOptions());
}

export interface ReferenceAgreementQuery {
  page: number;
  pageSize: number;
  sort: 'reference' | 'agreement';
  order: 'asc' | 'desc';
}

export const getReferenceAgreement = (q: ReferenceAgreementQuery) => api<{ items: ReferenceAgreement[]; total: number }>(`/api/agreement/references${queryString({ ...q })}`);

export function useReferenceAgreement(q: ReferenceAgreementQuery) {
  return useQuery({ queryKey: queryKeys.agreement.references(q), queryFn: () => getReferenceAgreement(q), placeholderData: keepPreviousData });
}
