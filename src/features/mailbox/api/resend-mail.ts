import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MailLogEntry } from '../../../../shared/schemas/admin';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const resendMail = (id: number) => api<MailLogEntry>(`/api/mail/${id}/resend`, { method: 'POST' });

export function useResendMail() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: resendMail, onSettled: () => qc.invalidateQueries({ queryKey: queryKeys.mail.all }) });
}
