import { Router } from 'express';
import { createAssignmentSchema } from '../../shared/schemas/extraction.js';
import { assignmentListQuerySchema, candidateQuerySchema } from '../../shared/schemas/reconciliation.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { createAssignment, listAssignments, listCandidates, listCoders } from '../services/assignments.js';

/** Double-coding assignments (curators). */
export function assignmentsRouter(ctx: AppContext) {
  const router = Router();
  router.use('/assignments', requireRole('curator'));

  router.get('/assignments', async (req, res) => {
    res.json(await listAssignments(ctx.db, parseInput(assignmentListQuerySchema, req.query, 'query')));
  });

  router.get('/assignments/candidates', async (req, res) => {
    res.json(await listCandidates(ctx.db, parseInput(candidateQuerySchema, req.query, 'query')));
  });

  router.get('/assignments/coders', async (req, res) => {
    res.json(await listCoders(ctx.db, req.user!.id));
  });

  router.post('/assignments', async (req, res) => {
    const body = parseInput(createAssignmentSchema, req.body);
    res.status(201).json(await createAssignment(ctx, req.user!.id, body));
  });

  return router;
}
