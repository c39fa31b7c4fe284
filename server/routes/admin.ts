import { Router } from 'express';
import { auditQuerySchema } from '../../shared/schemas/admin.js';
import { roleChangeParamsSchema, userListQuerySchema } from '../../shared/schemas/users.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { listAudit } from '../services/audit.js';
import { grantRole, listUsers, revokeRole } from '../services/users.js';

export function adminRouter(ctx: AppContext) {
  const router = Router();
  router.use('/admin', requireRole('admin'));

  router.get('/admin/users', async (req, res) => {
    const q = parseInput(userListQuerySchema, req.query, 'query');
    res.json(await listUsers(ctx.db, q));
  });

  router.put('/admin/users/:id/roles/:role', async (req, res) => {
    const p = parseInput(roleChangeParamsSchema, req.params, 'path');
    res.json(await grantRole(ctx.db, req.user!.id, p.id, p.role));
  });

  router.delete('/admin/users/:id/roles/:role', async (req, res) => {
    const p = parseInput(roleChangeParamsSchema, req.params, 'path');
    res.json(await revokeRole(ctx.db, req.user!.id, p.id, p.role));
  });

  router.get('/admin/audit', async (req, res) => {
    const q = parseInput(auditQuerySchema, req.query, 'query');
    res.json(await listAudit(ctx.db, q));
  });

  return router;
}
