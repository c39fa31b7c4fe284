import express, { Router } from 'express';
import type { AppContext } from '../context.js';
import { chargeCaller, costs, prepayBody } from '../lib/caller-budget.js';
import { parseInput } from '../lib/validate.js';
import { UnprocessableError, ValidationError } from '../lib/errors.js';
import { computeEffect, pool, StatsInputError, StatsRangeError } from '../../shared/stats/index.js';
import { effectInputSchema, poolInputSchema } from '../../shared/schemas/compute.js';

/**
 * The stateless compute routes: POST /api/compute/pool and POST /api/compute/effect take and return the
 * same JSON as `npm run meta -- pool|effect`. Open to anyone, paid from the caller's budget by k, bodies up to
 * 200,000 effects (their own JSON parser, 20 MB, so it is mounted among the early routers).
 */
export function computeRouter(_ctx: AppContext) {
  const router = Router();
  // 200,000 effects and variances as JSON text are at most ~10 MB
  const json = express.json({ limit: '20mb' });
  const prepay = prepayBody();

  router.post('/compute/pool', prepay, json, (req, res) => {
    const input = parseInput(poolInputSchema, req.body);
    chargeCaller(req, costs.pool(input.effects.length), `Pooling ${input.effects.length} effects`);
    res.json(run(() => pool(input)));
  });

  router.post('/compute/effect', prepay, json, (req, res) => {
    const input = parseInput(effectInputSchema, req.body);
    res.json(run(() => computeEffect(input)));
  });

  return router;
}

/** The library's own refusals (naming the offending position) become 400s; results out of floating-point range 422s. */
function run<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof StatsRangeError) throw new UnprocessableError(err.message, err.field ? [{ path: `body.${err.field}`, message: err.message }] : undefined);
    if (err instanceof StatsInputError) throw new ValidationError(err.message, err.field ? [{ path: `body.${err.field}`, message: err.message }] : undefined);
    throw err;
  }
}
