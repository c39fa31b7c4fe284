import type { Knex } from 'knex';
import { randomBytes } from 'node:crypto';
import { mkdir, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import type { AttachmentCreated } from '../../shared/schemas/references.js';
import { ConflictError, NotFoundError, UnprocessableError } from '../lib/errors.js';
import { recordAudit } from '../repositories/audit.js';
import { iso } from '../repositories/db.js';
import { findAttachment, findRef, insertAttachment } from '../repositories/refs.js';

export const ATTACHMENT_MAX_BYTES = 25 * 1024 * 1024;

const dirFor = (uploadDir: string) => path.resolve(uploadDir, 'attachments');

/** Stores an uploaded PDF (already on disk in multer's temporary folder) and records it. */
export async function addAttachment(
  db: Knex,
  uploadDir: string,
  input: { refId: number; tmpPath: string; originalName: string; size: number; head: Buffer; actorId: number },
): Promise<AttachmentCreated> {
  const refuse = async (err: Error) => {
    await rm(input.tmpPath, { force: true });
    throw err;
  };
  if (input.head.subarray(0, 5).toString('latin1') !== '%PDF-') {
    return refuse(new UnprocessableError('Only PDF files can be attached (this file does not start like a PDF).', [{ path: 'body.file', message: 'not a PDF file' }]));
  }
  const ref = await findRef(db, input.refId);
  if (!ref) return refuse(new NotFoundError(`There is no reference ${input.refId}.`));
  if (ref.merged_into) return refuse(new ConflictError(`Reference ${input.refId} was merged into reference ${ref.merged_into}; attach the file there.`));
  const dir = dirFor(uploadDir);
  await mkdir(dir, { recursive: true });
  const stored = `${input.refId}-${randomBytes(12).toString('hex')}.pdf`;
  await rename(input.tmpPath, path.join(dir, stored));
  const filename = path.basename(input.originalName).replace(/[^\w.\- ()]+/g, '_').slice(0, 200) || 'attachment.pdf';
  return db.transaction(async (trx) => {
    const row = await insertAttachment(trx, { ref_id: input.refId, filename, stored_name: stored, size_bytes: input.size, mime: 'application/pdf', uploaded_by: input.actorId });
    await recordAudit(trx, { actorId: input.actorId, action: 'reference.attach', entityType: 'reference', entityId: input.refId, details: { attachment: row.id, filename, size: input.size } });
    return { id: row.id, filename, sizeBytes: input.size, mime: 'application/pdf', createdAt: iso(row.created_at) };
  });
}

export async function attachmentFile(db: Knex, uploadDir: string, refId: number, attachmentId: number) {
  const row = await findAttachment(db, refId, attachmentId);
  if (!row) throw new NotFoundError(`Reference ${refId} has no attachment ${attachmentId}.`);
  return { path: path.join(dirFor(uploadDir), row.stored_name), filename: row.filename };
}
