import express, { Router } from 'express';
import { idParamsSchema } from '../../shared/schemas/common.js';
import multer from 'multer';
import path from 'node:path';
import { IMPORT_FORMATS, importEntriesQuerySchema, importListQuerySchema, importRequestSchema, type ImportFormat } from '../../shared/schemas/references.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { ValidationError } from '../lib/errors.js';
import { costs, prepayBody } from '../lib/caller-budget.js';
import { parseInput } from '../lib/validate.js';
import { getImport, importDois, importText, listImports } from '../services/imports.js';

const MAX_UPLOAD_BYTES = 20 * 1024 * 1024;
const EXTENSIONS: Record<string, ImportFormat> = { '.bib': 'bibtex', '.bibtex': 'bibtex', '.ris': 'ris', '.txt': 'doi' };

/** Pasted files can be large: this parser runs before the app's 2 MB JSON parser, for POST /imports only. */
export function importsBodyRouter() {
  const router = Router();
  router.post('/imports', prepayBody(costs.import), express.json({ limit: '25mb' }));
  return router;
}

export function importsRouter(ctx: AppContext) {
  const router = Router();
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 5 },
    fileFilter: (_req, file, cb) => {
      const ext = path.extname(file.originalname).toLowerCase();
      const okType = /^(text\/|application\/(x-bibtex|x-research-info-systems|octet-stream))/.test(file.mimetype);
      if (!(ext in EXTENSIONS) && !okType) {
        cb(new ValidationError(`"${file.originalname}" is not a BibTeX (.bib), RIS (.ris) or DOI list (.txt) file.`, [{ path: 'body.file', message: 'use a .bib, .ris or .txt file' }]));
        return;
      }
      cb(null, true);
    },
  });
  const maybeUpload: express.RequestHandler = (req, res, next) => {
    if (!req.is('multipart/form-data')) return next();
    upload.single('file')(req, res, (err?: unknown) => {
      if (err instanceof multer.MulterError) {
        const message = err.code === 'LIMIT_FILE_SIZE' ? `The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.` : `The upload was refused: ${err.message}.`;
        return next(new ValidationError(message, [{ path: `body.${err.field ?? 'file'}`, message }]));
      }
      next(err);
    });
  };

  router.post('/imports', requireRole('contributor'), maybeUpload, async (req, res) => {
    let body: unknown = req.body;
    if (req.file) {
      const ext = path.extname(req.file.originalname).toLowerCase();
      const format = (req.body?.format as string | undefined) || EXTENSIONS[ext];
      if (!format || !(IMPORT_FORMATS as readonly string[]).includes(format)) {
        throw new ValidationError('Say which format the file is in (bibtex, ris or doi).', [{ path: 'body.format', message: 'format must be bibtex, ris or doi' }]);
      }
      const text = req.file.buffer.toString('utf8').replace(/^\uFEFF/, '');
      if (text.includes('\u0000')) throw new ValidationError('The file is not text.', [{ path: 'body.file', message: 'the file is not a text file' }]);
      body = { format, text, label: req.body?.label || req.file.originalname };
    }
    const input = parseInput(importRequestSchema, body);
    const userId = req.user!.id;
    if (input.format === 'doi') {
      const result = await importDois(ctx, { text: input.text, label: input.label, userId });
      res.status(result.batch.state === 'done' ? 201 : 202).json(result);
      return;
    }
    // a large text is queued as a job: 202 with the batch (queued) and where to read its progress
    const result = await importText(ctx, { format: input.format, text: input.text, label: input.label, userId });
    if (result.batch.state !== 'done') res.status(202).location(`/api/imports/${result.batch.id}`);
    else res.status(201);
    res.json(result);
  });

  router.get('/imports', requireRole('contributor'), async (req, res) => {
    const q = parseInput(importListQuerySchema, req.query, 'query');
    res.json(await listImports(ctx.db, q));
  });

  router.get('/imports/:id', requireRole('contributor'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const q = parseInput(importEntriesQuerySchema, req.query, 'query');
    res.json(await getImport(ctx.db, id, q.entryPage ? { page: q.entryPage, pageSize: q.entryPageSize, status: q.entryStatus } : undefined));
  });

  return router;
}
