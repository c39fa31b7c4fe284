import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface MailLogRow {
  id: number;
  kind: string;
  to: string;
  subject: string;
  status: 'queued' | 'sent' | 'retrying' | 'failed';
  attempts: number;
  lastError: string | null;
  createdAt: string;
  sentAt: string | null;
}
export interface MailboxMessage {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  receivedAt: string;
}

export const getMailLog = (q: { status?: string; page: number; pageSize: number; order: 'asc' | 'desc' }) =>
  api<{ items: MailLogRow[]; total: number }>(`/api/mail/log${queryString({ ...q })}`);

export const mailLogQueryOptions = (q: { status?: string; page: number; pageSize: number; order: 'asc' | 'desc' }) =>
  queryOptions({ queryKey: queryKeys.mail.list(q), queryFn: () => getMailLog(q), placeholderData: keepPreviousData, refetchInterval: 5000 });

export function useMailLog(q: { status?: string; page: number; pageSize: number; order: 'asc' | 'desc' }) {
  return useQuery(mailLogQueryOptions(q));
}
