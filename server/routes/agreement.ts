import { Router } from 'express';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { agreementQuerySchema } from '../../shared/schemas/reconciliation.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { agreementForReference, overallAgreement, referenceAgreement } from '../services/agreement.js';

/** Inter-coder agreement: overall, per coder pair and per reference (curators and reviewers). */
export function agreementRouter(ctx: AppContext) {
  const router = Router();
  router.use('/agreement', requireRole('curator', 'reviewer'));

  router.get('/agreement', async (_req, res) => {
    res.json(await overallAgreement(ctx.db));
  });

  router.get('/agreement/references', async (req, res) => {
    res.json(await referenceAgreement(ctx.db, parseInput(agreementQuerySchema, req.query, 'query')));
  });

  router.get('/agreement/references/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await agreementForReference(ctx.db, id));
  });

  return router;
}
