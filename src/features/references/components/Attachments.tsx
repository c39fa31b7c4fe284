import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { Button } from '../../../components/ui/Button';
import { FieldError } from '../../../components/ui/Field';
import { EmptyState, ErrorNote } from '../../../components/ui/Notice';
import { attachmentHref, useUploadAttachment } from '../api/upload-attachment';
import type { ReferenceDetail } from '../api/types';

const kb = (n: number) => `${(n / 1024).toFixed(1)} KB`;

/** One PDF chosen; its size and type are checked by the server, which names the problem. */
const attachmentFormSchema = z.object({
  file: z.custom<FileList | null>((v) => typeof FileList !== 'undefined' && v instanceof FileList && v.length === 1, 'choose a PDF file').transform((files) => files![0]),
});

export function Attachments({ detail, canUpload, signedIn }: { detail: ReferenceDetail; canUpload: boolean; signedIn: boolean }) {
  const upload = useUploadAttachment();
  const form = useForm({ resolver: formResolver(attachmentFormSchema), defaultValues: { file: null } });
  const fieldError = form.formState.errors.file?.message;
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
          noValidate
          onSubmit={form.handleSubmit(({ file }) =>
            upload.mutate({ id: detail.reference.id, file }, { onSuccess: () => form.reset(), onError: (err) => showServerErrors(err, form.setError, ['file']) }),
          )}
        >
          <label>
            Attach a PDF (up to 25 MB){' '}
            <input type="file" accept="application/pdf,.pdf" {...form.register('file')} aria-invalid={!!fieldError} aria-describedby="attach-error" />
          </label>
          <Button type="submit" disabled={upload.isPending}>
            {upload.isPending ? 'Uploading…' : 'Upload'}
          </Button>
          {fieldError ? <FieldError id="attach-error" message={fieldError} className="text-refusal" /> : upload.error && <ErrorNote error={form.formState.errors.root?.server?.message ?? upload.error} />}
          {upload.isSuccess && <span>✓ Attached.</span>}
        </form>
      )}
    </div>
  );
}
