import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { MailLogPage } from '../../../../shared/schemas/admin';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { MailLogEntry as MailLogRow, MailboxMessage } from '../../../../shared/schemas/admin';

export const getMailLog = (q: { status?: string; page: number; pageSize: number; order: 'asc' | 'desc' }) =>
  api<MailLogPage>(`/api/mail/log${queryString({ ...q })}`);

export const mailLogQueryOptions = (q: { status?: string; page: number; pageSize: number; order: 'asc' | 'desc' }) =>
  queryOptions({ queryKey: queryKeys.mail.list(q), queryFn: () => getMailLog(q), placeholderData: keepPreviousData, refetchInterval: 5000 });

export function useMailLog(q: { status?: string; page: number; pageSize: number; order: 'asc' | 'desc' }) {
  return useQuery(mailLogQueryOptions(q));
}
