import { Router } from 'express';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { requireSignIn } from '../auth/require-role.js';
import { followChangesQuerySchema, followCreateSchema, followIdSchema, unsubscribeSchema } from '../../shared/schemas/following.js';
import { followChanges, followFeed, followSynthesis, listMyFollows, stopFollowing, unsubscribe } from '../services/following.js';

/** Following a synthesis or a snapshot: anyone signed in follows; the feed and the unsubscribe link work signed out. */
export function followsRouter(ctx: AppContext) {
  const router = Router();

  router.post('/follows', requireSignIn, async (req, res) => {
    const input = parseInput(followCreateSchema, req.body);
    res.status(201).json(await followSynthesis(ctx.db, req.user!.id, input, ctx.appOrigin));
  });

  router.get('/follows', requireSignIn, async (req, res) => {
    res.json(await listMyFollows(ctx.db, req.user!.id, ctx.appOrigin));
  });

  // Takes no body: the path names the follow and the session the follower.
  router.delete('/follows/:id', requireSignIn, async (req, res) => {
    const { id } = parseInput(followIdSchema, req.params, 'path');
    await stopFollowing(ctx.db, req.user!.id, id);
    res.status(204).end();
  });

  // The follower's own: the results compared are a synthesis run for them.
  router.get('/follows/:id/changes', requireSignIn, async (req, res) => {
    const { id } = parseInput(followIdSchema, req.params, 'path');
    const { since } = parseInput(followChangesQuerySchema, req.query, 'query');
    res.json(await followChanges(ctx.db, req.user!.id, id, since, ctx.appOrigin));
  });

  router.get('/follows/:id/feed.atom', async (req, res) => {
    const { id } = parseInput(followIdSchema, req.params, 'path');
    const xml = await followFeed(ctx.db, id, ctx.appOrigin);
    res.type('application/atom+xml; charset=utf-8').send(xml);
  });

  // A GET, so the mail's link works from any mail client without signing in; the token is the authority.
  router.get('/follows/unsubscribe', async (req, res) => {
    const { token } = parseInput(unsubscribeSchema, req.query, 'query');
    res.json(await unsubscribe(ctx.db, token));
  });

  return router;
}
