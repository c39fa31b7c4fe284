import { Router } from 'express';
import { z } from 'zod';
import { idParam } from '../../shared/schemas/common.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { agreementForReference, overallAgreement, referenceAgreement } from '../services/agreement.js';

const refsQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['reference', 'agreement']).default('agreement'),
  order: z.enum(['asc', 'desc']).default('asc'),
});

/** Inter-coder agreement: overall, per coder pair and per reference (curators and reviewers). */
export function agreementRouter(ctx: AppContext) {
  const router = Router();
  router.use('/agreement', requireRole('curator', 'reviewer'));

  router.get('/agreement', async (_req, res) => {
    res.json(await overallAgreement(ctx.db));
  });

  router.get('/agreement/references', async (req, res) => {
    const q = parseInput(refsQuery, req.query, 'query');
    res.json({ ...(await referenceAgreement(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  router.get('/agreement/references/:id', async (req, res) => {
    const { id } = parseInput(z.object({ id: idParam }), req.params, 'path');
    res.json(await agreementForReference(ctx.db, id));
  });

  return router;
}
