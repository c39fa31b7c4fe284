import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface AuditItem {
  id: number;
  at: string;
  actorId: number | null;
  actorLogin: string | null;
  action: string;
  entityType: string;
  entityId: string | null;
  details: Record<string, unknown>;
}

export interface AuditQuery {
  page: number;
  pageSize: number;
  entityType?: string;
  action?: string;
}

export const getAudit = (q: AuditQuery) => api<{ items: AuditItem[]; total: number }>(`/api/admin/audit${queryString({ ...q })}`);

export const auditQueryOptions = (q: AuditQuery) =>
  queryOptions({ queryKey: queryKeys.audit.list(q), queryFn: () => getAudit(q), placeholderData: keepPreviousData });

export function useAudit(q: AuditQuery) {
  return useQuery(auditQueryOptions(q));
}
