import { Router, type Request } from 'express';
import type { AppContext } from '../context.js';
import { callerKey, chargeCaller, costs } from '../lib/caller-budget.js';
import { parseInput } from '../lib/validate.js';
import { synthesisExportPathSchema, synthesisExportQuerySchema, synthesisRequestSchema, synthesisRowsQuerySchema, type SynthesisRequest } from '../../shared/schemas/synthesis.js';
import { liveSynthesisExport, synthesisFacets, synthesisSize, synthesisSizeGuess } from '../services/synthesis.js';
import { RegistryCache, RegistryMemo } from '../services/registry-cache.js';
import { SynthesisPool } from '../services/synthesis-pool.js';
import { flowSvg, liveSynthesisFlow } from '../services/flow.js';

/** Syntheses over the settled registry: anyone may run one (saving it is a snapshot, for reviewers). */
export function synthesesRouter(ctx: AppContext) {
  const router = Router();
  const facetsCache = new RegistryCache(4);
  // A synthesis is a pure function of the request and the settled registry, so answers are kept per
  // registry version (any settled change retires them all); the header says whether this one was computed.
  const answers = new RegistryMemo<string>(64, 32 * 1024 * 1024, (text) => text.length);
  // The pooling and the JSON are done off the event loop, one synthesis at a time, callers taking turns.
  const pool = new SynthesisPool(ctx.db);
  // a running server loads the settled effects at start rather than on the first synthesis (tests start many apps)
  if (ctx.env.NODE_ENV !== 'test') pool.warm().catch((err) => console.error('[synthesis warm-up]', err));

  // Each synthesis is paid from the caller's budget by the number of effects it covers (a kept answer costs less):
  // first by the registry as last loaded, before any query, so a caller out of budget costs the database nothing;
  // then topped up to the exact cost.
  const charge = async (req: Request, request: SynthesisRequest, what: string) => {
    const key = JSON.stringify(request);
    const guess = synthesisSizeGuess(ctx.db, request);
    chargeCaller(req, costs.synthesis(guess, answers.peek(key)), `${what} of ${guess} effects`);
    const [k, kept] = await Promise.all([synthesisSize(ctx.db, request), answers.has(ctx.db, key)]);
    chargeCaller(req, costs.synthesis(k, kept), `${what} of ${k} effects`);
  };

  router.post('/syntheses', async (req, res) => {
    const request = parseInput(synthesisRequestSchema, req.body);
    const view = parseInput(synthesisRowsQuerySchema, req.query, 'query');
    await charge(req, request, 'A synthesis');
    const caller = callerKey(req);
    let computed = false;
    const body = await answers.get(ctx.db, JSON.stringify(request), () => {
      computed = true;
      return pool.run(caller, { kind: 'answer', request });
    });
    res
      .set('X-Synthesis-Cache', computed ? 'miss' : 'hit')
      .type('application/json')
      .send(view.rows === 'all' ? body : await pool.run(caller, { kind: 'view', request, view }));
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
