import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditPage } from '../../../../shared/schemas/admin';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { AuditEntry as AuditItem } from '../../../../shared/schemas/admin';

export interface AuditFilters {
  actor?: string;
  action?: string;
  entityType?: string;
  entityId?: string;
  from?: string;
  to?: string;
}

export interface AuditQuery extends AuditFilters {
  page: number;
  pageSize: number;
}

export const getAudit = (q: AuditQuery) => api<AuditPage>(`/api/audit${queryString({ ...q })}`);

export const auditQueryOptions = (q: AuditQuery) =>
  queryOptions({ queryKey: queryKeys.audit.list(q), queryFn: () => getAudit(q), placeholderData: keepPreviousData });

export function useAudit(q: AuditQuery) {
  return useQuery(auditQueryOptions(q));
}
