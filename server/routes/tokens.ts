import { Router } from 'express';
import { z } from 'zod';
import { tokenCreateSchema } from '../../shared/schemas/users.js';
import { createApiToken, listApiTokens, revokeApiToken } from '../services/api-tokens.js';
import { requireSignIn } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';

export function tokensRouter(ctx: AppContext) {
  const router = Router();
  router.use('/tokens', requireSignIn);

  router.get('/tokens', async (req, res) => {
    res.json({ items: await listApiTokens(ctx.db, req.user!.id) });
  });

  router.post('/tokens', async (req, res) => {
    const body = parseInput(tokenCreateSchema, req.body);
    res.status(201).json(await createApiToken(ctx.db, req.user!.id, body.name));
  });

  router.delete('/tokens/:id', async (req, res) => {
    const { id } = parseInput(z.object({ id: z.coerce.number().int().positive() }), req.params, 'path');
    await revokeApiToken(ctx.db, req.user!.id, id);
    res.status(204).end();
  });

  return router;
}
