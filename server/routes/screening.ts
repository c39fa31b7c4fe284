import { Router } from 'express';
import { screeningQueueQuerySchema } from '../../shared/schemas/references.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { prismaCounts, queue } from '../services/screening.js';

export function screeningRouter(ctx: AppContext) {
  const router = Router();
  router.get('/screening/queue', requireRole('contributor'), async (req, res) => {
    res.json(await queue(ctx.db, parseInput(screeningQueueQuerySchema, req.query, 'query')));
  });
  router.get('/screening/counts', async (_req, res) => {
    res.json(await prismaCounts(ctx.db));
  });
  return router;
}
