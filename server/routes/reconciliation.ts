import { Router } from 'express';
import { z } from 'zod';
import { idParam, idParamsSchema } from '../../shared/schemas/common.js';
import { reasonSchema, resolveDiscrepancySchema, settleSchema } from '../../shared/schemas/extraction.js';
import { reconcilePairSchema, reconciliationQuerySchema, recordListQuerySchema } from '../../shared/schemas/reconciliation.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { getPair, listQueue, reconcilePair, resolveDiscrepancy, settlePair } from '../services/reconciliation.js';
import { getRecord, listRecords, reopenRecord, settleRecordDraft, withdrawRecord } from '../services/records.js';

const discParams = idParamsSchema.extend({ discrepancyId: idParam });

/** The reconciliation queue and settled records (reading a settled record is open to anyone). */
export function reconciliationRouter(ctx: AppContext) {
  const router = Router();
  router.use('/reconciliation', requireRole('curator'));

  router.get('/reconciliation', async (req, res) => {
    res.json(await listQueue(ctx.db, req.user!.id, parseInput(reconciliationQuerySchema, req.query, 'query')));
  });

  router.get('/reconciliation/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await getPair(ctx.db, req.user!.id, id));
  });

  router.put('/reconciliation/:id/discrepancies/:discrepancyId', async (req, res) => {
    const p = parseInput(discParams, req.params, 'path');
    const body = parseInput(resolveDiscrepancySchema, req.body);
    res.json(await resolveDiscrepancy(ctx.db, req.user!.id, p.id, p.discrepancyId, body));
  });

  router.post('/reconciliation/:id/settle', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(settleSchema, req.body ?? {});
    res.json(await settlePair(ctx, req.user!.id, id, body));
  });

  router.post('/reconciliation/:id/reconcile', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(reconcilePairSchema, req.body);
    res.json(await reconcilePair(ctx, req.user!.id, id, body));
  });

  router.get('/records', async (req, res) => {
    const { referenceId } = parseInput(recordListQuerySchema, req.query, 'query');
    res.json(await listRecords(ctx.db, referenceId));
  });

  router.get('/records/:id', async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    res.json(await getRecord(ctx.db, req.user ?? null, id));
  });

  router.post('/records/:id/reopen', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(reasonSchema, req.body);
    res.status(201).json(await reopenRecord(ctx.db, req.user!.id, id, body.reason));
  });

  router.post('/records/:id/settle', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(settleSchema.extend({ version: z.coerce.number().int().min(1).optional() }), req.body ?? {});
    res.json(await settleRecordDraft(ctx, req.user!.id, id, body));
  });

  router.post('/records/:id/withdraw', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParamsSchema, req.params, 'path');
    const body = parseInput(reasonSchema, req.body);
    res.json(await withdrawRecord(ctx.db, req.user!.id, id, body.reason));
  });

  return router;
}
