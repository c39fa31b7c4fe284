import { Router } from 'express';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { tokenCreateSchema } from '../../shared/schemas/users.js';
import { createApiToken, listApiTokens, revokeApiToken } from '../services/api-tokens.js';
import { requireSignIn } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { ForbiddenError } from '../lib/errors.js';

export function tokensRouter(ctx: AppContext) {
  const router = Router();
  // A token cannot mint, list or revoke tokens (one that leaked could outlive its own revocation): a session only.
  router.use('/tokens', requireSignIn, (req, _res, next) => {
    if (req.user!.via !== 'session') throw new ForbiddenError('API tokens are minted, listed and revoked from a signed-in session, not with a token.');
    next();
  });

  router.get('/tokens', async (req, res) => {
    res.json(await listApiTokens(ctx.db, req.user!.id));
  });

  router.post('/tokens', async (req, res) => {
    const body = parseInput(tokenCreateSchema, req.body);
    // Behind the session-only rule above tokenId is unset; it is passed so a token-minted token is always chained.
    res.status(201).json(await createApiToken(ctx.db, req.user!.id, body.name, req.user!.tokenId ?? null));
  });

  router.delete('/tokens/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    await revokeApiToken(ctx.db, req.user!.id, id);
    res.status(204).end();
  });

  return router;
}
