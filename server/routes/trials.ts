import express, { Router } from 'express';
import multer from 'multer';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { contrastQuerySchema, startFitsSchema, trialSetParamsSchema, trialUploadSchema } from '../../shared/schemas/trials.js';
import { TRIAL_UPLOAD_MAX_BYTES } from '../../shared/trials/csv.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { ValidationError } from '../lib/errors.js';
import { parseInput } from '../lib/validate.js';
import { getTrialSet, listTrialSets, startFits, trialContrast, trialSetCsv, uploadTrialSet } from '../services/trials.js';

/** Trial data on coding sheets: upload, fits (a job), the effect two conditions give, the rows as CSV. */
export function trialsRouter(ctx: AppContext) {
  const router = Router();
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: TRIAL_UPLOAD_MAX_BYTES, files: 1, fields: 8 } });
  const takeFile: express.RequestHandler = (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      return next(new ValidationError('Send the CSV as a file upload (multipart/form-data, field "file").', [{ path: 'body.file', message: 'choose a CSV file' }]));
    }
    upload.single('file')(req, res, (err?: unknown) => {
      if (err instanceof multer.MulterError) {
        const message = err.code === 'LIMIT_FILE_SIZE' ? `The file is larger than ${TRIAL_UPLOAD_MAX_BYTES / 1024 / 1024} MB; split it into several data sets.` : `The upload was refused: ${err.message}.`;
        return next(new ValidationError(message, [{ path: `body.${err.field ?? 'file'}`, message }]));
      }
      next(err);
    });
  };

  router.post('/extractions/:id/trial-sets', requireRole('contributor'), takeFile, async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const meta = parseInput(trialUploadSchema, req.body ?? {});
    if (!req.file) throw new ValidationError('Choose a CSV file of trials or counts.', [{ path: 'body.file', message: 'choose a CSV file' }]);
    const text = req.file.buffer.toString('utf8');
    if (text.includes('\u0000')) throw new ValidationError('The file is not text: upload a CSV.', [{ path: 'body.file', message: 'the file is not a text file' }]);
    res.status(201).json(await uploadTrialSet(ctx.db, req.user!, id, { name: req.file.originalname, text }, meta));
  });

  router.get('/extractions/:id/trial-sets', requireRole('contributor'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await listTrialSets(ctx.db, req.user!, id));
  });

  router.get('/trial-sets/:setId', requireRole('contributor'), async (req, res) => {
    const { setId } = parseInput(trialSetParamsSchema, req.params, 'path');
    res.json(await getTrialSet(ctx.db, req.user!, setId));
  });

  router.post('/trial-sets/:setId/fits', requireRole('contributor'), async (req, res) => {
    const { setId } = parseInput(trialSetParamsSchema, req.params, 'path');
    const body = parseInput(startFitsSchema, req.body ?? {});
    res.status(202).json(await startFits(ctx, req.user!, setId, body));
  });

  router.get('/trial-sets/:setId/contrast', requireRole('contributor'), async (req, res) => {
    const { setId } = parseInput(trialSetParamsSchema, req.params, 'path');
    const q = parseInput(contrastQuerySchema, req.query, 'query');
    res.json(await trialContrast(ctx.db, req.user!, setId, q));
  });

  router.get('/trial-sets/:setId/trials.csv', requireRole('contributor'), async (req, res) => {
    const { setId } = parseInput(trialSetParamsSchema, req.params, 'path');
    const { name, csv } = await trialSetCsv(ctx.db, req.user!, setId);
    res.type('text/csv; charset=utf-8').set('Content-Disposition', `attachment; filename="${name}"`).send(csv);
  });

  return router;
}
