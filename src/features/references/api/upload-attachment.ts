import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AttachmentCreated } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const uploadAttachment = ({ id, file }: { id: number; file: File }) => {
  const form = new FormData();
  form.append('file', file);
  return api<AttachmentCreated>(`/api/references/${id}/attachments`, { body: form });
};

export function useUploadAttachment() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: uploadAttachment, onSuccess: (_d, v) => qc.invalidateQueries({ queryKey: queryKeys.references.detail(v.id) }) });
}

export const attachmentHref = (refId: number, attachmentId: number) => `/api/references/${refId}/attachments/${attachmentId}`;
