import express, { Router } from 'express';
import type { AppContext } from '../context.js';
import { perMinuteLimit } from '../lib/rate-limit.js';
import { parseInput } from '../lib/validate.js';
import { UnprocessableError, ValidationError } from '../lib/errors.js';
import { computeEffect, pool, StatsInputError, StatsRangeError } from '../../shared/stats/index.js';
import { effectInputSchema, poolInputSchema } from '../../shared/schemas/compute.js';

/**
 * The stateless compute routes: POST /api/compute/pool and POST /api/compute/effect take and return the
 * same JSON as `npm run meta -- pool|effect`. Open to anyone, rate-limited per client, bodies up to
 * 200,000 effects (their own JSON parser, 20 MB, so it is mounted among the early routers).
 */
export function computeRouter(ctx: AppContext) {
  const router = Router();
  const limiter = perMinuteLimit(ctx.env.COMPUTE_RATE_LIMIT_PER_MINUTE, 'Too many compute requests; wait a minute and try again.');
  // 200,000 effects and variances as JSON text are at most ~10 MB
  const json = express.json({ limit: '20mb' });

  router.post('/compute/pool', limiter, json, (req, res) => {
    const input = parseInput(poolInputSchema, req.body);
    res.json(run(() => pool(input)));
  });

  router.post('/compute/effect', limiter, json, (req, res) => {
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
