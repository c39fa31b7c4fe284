import { useRef } from 'react';
import { ApiRequestError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote } from '../../../components/ui/Notice';
import { attachmentHref, useUploadAttachment } from '../api/upload-attachment';
import type { ReferenceDetail } from '../api/types';

const kb = (n: number) => `${(n / 1024).toFixed(1)} KB`;

export function Attachments({ detail, canUpload, signedIn }: { detail: ReferenceDetail; canUpload: boolean; signedIn: boolean }) {
  const upload = useUploadAttachment();
  const file = useRef<HTMLInputElement>(null);
  const fieldError = upload.error instanceof ApiRequestError ? upload.error.fieldErrors().file : undefined;
  return (
    <div>
      {detail.attachments.length === 0 ? (
        <EmptyState>{canUpload ? 'No PDF yet. Attach the paper so coders can open it beside the extraction sheet.' : 'No PDF is attached.'}</EmptyState>
      ) : (
        <table className="max-w-3xl">
          <thead>
            <tr>
              <th>File</th>
              <th className="num">Size</th>
              <th>Uploaded by</th>
              <th className="num">On</th>
            </tr>
          </thead>
          <tbody>
            {detail.attachments.map((a) => (
              <tr key={a.id}>
                <td>{signedIn ? <a href={attachmentHref(detail.reference.id, a.id)}>{a.filename}</a> : <span title="Sign in to open attachments">{a.filename}</span>}</td>
                <td className="num">{kb(a.sizeBytes)}</td>
                <td>{a.uploadedBy ? `@${a.uploadedBy.login}` : '—'}</td>
                <td className="num">{a.createdAt.slice(0, 10)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canUpload && (
        <form
          className="mt-2 flex flex-wrap items-center gap-2 text-sm"
          onSubmit={(e) => {
            e.preventDefault();
            const f = file.current?.files?.[0];
            if (f) upload.mutate({ id: detail.reference.id, file: f }, { onSuccess: () => file.current && (file.current.value = '') });
          }}
        >
          <label>
            Attach a PDF (up to 25 MB){' '}
            <input ref={file} type="file" accept="application/pdf,.pdf" aria-invalid={!!fieldError} aria-describedby="attach-error" />
          </label>
          <Button type="submit" disabled={upload.isPending}>
            {upload.isPending ? 'Uploading…' : 'Upload'}
          </Button>
          {fieldError ? (
            <span id="attach-error" className="text-refusal">
              ✕ {fieldError}
            </span>
          ) : (
            upload.error && <ErrorNote error={upload.error} />
          )}
          {upload.isSuccess && <span>✓ Attached.</span>}
        </form>
      )}
    </div>
  );
}
