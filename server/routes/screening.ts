import { Router } from 'express';
import { screeningBatchDecisionSchema, screeningBatchUndoSchema, screeningQueueQuerySchema } from '../../shared/schemas/references.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { decideMany, prismaCounts, queue, undoMany } from '../services/screening.js';
import { syncReferences } from '../services/search.js';

export function screeningRouter(ctx: AppContext) {
  const router = Router();
  router.get('/screening/queue', requireRole('contributor'), async (req, res) => {
    res.json(await queue(ctx.db, parseInput(screeningQueueQuerySchema, req.query, 'query')));
  });
  router.post('/screening/decisions', requireRole('contributor'), async (req, res) => {
    const input = parseInput(screeningBatchDecisionSchema, req.body);
    const result = await decideMany(ctx.db, input, req.user!);
    await syncReferences(ctx, input.items.map((i) => i.refId));
    res.status(201).json(result);
  });
  router.post('/screening/decisions/undo', requireRole('contributor'), async (req, res) => {
    const input = parseInput(screeningBatchUndoSchema, req.body);
    const result = await undoMany(ctx.db, input, { id: req.user!.id, roles: req.user!.roles });
    await syncReferences(ctx, input.items.map((i) => i.refId));
    res.json(result);
  });
  router.get('/screening/counts', async (_req, res) => {
    res.json(await prismaCounts(ctx.db));
  });
  return router;
}
