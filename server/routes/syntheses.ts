import { Router } from 'express';
import type { AppContext } from '../context.js';
import { chargeCaller, costs } from '../lib/caller-budget.js';
import { parseInput } from '../lib/validate.js';
import { synthesisExportPathSchema, synthesisExportQuerySchema, synthesisRequestSchema, synthesisRowsQuerySchema, synthesisTableRequestSchema, type SynthesisAnswer, type SynthesisRequest } from '../../shared/schemas/synthesis.js';
import { answerRows, rowsPage } from '../../shared/synthesis/answer-rows.js';
import { liveSynthesisExport, registrySynthesis, synthesisFacets, synthesisRowsView, synthesisSize } from '../services/synthesis.js';
import { RegistryCache, RegistryMemo } from '../services/registry-cache.js';
import { flowSvg, liveSynthesisFlow } from '../services/flow.js';

/** Syntheses over the settled registry: anyone may run one (saving it is a snapshot, for reviewers). */
export function synthesesRouter(ctx: AppContext) {
  const router = Router();
  const facetsCache = new RegistryCache(4);
  // A synthesis is a pure function of the request and the settled registry, so answers are kept per
  // registry version (any settled change retires them all); the header says whether this one was computed.
  const answers = new RegistryCache(64);
  // The whole outputs (every row) of recent syntheses, which ?rows=page and the rows route page: at most 200,000 rows in all.
  const outputs = new RegistryMemo<SynthesisAnswer>(16, 200_000, (o) => o.rows.length);
  const fullOutput = (request: SynthesisRequest) => outputs.get(ctx.db, JSON.stringify(request), () => registrySynthesis(ctx.db, request));

  // Each synthesis is paid from the caller's budget by the number of effects it covers (a kept answer costs less).
  router.post('/syntheses', async (req, res) => {
    const request = parseInput(synthesisRequestSchema, req.body);
    const view = parseInput(synthesisRowsQuerySchema, req.query, 'query');
    const key = JSON.stringify(request);
    const [k, kept] = await Promise.all([synthesisSize(ctx.db, request), answers.has(ctx.db, key)]);
    chargeCaller(req, costs.synthesis(k, kept), `A synthesis of ${k} effects`);
    let computed = false;
    const body = await answers.get(ctx.db, key, () => {
      computed = true;
      return fullOutput(request).then(answerRows);
    });
    res
      .set('X-Synthesis-Cache', computed ? 'miss' : 'hit')
      .type('application/json')
      .send(view.rows === 'all' ? body : JSON.stringify(synthesisRowsView(await fullOutput(request), view)));
  });

  // The pooled rows of a synthesis, a page at a time, sorted on the server (an answer carries only the first page of a long list).
  router.post('/syntheses/rows', async (req, res) => {
    const q = parseInput(synthesisTableRequestSchema, req.body);
    const [k, kept] = await Promise.all([synthesisSize(ctx.db, q.request), outputs.has(ctx.db, JSON.stringify(q.request))]);
    chargeCaller(req, costs.synthesis(k, kept), `The rows of a synthesis of ${k} effects`);
    res.json(rowsPage((await fullOutput(q.request)).rows, q));
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
