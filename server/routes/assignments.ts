import { Router } from 'express';
import { z } from 'zod';
import { createAssignmentSchema } from '../../shared/schemas/extraction.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { createAssignment, listAssignments, listCandidates, listCoders } from '../services/assignments.js';

const listQuery = z.object({
  state: z.enum(['coding', 'matched', 'disputed', 'settled', 'withdrawn']).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['id', 'updated', 'reference']).default('updated'),
  order: z.enum(['asc', 'desc']).default('desc'),
});
const candidatesQuery = z.object({
  q: z.string().trim().max(200).optional(),
  status: z.enum(['unassigned', 'any']).default('unassigned'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['reference', 'year', 'id']).default('reference'),
  order: z.enum(['asc', 'desc']).default('asc'),
});

/** Double-coding assignments (curators). */
export function assignmentsRouter(ctx: AppContext) {
  const router = Router();
  router.use('/assignments', requireRole('curator'));

  router.get('/assignments', async (req, res) => {
    const q = parseInput(listQuery, req.query, 'query');
    res.json({ ...(await listAssignments(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  router.get('/assignments/candidates', async (req, res) => {
    const q = parseInput(candidatesQuery, req.query, 'query');
    res.json({ ...(await listCandidates(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  router.get('/assignments/coders', async (_req, res) => {
    res.json({ items: await listCoders(ctx.db) });
  });

  router.post('/assignments', async (req, res) => {
    const body = parseInput(createAssignmentSchema, req.body);
    res.status(201).json(await createAssignment(ctx, req.user!.id, body));
  });

  return router;
}
