import { Router } from 'express';
import { z } from 'zod';
import { manipulationCreateSchema, manipulationUpdateSchema, termSchema } from '../../shared/schemas/extraction.js';
import { manipulationListQuerySchema } from '../../shared/schemas/registry.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { createManipulation, listManipulations, updateManipulation } from '../services/manipulations.js';

/** The manipulation vocabulary: anyone reads it; curators add, relabel and retire terms. */
export function manipulationsRouter(ctx: AppContext) {
  const router = Router();

  router.get('/manipulations', async (req, res) => {
    res.json(await listManipulations(ctx.db, parseInput(manipulationListQuerySchema, req.query, 'query')));
  });

  router.post('/manipulations', requireRole('curator'), async (req, res) => {
    const body = parseInput(manipulationCreateSchema, req.body);
    res.status(201).json(await createManipulation(ctx.db, req.user!.id, body));
  });

  router.patch('/manipulations/:term', requireRole('curator'), async (req, res) => {
    const { term } = parseInput(z.object({ term: termSchema }), req.params, 'path');
    const body = parseInput(manipulationUpdateSchema, req.body);
    res.json(await updateManipulation(ctx.db, req.user!.id, term, body));
  });

  return router;
}
