import { Router } from 'express';
import { z } from 'zod';
import { roleChangeParamsSchema, userListQuerySchema } from '../../shared/schemas/users.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { listAudit } from '../services/audit.js';
import { grantRole, listUsers, revokeRole } from '../services/users.js';

const auditQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  entityType: z.string().max(50).optional(),
  entityId: z.string().max(50).optional(),
  action: z.string().max(80).optional(),
});

export function adminRouter(ctx: AppContext) {
  const router = Router();
  router.use('/admin', requireRole('admin'));

  router.get('/admin/users', async (req, res) => {
    const q = parseInput(userListQuerySchema, req.query, 'query');
    const result = await listUsers(ctx.db, q);
    res.json({ ...result, page: q.page, pageSize: q.pageSize });
  });

  router.put('/admin/users/:id/roles/:role', async (req, res) => {
    const p = parseInput(roleChangeParamsSchema, req.params, 'path');
    res.json({ user: await grantRole(ctx.db, req.user!.id, p.id, p.role) });
  });

  router.delete('/admin/users/:id/roles/:role', async (req, res) => {
    const p = parseInput(roleChangeParamsSchema, req.params, 'path');
    res.json({ user: await revokeRole(ctx.db, req.user!.id, p.id, p.role) });
  });

  router.get('/admin/audit', async (req, res) => {
    const q = parseInput(auditQuerySchema, req.query, 'query');
    res.json({ ...(await listAudit(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  return router;
}
