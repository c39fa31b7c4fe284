import type { Knex } from 'knex';
import { randomBytes } from 'node:crypto';
import { mkdir, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import type { AttachmentCreated } from '../../shared/schemas/references.js';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors.js';
import { hasRole } from '../../shared/roles.js';
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
  const filename = safePdfName(input.originalName);
  return db.transaction(async (trx) => {
    const row = await insertAttachment(trx, { ref_id: input.refId, filename, stored_name: stored, size_bytes: input.size, mime: 'application/pdf', uploaded_by: input.actorId });
    await recordAudit(trx, { actorId: input.actorId, action: 'reference.attach', entityType: 'reference', entityId: input.refId, details: { attachment: row.id, filename, size: input.size } });
    return { id: row.id, filename, sizeBytes: input.size, mime: 'application/pdf', createdAt: iso(row.created_at) };
  });
}

/** A stored file name: the uploaded name's letters, digits and `._-()` and spaces, always ending in `.pdf`. */
export function safePdfName(original: string): string {
  const base = path.basename(original.replace(/\\/g, '/')).replace(/\.pdf$/i, '');
  const clean = base.replace(/[^\w.\- ()]+/g, '_').replace(/^[.\s]+/, '').slice(0, 196);
  return `${clean || 'attachment'}.pdf`;
}

/**
 * The file of an attachment, for contributors, curators and reviewers, and for its uploader. Anyone else is told
 * 403 whether or not the reference or the attachment exists, so the answer reveals nothing.
 */
export async function attachmentFile(db: Knex, uploadDir: string, refId: number, attachmentId: number, user: Pick<Express.User, 'id' | 'roles'>) {
  const entitled = hasRole(user.roles, 'contributor') || hasRole(user.roles, 'reviewer');
  const row = await findAttachment(db, refId, attachmentId);
  if (!entitled && row?.uploaded_by !== user.id) throw new ForbiddenError('Attachments are for contributors, curators, reviewers and the person who uploaded them.');
  if (!row) throw new NotFoundError(`Reference ${refId} has no attachment ${attachmentId}.`);
  return { path: path.join(dirFor(uploadDir), row.stored_name), filename: row.filename };
}
