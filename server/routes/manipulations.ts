import { Router } from 'express';
import { z } from 'zod';
import { manipulationCreateSchema, manipulationUpdateSchema, termSchema } from '../../shared/schemas/extraction.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { createManipulation, listManipulations, updateManipulation } from '../services/manipulations.js';

const listQuery = z.object({
  includeRetired: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
  sort: z.enum(['term', 'label', 'effects']).default('label'),
  order: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(100),
});

/** The manipulation vocabulary: anyone reads it; curators add, relabel and retire terms. */
export function manipulationsRouter(ctx: AppContext) {
  const router = Router();

  router.get('/manipulations', async (req, res) => {
    const q = parseInput(listQuery, req.query, 'query');
    res.json({ ...(await listManipulations(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  router.post('/manipulations', requireRole('curator'), async (req, res) => {
    const body = parseInput(manipulationCreateSchema, req.body);
    res.status(201).json({ manipulation: await createManipulation(ctx.db, req.user!.id, body) });
  });

  router.patch('/manipulations/:term', requireRole('curator'), async (req, res) => {
    const { term } = parseInput(z.object({ term: termSchema }), req.params, 'path');
    const body = parseInput(manipulationUpdateSchema, req.body);
    res.json({ manipulation: await updateManipulation(ctx.db, req.user!.id, term, body) });
  });

  return router;
}
