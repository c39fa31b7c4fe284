import { Router } from 'express';
import type { AppContext } from '../context.js';
import { perMinuteLimit } from '../lib/rate-limit.js';
import { parseInput } from '../lib/validate.js';
import { synthesisExportPathSchema, synthesisExportQuerySchema, synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { liveSynthesisExport, registrySynthesis, synthesisFacets } from '../services/synthesis.js';
import { RegistryCache } from '../services/registry-cache.js';

/** Syntheses over the settled registry: anyone may run one (saving it is a snapshot, for reviewers). */
export function synthesesRouter(ctx: AppContext) {
  const router = Router();
  const facetsCache = new RegistryCache(4);
  // A synthesis is a pure function of the request and the settled registry, so answers are kept per
  // registry version (any settled change retires them all); the header says whether this one was computed.
  const answers = new RegistryCache(64);

  // Signed-out callers share the compute routes' per-client limit; signed-in users and tokens are not limited.
  const anonymousLimit = perMinuteLimit(ctx.env.COMPUTE_RATE_LIMIT_PER_MINUTE, 'Too many syntheses from this address; wait a minute, or sign in.', (req) => !!req.user);

  router.post('/syntheses', anonymousLimit, async (req, res) => {
    const request = parseInput(synthesisRequestSchema, req.body);
    let computed = false;
    const body = await answers.get(ctx.db, JSON.stringify(request), () => {
      computed = true;
      return registrySynthesis(ctx.db, request);
    });
    res.set('X-Synthesis-Cache', computed ? 'miss' : 'hit').type('application/json').send(body);
  });

  // A link (GET) so a browser downloads it as it is and a script can fetch it; the name carries the registry version.
  router.get('/syntheses/export/:file', anonymousLimit, async (req, res) => {
    const { file } = parseInput(synthesisExportPathSchema, req.params, 'path');
    const { request } = parseInput(synthesisExportQuerySchema, req.query, 'query');
    const out = await liveSynthesisExport(ctx.db, request, file);
    res.type(out.type).set('Content-Disposition', `attachment; filename="${out.name}"`).send(out.body);
  });

  router.get('/syntheses/facets', async (_req, res) => {
    res.type('application/json').send(await facetsCache.get(ctx.db, 'facets', () => synthesisFacets(ctx.db)));
  });

  return router;
}
