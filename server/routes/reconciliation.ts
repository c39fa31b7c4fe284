import { Router } from 'express';
import { z } from 'zod';
import { idParam } from '../../shared/schemas/common.js';
import { reasonSchema, resolveDiscrepancySchema, settleSchema } from '../../shared/schemas/extraction.js';
import { requireRole } from '../auth/require-role.js';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { getPair, listQueue, resolveDiscrepancy, settlePair } from '../services/reconciliation.js';
import { getRecord, listRecords, reopenRecord, settleRecordDraft, withdrawRecord } from '../services/records.js';

const idParams = z.object({ id: idParam });
const discParams = z.object({ id: idParam, discrepancyId: idParam });
const queueQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['updated', 'reference', 'open']).default('updated'),
  order: z.enum(['asc', 'desc']).default('asc'),
});

/** The reconciliation queue and settled records (reading a settled record is open to anyone). */
export function reconciliationRouter(ctx: AppContext) {
  const router = Router();
  router.use('/reconciliation', requireRole('curator'));

  router.get('/reconciliation', async (req, res) => {
    const q = parseInput(queueQuery, req.query, 'query');
    res.json({ ...(await listQueue(ctx.db, q)), page: q.page, pageSize: q.pageSize });
  });

  router.get('/reconciliation/:id', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    res.json(await getPair(ctx.db, id));
  });

  router.put('/reconciliation/:id/discrepancies/:discrepancyId', async (req, res) => {
    const p = parseInput(discParams, req.params, 'path');
    const body = parseInput(resolveDiscrepancySchema, req.body);
    res.json({ discrepancy: await resolveDiscrepancy(ctx.db, req.user!.id, p.id, p.discrepancyId, body) });
  });

  router.post('/reconciliation/:id/settle', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(settleSchema, req.body ?? {});
    res.json(await settlePair(ctx, req.user!.id, id, body));
  });

  router.get('/records', async (req, res) => {
    const { referenceId } = parseInput(z.object({ referenceId: idParam }), req.query, 'query');
    res.json(await listRecords(ctx.db, referenceId));
  });

  router.get('/records/:id', async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    res.json(await getRecord(ctx.db, req.user ?? null, id));
  });

  router.post('/records/:id/reopen', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(reasonSchema, req.body);
    res.status(201).json(await reopenRecord(ctx.db, req.user!.id, id, body.reason));
  });

  router.post('/records/:id/settle', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(settleSchema.extend({ version: z.coerce.number().int().min(1).optional() }), req.body ?? {});
    res.json(await settleRecordDraft(ctx, req.user!.id, id, body));
  });

  router.post('/records/:id/withdraw', requireRole('curator'), async (req, res) => {
    const { id } = parseInput(idParams, req.params, 'path');
    const body = parseInput(reasonSchema, req.body);
    res.json(await withdrawRecord(ctx.db, req.user!.id, id, body.reason));
  });

  return router;
}
