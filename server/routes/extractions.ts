import { Router } from 'express';
import { z } from 'zod';
import { idParam } from '../../shared/schemas/common.js';
import { saveExtractionSchema, submitExtractionSchema } from '../../shared/schemas/extraction.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { claimReference, getExtraction, listClaimable, listMyExtractions, saveDraft, submitExtraction } from '../services/coding.js';

const idParams = z.object({ id: idParam });
const mineQuery = z.object({
  state: z.enum(['draft', 'submitted', 'matched', 'disputed', 'settled', 'withdrawn']).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['updated', 'reference', 'state']).default('updated'),
  order: z.enum(['asc', 'desc']).default('desc'),
});

const claimableQuery = z.object({
  q: z.string().trim().max(200).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(15),
  sort: z.enum(['reference', 'year']).default('reference'),
  order: z.enum(['asc', 'desc']).default('asc'),
});

/** Coding sheets: a contributor's own extractions (blind to the other coder of the pair). */
export function extractionsRouter(ctx: AppContext) {
  const router = Router();
  router.use('/extractions', requireRole('contributor'));

  router.get('/extractions', async (req, res) => {
    const q = parseInput(mineQuery, req.query, 'query');
    res.json({ ...(await listMyExtractions(ctx.db, req.user!.id, q)), page: q.page, pageSize: q.pageSize });
  });

  router.get('/extractions/claimable', async (req, res) => {
    const q = parseInput(claimableQuery, req.query, 'query');
    res.json({ ...(await listClaimable(ctx.db, req.user!.id, q)), page: q.page, pageSize: q.pageSize });
  });

  router.post('/extractions', async (req, res) => {
    const { referenceId } = parseInput(z.object({ referenceId: idParam }), req.body);
    res.status(201).json(await claimReference(ctx.db, req.user!.id, referenceId));
  });

  router.get('/extractions/:id', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    res.json(await getExtraction(ctx.db, req.user!, id));
  });

  router.put('/extractions/:id', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(saveExtractionSchema, req.body);
    res.json(await saveDraft(ctx.db, req.user!, id, body));
  });

  router.post('/extractions/:id/submit', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(submitExtractionSchema, req.body);
    res.json(await submitExtraction(ctx, req.user!, id, body));
  });

  return router;
}
