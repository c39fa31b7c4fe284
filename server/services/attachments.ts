import type { Knex } from 'knex';
import { randomBytes } from 'node:crypto';
import { mkdir, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import { ConflictError, NotFoundError, UnprocessableError } from '../lib/errors.js';
import { recordAudit } from './audit.js';

export const ATTACHMENT_MAX_BYTES = 25 * 1024 * 1024;

const dirFor = (uploadDir: string) => path.resolve(uploadDir, 'attachments');

/** Stores an uploaded PDF (already on disk in multer's temporary folder) and records it. */
export async function addAttachment(
  db: Knex,
  uploadDir: string,
  input: { refId: number; tmpPath: string; originalName: string; size: number; head: Buffer; actorId: number },
) {
  if (input.head.subarray(0, 5).toString('latin1') !== '%PDF-') {
    await rm(input.tmpPath, { force: true });
    throw new UnprocessableError('Only PDF files can be attached (this file does not start like a PDF).', [{ path: 'body.file', message: 'not a PDF file' }]);
  }
  const ref = await db('refs').where({ id: input.refId }).first('id', 'merged_into');
  if (!ref) {
    await rm(input.tmpPath, { force: true });
    throw new NotFoundError(`There is no reference ${input.refId}.`);
  }
  if (ref.merged_into) {
    await rm(input.tmpPath, { force: true });
    throw new ConflictError(`Reference ${input.refId} was merged into reference ${ref.merged_into}; attach the file there.`);
  }
  const dir = dirFor(uploadDir);
  await mkdir(dir, { recursive: true });
  const stored = `${input.refId}-${randomBytes(12).toString('hex')}.pdf`;
  await rename(input.tmpPath, path.join(dir, stored));
  const filename = path.basename(input.originalName).replace(/[^\w.\- ()]+/g, '_').slice(0, 200) || 'attachment.pdf';
  return db.transaction(async (trx) => {
    const [row] = await trx('reference_attachments')
      .insert({ ref_id: input.refId, filename, stored_name: stored, size_bytes: input.size, mime: 'application/pdf', uploaded_by: input.actorId })
      .returning(['id', 'created_at']);
    await recordAudit(trx, { actorId: input.actorId, action: 'reference.attach', entityType: 'reference', entityId: input.refId, details: { attachment: row.id, filename, size: input.size } });
    return { id: row.id, filename, sizeBytes: input.size, mime: 'application/pdf', createdAt: new Date(row.created_at).toISOString() };
  });
}

export async function attachmentFile(db: Knex, uploadDir: string, refId: number, attachmentId: number) {
  const row = await db('reference_attachments').where({ id: attachmentId, ref_id: refId }).first();
  if (!row) throw new NotFoundError(`Reference ${refId} has no attachment ${attachmentId}.`);
  return { path: path.join(dirFor(uploadDir), row.stored_name), filename: row.filename as string };
}
