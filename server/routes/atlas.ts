import { Router } from 'express';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { atlasReferencesQuerySchema, atlasSlugSchema } from '../../shared/schemas/synthesis.js';
import { RegistryCache } from '../services/registry-cache.js';
import { atlasLanding, atlasManipulation, atlasManipulationPooled, atlasOutcome, atlasReferences } from '../services/atlas.js';

/** What is known, by manipulation and by outcome kind; for anyone, cached by registry version. */
export function atlasRouter(ctx: AppContext) {
  const router = Router();
  const cache = new RegistryCache();
  const send = (res: import('express').Response, body: string) => res.type('application/json').send(body);
  const slug = (params: unknown) => parseInput(atlasSlugSchema, params, 'path').slug;

  router.get('/atlas', async (_req, res) => {
    send(res, await cache.get(ctx.db, 'landing', () => atlasLanding(ctx.db)));
  });

  router.get('/atlas/manipulations/:slug', async (req, res) => {
    const term = slug(req.params);
    send(res, await cache.get(ctx.db, `m:${term}`, () => atlasManipulation(ctx.db, term)));
  });

  router.get('/atlas/manipulations/:slug/pooled', async (req, res) => {
    const term = slug(req.params);
    send(res, await cache.get(ctx.db, `mp:${term}`, () => atlasManipulationPooled(ctx.db, term)));
  });

  router.get('/atlas/manipulations/:slug/references', async (req, res) => {
    const term = slug(req.params);
    const q = parseInput(atlasReferencesQuerySchema, req.query, 'query');
    send(res, await cache.get(ctx.db, `mr:${term}:${JSON.stringify(q)}`, () => atlasReferences(ctx.db, { manipulation: term }, q)));
  });

  router.get('/atlas/outcomes/:slug', async (req, res) => {
    const kind = slug(req.params);
    send(res, await cache.get(ctx.db, `o:${kind}`, () => atlasOutcome(ctx.db, kind)));
  });

  router.get('/atlas/outcomes/:slug/references', async (req, res) => {
    const kind = slug(req.params);
    const q = parseInput(atlasReferencesQuerySchema, req.query, 'query');
    send(res, await cache.get(ctx.db, `or:${kind}:${JSON.stringify(q)}`, () => atlasReferences(ctx.db, { outcome: kind }, q)));
  });

  return router;
}
