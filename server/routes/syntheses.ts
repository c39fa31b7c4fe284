import { Router } from 'express';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { synthesisFacets, synthesizeRegistry } from '../services/synthesis.js';
import { RegistryCache } from '../services/atlas.js';

/** Syntheses over the settled registry: anyone may run one (saving it is a snapshot, for reviewers). */
export function synthesesRouter(ctx: AppContext) {
  const router = Router();
  const cache = new RegistryCache(4);

  router.post('/syntheses', async (req, res) => {
    const request = parseInput(synthesisRequestSchema, req.body);
    const { registryVersion, output } = await synthesizeRegistry(ctx.db, request);
    res.json({ registryVersion, ...output });
  });

  router.get('/syntheses/facets', async (_req, res) => {
    res.type('application/json').send(await cache.get(ctx.db, 'facets', () => synthesisFacets(ctx.db)));
  });

  return router;
}
