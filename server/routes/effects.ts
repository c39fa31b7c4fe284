import { Router } from 'express';
import { editSettledEffectSchema, effectsQuerySchema, reasonSchema } from '../../shared/schemas/extraction.js';
import { idParam } from '../../shared/schemas/common.js';
import { z } from 'zod';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { countSettledEffects, getSettledEffect, querySettledEffects } from '../db/effects-repo.js';
import { currentRegistryVersion } from '../db/registry-version.js';
import { NotFoundError } from '../lib/errors.js';
import { parseInput } from '../lib/validate.js';
import { editSettledEffect, withdrawEffect } from '../services/extractions.js';

const idParams = z.object({ id: idParam });

/** The read side of the registry: settled effects, open to anyone. */
export function effectsRouter(ctx: AppContext) {
  const router = Router();

  router.get('/effects', async (req, res) => {
    const { state: _state, page, pageSize, sort, order, ...filters } = parseInput(effectsQuerySchema, req.query, 'query');
    const [items, total, registryVersion] = await Promise.all([
      querySettledEffects(ctx.db, filters, { page, pageSize, sort, order }),
      countSettledEffects(ctx.db, filters),
      currentRegistryVersion(ctx.db),
    ]);
    res.json({ items, total, page, pageSize, registryVersion });
  });

  router.get('/effects/:id', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const effect = await getSettledEffect(ctx.db, id);
    if (!effect) throw new NotFoundError(`No settled effect ${id}.`);
    const row = await ctx.db('effects').where({ id }).first('reported', 'report_form', 'page', 'locator', 'quote', 'version');
    res.json({ effect: { ...effect, form: row.report_form, reported: row.reported, page: row.page, locator: row.locator, quote: row.quote, version: row.version } });
  });

  router.patch('/effects/:id', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(editSettledEffectSchema, req.body);
    const result = await editSettledEffect(ctx.db, req.user!.id, id, body);
    res.json(result);
  });

  router.post('/effects/:id/withdraw', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(reasonSchema, req.body);
    res.json(await withdrawEffect(ctx.db, req.user!.id, id, body.reason));
  });

  return router;
}
