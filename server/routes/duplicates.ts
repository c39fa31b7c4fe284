import { Router } from 'express';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { duplicateListQuerySchema, mergeSchema } from '../../shared/schemas/references.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { dismissCandidate, listDuplicateCandidates, mergeCandidate } from '../services/references.js';
import { syncReferences } from '../services/search.js';


export function duplicatesRouter(ctx: AppContext) {
  const router = Router();
  router.use('/duplicates', requireRole('curator'));
  router.get('/duplicates', async (req, res) => {
    res.json(await listDuplicateCandidates(ctx.db, parseInput(duplicateListQuerySchema, req.query, 'query')));
  });
  router.post('/duplicates/:id/merge', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const { keep } = parseInput(mergeSchema, req.body ?? {});
    const result = await mergeCandidate(ctx.db, id, keep, req.user!.id);
    await syncReferences(ctx, [result.kept, result.merged]);
    res.json(result);
  });
  router.post('/duplicates/:id/dismiss', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await dismissCandidate(ctx.db, id, req.user!.id));
  });
  return router;
}
