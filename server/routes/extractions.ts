import { Router } from 'express';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { claimableQuerySchema, claimSchema, myExtractionsQuerySchema, saveExtractionSchema, submitExtractionSchema } from '../../shared/schemas/extraction.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { claimReference, getExtraction, listClaimable, listMyExtractions, saveDraft, submitExtraction } from '../services/coding.js';


/** Coding sheets: a contributor's own extractions (blind to the other coder of the pair). */
export function extractionsRouter(ctx: AppContext) {
  const router = Router();
  router.use('/extractions', requireRole('contributor'));

  router.get('/extractions', async (req, res) => {
    res.json(await listMyExtractions(ctx.db, req.user!.id, parseInput(myExtractionsQuerySchema, req.query, 'query')));
  });

  router.get('/extractions/claimable', async (req, res) => {
    res.json(await listClaimable(ctx.db, req.user!.id, parseInput(claimableQuerySchema, req.query, 'query')));
  });

  router.post('/extractions', async (req, res) => {
    const { referenceId } = parseInput(claimSchema, req.body);
    res.status(201).json(await claimReference(ctx.db, req.user!.id, referenceId));
  });

  router.get('/extractions/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await getExtraction(ctx.db, req.user!, id));
  });

  router.put('/extractions/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(saveExtractionSchema, req.body);
    res.json(await saveDraft(ctx.db, req.user!, id, body));
  });

  router.post('/extractions/:id/submit', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(submitExtractionSchema, req.body);
    res.json(await submitExtraction(ctx, req.user!, id, body));
  });

  return router;
}
