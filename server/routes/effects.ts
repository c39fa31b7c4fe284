import { Router } from 'express';
import { editSettledEffectSchema, effectsQuerySchema, reasonSchema } from '../../shared/schemas/extraction.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { listSettledEffects, settledEffectDetail } from '../services/effects.js';
import { editSettledEffect, withdrawEffect } from '../services/records.js';


/** The read side of the registry: settled effects, open to anyone. */
export function effectsRouter(ctx: AppContext) {
  const router = Router();

  router.get('/effects', async (req, res) => {
    const { state: _state, page, pageSize, sort, order, ...filters } = parseInput(effectsQuerySchema, req.query, 'query');
    res.json(await listSettledEffects(ctx.db, filters, { page, pageSize, sort, order }));
  });

  router.get('/effects/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await settledEffectDetail(ctx.db, id));
  });

  router.patch('/effects/:id', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(editSettledEffectSchema, req.body);
    const result = await editSettledEffect(ctx.db, req.user!.id, id, body);
    res.json(result);
  });

  router.post('/effects/:id/withdraw', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(reasonSchema, req.body);
    res.json(await withdrawEffect(ctx.db, req.user!.id, id, body.reason));
  });

  return router;
}
