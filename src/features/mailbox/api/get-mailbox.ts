import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { MailboxMessage } from './get-mail-log';

export const getMailbox = (q: { to?: string; page: number; pageSize: number }) =>
  api<{ items: MailboxMessage[]; total: number }>(`/api/mail/mailbox${queryString({ ...q })}`);

export const mailboxQueryOptions = (q: { to?: string; page: number; pageSize: number }) =>
  queryOptions({ queryKey: queryKeys.mail.mailbox(q), queryFn: () => getMailbox(q), placeholderData: keepPreviousData, refetchInterval: 5000, retry: false });

export function useMailbox(q: { to?: string; page: number; pageSize: number }) {
  return useQuery(mailboxQueryOptions(q));
}
