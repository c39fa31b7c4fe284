import { Router } from 'express';
import { screeningBatchDecisionSchema, screeningBatchUndoSchema, screeningQueueQuerySchema } from '../../shared/schemas/references.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import { screeningConflictsQuerySchema, screeningRuleInputSchema, screeningSettleSchema } from '../../shared/schemas/screening.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { decideMany, prismaCounts, queue, undoMany } from '../services/screening.js';
import { agreementCounts, conflicts, getRule, setRule, settle } from '../services/screening-votes.js';
import { syncReferences } from '../services/search.js';

export function screeningRouter(ctx: AppContext) {
  const router = Router();
  router.get('/screening/queue', requireRole('contributor'), async (req, res) => {
    res.json(await queue(ctx.db, parseInput(screeningQueueQuerySchema, req.query, 'query'), req.user!));
  });
  router.post('/screening/decisions', requireRole('contributor'), async (req, res) => {
    const input = parseInput(screeningBatchDecisionSchema, req.body);
    const result = await decideMany(ctx.db, input, req.user!);
    await syncReferences(ctx, input.items.map((i) => i.refId));
    res.status(201).json(result);
  });
  router.post('/screening/decisions/undo', requireRole('contributor'), async (req, res) => {
    const input = parseInput(screeningBatchUndoSchema, req.body);
    const result = await undoMany(ctx.db, input, { id: req.user!.id, roles: req.user!.roles });
    await syncReferences(ctx, input.items.map((i) => i.refId));
    res.json(result);
  });
  router.get('/screening/rule', requireRole('contributor'), async (_req, res) => {
    res.json(await getRule(ctx.db));
  });
  router.put('/screening/rule', requireRole('curator'), async (req, res) => {
    res.json(await setRule(ctx.db, parseInput(screeningRuleInputSchema, req.body).screeners, req.user!));
  });
  router.get('/screening/conflicts', requireRole('curator'), async (req, res) => {
    res.json(await conflicts(ctx.db, parseInput(screeningConflictsQuerySchema, req.query, 'query'), req.user!));
  });
  router.post('/screening/conflicts/:id/settle', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const result = await settle(ctx.db, id, parseInput(screeningSettleSchema, req.body), req.user!);
    await syncReferences(ctx, [id]);
    res.json(result);
  });
  router.get('/screening/agreement', async (_req, res) => {
    res.json(await agreementCounts(ctx.db));
  });
  router.get('/screening/counts', async (_req, res) => {
    res.json(await prismaCounts(ctx.db));
  });
  return router;
}
