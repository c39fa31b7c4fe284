import { Router } from 'express';
import { idParam, idParamsSchema } from '../../shared/schemas/common.js';
import multer from 'multer';
import { open } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { exportQuerySchema, referenceEditSchema, referenceListQuerySchema, screeningDecisionSchema, screeningUndoSchema } from '../../shared/schemas/references.js';
import { requireRole, requireSignIn } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { ValidationError } from '../lib/errors.js';
import { chargeCaller, costs } from '../lib/caller-budget.js';
import { parseInput } from '../lib/validate.js';
import { addAttachment, ATTACHMENT_MAX_BYTES, attachmentFile } from '../services/attachments.js';
import { editReference, exportReferences, getReference, listReferences, mergeReferences } from '../services/references.js';
import { decide, undoLast } from '../services/screening.js';
import { syncReferences } from '../services/search.js';


export function referencesRouter(ctx: AppContext) {
  const router = Router();
  const upload = multer({
    dest: path.resolve(ctx.env.UPLOAD_DIR, 'tmp'),
    limits: { fileSize: ATTACHMENT_MAX_BYTES, files: 1, fields: 2 },
    fileFilter: (_req, file, cb) => {
      if (file.mimetype !== 'application/pdf' && path.extname(file.originalname).toLowerCase() !== '.pdf') {
        cb(new ValidationError('Only PDF files can be attached.', [{ path: 'body.file', message: 'choose a .pdf file' }]));
        return;
      }
      cb(null, true);
    },
  });

  router.get('/references', async (req, res) => {
    res.json(await listReferences(ctx.db, parseInput(referenceListQuerySchema, req.query, 'query')));
  });

  router.get('/references/export', async (req, res) => {
    const q = parseInput(exportQuerySchema, req.query, 'query');
    chargeCaller(req, costs.references(q.ids.length), `An export of ${q.ids.length} references`);
    const out = await exportReferences(ctx.db, q.ids, q.format);
    res.attachment(out.filename).type(out.type).send(out.body);
  });

  router.post('/references/merge', requireRole('curator'), async (req, res) => {
    const body = parseInput(z.object({ a: z.number().int().positive(), b: z.number().int().positive(), keep: z.number().int().positive().optional() }), req.body);
    const result = await mergeReferences(ctx.db, { ...body, actorId: req.user!.id });
    await syncReferences(ctx, [result.kept, result.merged]);
    res.json(result);
  });

  router.get('/references/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await getReference(ctx.db, id));
  });

  router.patch('/references/:id', requireRole('contributor'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const edit = parseInput(referenceEditSchema, req.body);
    const result = await editReference(ctx.db, id, edit, req.user!.id);
    await syncReferences(ctx, [id]);
    res.json(result);
  });

  router.post('/references/:id/screening', requireRole('contributor'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const input = parseInput(screeningDecisionSchema, req.body);
    const result = await decide(ctx.db, id, input, req.user!);
    await syncReferences(ctx, [id]);
    res.status(201).json(result);
  });

  router.post('/references/:id/screening/undo', requireRole('contributor'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const input = parseInput(screeningUndoSchema, req.body);
    const result = await undoLast(ctx.db, id, input, { id: req.user!.id, roles: req.user!.roles });
    await syncReferences(ctx, [id]);
    res.json(result);
  });

  router.post('/references/:id/attachments', requireRole('contributor'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    await new Promise<void>((resolve, reject) =>
      upload.single('file')(req, res, (err?: unknown) => {
        if (err instanceof multer.MulterError) {
          const message = err.code === 'LIMIT_FILE_SIZE' ? `The file is larger than ${ATTACHMENT_MAX_BYTES / 1024 / 1024} MB.` : `The upload was refused: ${err.message}.`;
          reject(new ValidationError(message, [{ path: 'body.file', message }]));
        } else if (err) reject(err);
        else resolve();
      }),
    );
    if (!req.file) throw new ValidationError('Attach a PDF in the "file" field.', [{ path: 'body.file', message: 'choose a PDF file' }]);
    const fh = await open(req.file.path, 'r');
    const head = Buffer.alloc(8);
    await fh.read(head, 0, 8, 0);
    await fh.close();
    const result = await addAttachment(ctx.db, ctx.env.UPLOAD_DIR, { refId: id, tmpPath: req.file.path, originalName: req.file.originalname, size: req.file.size, head, actorId: req.user!.id });
    res.status(201).json(result);
  });

  router.get('/references/:id/attachments/:attachmentId', requireSignIn, async (req, res) => {
    const { id, attachmentId } = parseInput(idParamsSchema.extend({ attachmentId: idParam }), req.params, 'path');
    const file = await attachmentFile(ctx.db, ctx.env.UPLOAD_DIR, id, attachmentId, req.user!);
    res.setHeader('Cache-Control', 'private, no-store');
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.attachment(file.filename);
    res.sendFile(file.path, { dotfiles: 'allow', headers: { 'Content-Type': 'application/pdf' } });
  });

  return router;
}
