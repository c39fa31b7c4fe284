import { Router } from 'express';
import type { AppContext } from '../context.js';
import { checkHealth } from '../services/health.js';

export function healthRouter(ctx: AppContext) {
  const router = Router();
  router.get('/health', async (_req, res) => {
    const { available, body } = await checkHealth(ctx);
    res.status(available ? 200 : 503).json(body);
  });
  return router;
}
