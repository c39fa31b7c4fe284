import { Router } from 'express';
import type { AppContext } from '../context.js';
import { chargeCaller, costs } from '../lib/caller-budget.js';
import { parseInput } from '../lib/validate.js';
import { synthesisExportPathSchema, synthesisExportQuerySchema, synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { liveSynthesisExport, registrySynthesis, synthesisFacets, synthesisSize } from '../services/synthesis.js';
import { RegistryCache } from '../services/registry-cache.js';
import { flowSvg, liveSynthesisFlow } from '../services/flow.js';

/** Syntheses over the settled registry: anyone may run one (saving it is a snapshot, for reviewers). */
export function synthesesRouter(ctx: AppContext) {
  const router = Router();
  const facetsCache = new RegistryCache(4);
  // A synthesis is a pure function of the request and the settled registry, so answers are kept per
  // registry version (any settled change retires them all); the header says whether this one was computed.
  const answers = new RegistryCache(64);

  // Each synthesis is paid from the caller's budget by the number of effects it covers (a kept answer costs less).
  router.post('/syntheses', async (req, res) => {
    const request = parseInput(synthesisRequestSchema, req.body);
    const key = JSON.stringify(request);
    const [k, kept] = await Promise.all([synthesisSize(ctx.db, request), answers.has(ctx.db, key)]);
    chargeCaller(req, costs.synthesis(k, kept), `A synthesis of ${k} effects`);
    let computed = false;
    const body = await answers.get(ctx.db, key, () => {
      computed = true;
      return registrySynthesis(ctx.db, request);
    });
    res.set('X-Synthesis-Cache', computed ? 'miss' : 'hit').type('application/json').send(body);
  });

  // A link (GET) so a browser downloads it as it is and a script can fetch it; the name carries the registry version.
  router.get('/syntheses/export/:file', async (req, res) => {
    const { file } = parseInput(synthesisExportPathSchema, req.params, 'path');
    const { request } = parseInput(synthesisExportQuerySchema, req.query, 'query');
    const k = await synthesisSize(ctx.db, request);
    chargeCaller(req, costs.synthesis(k), `An export of a synthesis of ${k} effects`);
    if (file === 'flow.svg') {
      const { registryVersion, flow } = await liveSynthesisFlow(ctx.db, request);
      const name = `chronometa-synthesis-v${registryVersion}-flow.svg`;
      res.type('image/svg+xml; charset=utf-8').set('Content-Disposition', `attachment; filename="${name}"`).send(flowSvg(flow, `Synthesis on registry version ${registryVersion} (not saved)`));
      return;
    }
    const out = await liveSynthesisExport(ctx.db, request, file);
    res.type(out.type).set('Content-Disposition', `attachment; filename="${out.name}"`).send(out.body);
  });

  router.post('/syntheses/flow', async (req, res) => {
    const request = parseInput(synthesisRequestSchema, req.body);
    const k = await synthesisSize(ctx.db, request);
    chargeCaller(req, costs.synthesis(k), `The flow of a synthesis of ${k} effects`);
    res.json(await liveSynthesisFlow(ctx.db, request));
  });

  router.get('/syntheses/facets', async (_req, res) => {
    res.type('application/json').send(await facetsCache.get(ctx.db, 'facets', () => synthesisFacets(ctx.db)));
  });

  return router;
}
