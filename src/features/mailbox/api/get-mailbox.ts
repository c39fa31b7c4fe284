import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { MailboxPage } from '../../../../shared/schemas/admin';

export const getMailbox = (q: { to?: string; page: number; pageSize: number }) =>
  api<MailboxPage>(`/api/mail/mailbox${queryString({ ...q })}`);

export const mailboxQueryOptions = (q: { to?: string; page: number; pageSize: number }) =>
  queryOptions({ queryKey: queryKeys.mail.mailbox(q), queryFn: () => getMailbox(q), placeholderData: keepPreviousData, refetchInterval: 5000, retry: false });

export function useMailbox(q: { to?: string; page: number; pageSize: number }) {
  return useQuery(mailboxQueryOptions(q));
}
