import { Router } from 'express';
import { auditQuerySchema } from '../../shared/schemas/admin.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { listAudit } from '../services/audit.js';

/** The audit log, read by curators (an admin holds the curator role); /api/admin/audit answers the same. */
export function auditRouter(ctx: AppContext) {
  const router = Router();
  router.get('/audit', requireRole('curator'), async (req, res) => {
    const q = parseInput(auditQuerySchema, req.query, 'query');
    res.json(await listAudit(ctx.db, q));
  });
  return router;
}
