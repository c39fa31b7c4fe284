import { Router, type Request } from 'express';
import type { AppContext } from '../context.js';
import { parseInput } from '../lib/validate.js';
import { requireRole } from '../auth/require-role.js';
import { UnauthorizedError } from '../lib/errors.js';
import { chargeCaller, costs } from '../lib/caller-budget.js';
import { snapshotCreateSchema, snapshotIdSchema, snapshotListQuerySchema } from '../../shared/schemas/synthesis.js';
import { snapshotTrialsCsv } from '../services/trials.js';
import { snapshotDiff, snapshotFeed } from '../services/snapshot-changes.js';
import { synthesisSize } from '../services/synthesis.js';
import { createSnapshot, listSnapshots, loadSnapshot, snapshotBibtex, snapshotCitation, snapshotCsv, snapshotEffectsCsv, snapshotFlowSvg, snapshotView } from '../services/snapshots.js';

/** Frozen syntheses: reviewers save them; anyone (signed out too) reads and exports them. */
export function snapshotsRouter(ctx: AppContext) {
  const router = Router();
  const origin = ctx.appOrigin;
  const load = (params: unknown) => loadSnapshot(ctx.db, parseInput(snapshotIdSchema, params, 'path').id);
  /** a snapshot's exports are paid by their rows */
  const loadForExport = async (req: Request) => {
    const s = await load(req.params);
    chargeCaller(req, costs.export(s.effects.length), `An export of ${s.effects.length} effects`);
    return s;
  };
  const attachment = (name: string) => `attachment; filename="${name}"`;

  router.get('/snapshots', async (req, res) => {
    const q = parseInput(snapshotListQuerySchema, req.query, 'query');
    if (q.mine === 'true' && !req.user) throw new UnauthorizedError('Sign in to list your own snapshots.');
    res.json(await listSnapshots(ctx.db, { ...q, createdBy: q.mine === 'true' ? req.user!.id : undefined }));
  });

  router.post('/snapshots', requireRole('reviewer'), async (req, res) => {
    const { title, ...request } = parseInput(snapshotCreateSchema, req.body);
    const k = await synthesisSize(ctx.db, request);
    chargeCaller(req, costs.synthesis(k), `Saving a synthesis of ${k} effects`);
    const created = await createSnapshot(ctx.db, req.user!.id, request, title, origin);
    res.status(created.existing ? 200 : 201).json(created);
  });

  router.get('/snapshots/:id', async (req, res) => {
    res.json(snapshotView(await load(req.params), origin));
  });

  // How today's registry differs from the snapshot (the snapshot itself never changes).
  router.get('/snapshots/:id/diff', async (req, res) => {
    res.json(await snapshotDiff(ctx.db, parseInput(snapshotIdSchema, req.params, 'path').id));
  });

  router.get('/snapshots/:id/feed.atom', async (req, res) => {
    const xml = await snapshotFeed(ctx.db, parseInput(snapshotIdSchema, req.params, 'path').id, origin);
    res.type('application/atom+xml; charset=utf-8').send(xml);
  });

  router.get('/snapshots/:id/citation', async (req, res) => {
    res.json(snapshotCitation(await load(req.params), origin));
  });

  router.get('/snapshots/:id/export.csv', async (req, res) => {
    const s = await loadForExport(req);
    res.type('text/csv; charset=utf-8').set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}.csv`)).send(snapshotCsv(s));
  });

  router.get('/snapshots/:id/effects.csv', async (req, res) => {
    const s = await loadForExport(req);
    res.type('text/csv; charset=utf-8').set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}-effects.csv`)).send(snapshotEffectsCsv(s));
  });

  router.get('/snapshots/:id/export.json', async (req, res) => {
    const s = await loadForExport(req);
    res.set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}.json`)).json(snapshotView(s, origin));
  });

  router.get('/snapshots/:id/trials.csv', async (req, res) => {
    const s = await loadForExport(req);
    const csv = await snapshotTrialsCsv(ctx.db, s.effects.map((e) => e.id));
    res.type('text/csv; charset=utf-8').set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}-trials.csv`)).send(csv);
  });

  router.get('/snapshots/:id/references.bib', async (req, res) => {
    const s = await loadForExport(req);
    res.type('application/x-bibtex; charset=utf-8').set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}.bib`)).send(snapshotBibtex(s));
  });

  router.get('/snapshots/:id/flow.svg', async (req, res) => {
    const s = await load(req.params);
    const svg = snapshotFlowSvg(s);
    res.type('image/svg+xml; charset=utf-8').set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}-flow.svg`)).send(svg);
  });

  router.get('/snapshots/:id/methods.txt', async (req, res) => {
    const s = await load(req.params);
    res.type('text/plain; charset=utf-8').set('Content-Disposition', attachment(`chronometa-snapshot-${s.id}-methods.txt`)).send(`${s.methods}\n`);
  });

  return router;
}
