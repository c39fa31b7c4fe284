import { Router } from 'express';
import { searchQuerySchema } from '../../shared/schemas/references.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { searchReferences } from '../services/search.js';

export function searchRouter(ctx: AppContext) {
  const router = Router();
  router.get('/search', async (req, res) => {
    const q = parseInput(searchQuerySchema, req.query, 'query');
    res.json(await searchReferences(ctx, q));
  });
  return router;
}
