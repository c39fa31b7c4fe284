import { randomBytes } from 'node:crypto';
import { readFileSync } from 'node:fs';
import type { Knex } from 'knex';
import { ConflictError, NotFoundError } from '../lib/errors.js';
import { cslEntries, toBibtex } from '../adapters/citations.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, type Db } from '../repositories/db.js';
import { querySettledEffects, settledReferenceCount, type SettledEffectRow } from '../repositories/effects.js';
import { codedReferenceCount } from '../repositories/extractions.js';
import { refsForCitation } from '../repositories/refs.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';
import { findSnapshot, insertSnapshot, listSnapshots as snapshotRows, lockSnapshotRequest, snapshotsOfRequest } from '../repositories/snapshots.js';
import { requestFilters, synthesize } from './synthesis.js';
import { prismaCounts } from './screening.js';
import { flowIn, flowSvg } from './flow.js';
import { EXCLUSION_COUNT_LABELS, NO_REASON } from '../../shared/vocabulary/screening.js';
import type { StageCounts } from '../../shared/schemas/references.js';
import { pageOf } from '../../shared/schemas/common.js';
import { effectsCsv, studiesCsv } from '../../shared/export/synthesis-csv.js';
import { METHOD_LABELS, type CreatedSnapshot, type SnapshotCitation, type SnapshotPage, type SnapshotView, type SynthesisRequest } from '../../shared/schemas/synthesis.js';
import { methodsParagraph, pooledQuantityOf, type PrismaCounts } from '../../shared/synthesis/methods.js';
import { metricLabel } from '../../shared/synthesis/run.js';
import { labelOf } from '../../shared/vocabulary/labels.js';
import type { SynthesisOutput } from '../../shared/synthesis/types.js';
import type { SynthesisFlow } from '../../shared/synthesis/flow.js';

const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };
export const SOFTWARE = { name: 'Chronometa', version: pkg.version };

/** PRISMA 2020 counts for the methods paragraph, from the screening records; null when they cannot be read. */
export async function prismaForMethods(db: Db): Promise<PrismaCounts | null> {
  try {
    // In turn: db may be the snapshot's transaction (one connection).
    const c = await prismaCounts(db);
    const coded = await codedReferenceCount(db);
    const settled = await settledReferenceCount(db);
    const inWords = (byReason: Record<string, number>, noReason: string) =>
      Object.entries(byReason)
        .filter(([, n]) => n > 0)
        .sort((a, b) => b[1] - a[1])
        .map(([reason, count]) => ({ reason: reason === NO_REASON ? noReason : (EXCLUSION_COUNT_LABELS[reason] ?? reason), count }));
    const stage = (s: StageCounts) => ({ decided: s.decided, excluded: s.excluded, excludedReasons: inWords(s.excludedByReason, 'no reason given'), waiting: s.waiting });
    return {
      identified: c.identified.total,
      duplicatesRemoved: c.duplicatesRemoved.total,
      screened: c.screened,
      excluded: c.excluded.total,
      excludedReasons: inWords(c.excluded.byReason, EXCLUSION_COUNT_LABELS[NO_REASON]),
      included: c.included,
      notYetScreened: c.awaitingScreening,
      coded,
      settled,
      stages: { titleAbstract: stage(c.stages.title_abstract), fullText: stage(c.stages.full_text) },
    };
  } catch {
    return null;
  }
}

export function defaultTitle(request: SynthesisRequest, metric: string): string {
  const f = request.filters;
  const term = (t: string) => labelOf('manipulation', t);
  const parts = [
    f.manipulation === undefined ? undefined : (Array.isArray(f.manipulation) ? f.manipulation : [f.manipulation]).map(term).join(' + '),
    f.outcome && labelOf('outcome', f.outcome),
    f.population && labelOf('population', f.population),
    f.modality && labelOf('modality', f.modality),
    f.task && labelOf('task', f.task),
  ].filter(Boolean);
  return `${parts.length ? parts.join(', ') : 'All settled effects'} — ${metricLabel(metric)}, ${METHOD_LABELS[request.method]}${request.hksj ? ' + HKSJ' : ''}`;
}

const newId = () => randomBytes(8).toString('hex');
const links = (id: string, appOrigin: string) => ({ id, url: `${appOrigin}/snapshots/${id}`, apiUrl: `${appOrigin}/api/snapshots/${id}` });

class SameRequestBeingSaved extends Error {}

/** The snapshot already saved of this request and title (or the default title) on this registry version. */
async function sameSnapshot(db: Db, request: SynthesisRequest, title: string | undefined, registryVersion: number, appOrigin: string): Promise<CreatedSnapshot | null> {
  const same = (await snapshotsOfRequest(db, request, registryVersion)).find((r) => r.title === (title ?? defaultTitle(request, r.metric)));
  return same ? { ...links(same.id, appOrigin), registryVersion, existing: true } : null;
}

/**
 * Saves a snapshot, or answers the one already saved of the same request and title on this registry version.
 * While the same request is being saved elsewhere this one waits for that save, then looks again outside a
 * repeatable-read view (one taken before that save committed would not see its row).
 */
export async function createSnapshot(db: Knex, actorId: number, request: SynthesisRequest, title: string | undefined, appOrigin: string): Promise<CreatedSnapshot> {
  for (let attempt = 0; ; attempt += 1) {
    try {
      return await saveSnapshot(db, actorId, request, title, appOrigin);
    } catch (err) {
      if (!(err instanceof SameRequestBeingSaved)) throw err;
      if (attempt >= 9) throw new ConflictError('The same snapshot is being saved by another request; try again.');
      const found = await db.transaction(async (trx) => {
        await lockSnapshotRequest(trx, request, true);
        return sameSnapshot(trx, request, title, await currentRegistryVersion(trx), appOrigin);
      });
      if (found) return found;
    }
  }
}

async function saveSnapshot(db: Knex, actorId: number, request: SynthesisRequest, title: string | undefined, appOrigin: string): Promise<CreatedSnapshot> {
  // One consistent view of the registry: the version, the rows and the counts belong together.
  return db.transaction(
    async (trx) => {
      if (!(await lockSnapshotRequest(trx, request, false))) throw new SameRequestBeingSaved();
      const registryVersion = await currentRegistryVersion(trx);
      const same = await sameSnapshot(trx, request, title, registryVersion, appOrigin);
      if (same) return same;
      const effects = await querySettledEffects(trx, requestFilters(request));
      const output = synthesize(effects, request);
      const refIds = [...new Set(output.rows.map((r) => r.referenceId))];
      const refs = await refsForCitation(trx, refIds);
      const prisma = await prismaForMethods(trx);
      const flow = await flowIn(trx, request);
      const methods = methodsParagraph({
        request, metricLabel: metricLabel(output.metric), counts: output.counts, software: SOFTWARE, registryVersion, prisma, notRun: output.unavailable.map((u) => u.analysis),
        quantity: pooledQuantityOf(effects),
      });
      const id = newId();
      await insertSnapshot(trx, {
        id,
        title: title ?? defaultTitle(request, output.metric),
        created_by: actorId,
        registry_version: registryVersion,
        request,
        metric: output.metric,
        k: output.counts.studies,
        estimate: output.result.estimate,
        effects,
        output,
        methods,
        references: refs.map((r) => ({ id: r.id, title: r.title, year: r.year, doi: r.doi, firstAuthor: r.first_author, csl: r.csl })),
        prisma,
        flow,
        software: `${SOFTWARE.name} ${SOFTWARE.version}`,
      });
      await recordAudit(trx, {
        actorId,
        action: 'snapshot.created',
        entityType: 'snapshot',
        entityId: id,
        details: { registryVersion, k: output.counts.studies, metric: output.metric, method: request.method },
      });
      return { ...links(id, appOrigin), registryVersion, existing: false };
    },
    { isolationLevel: 'repeatable read' },
  );
}

export interface StoredSnapshot {
  id: string;
  title: string;
  createdAt: string;
  createdBy: { login: string; name: string | null } | null;
  registryVersion: number;
  software: string;
  methods: string;
  prisma: PrismaCounts | null;
  flow: SynthesisFlow | null;
  request: SynthesisRequest;
  effects: SettledEffectRow[];
  output: SynthesisOutput;
  references: Array<{ id: number; title: string; year: number | null; doi: string | null; firstAuthor: string | null; csl: Record<string, unknown> }>;
}

export async function loadSnapshot(db: Knex, id: string): Promise<StoredSnapshot> {
  const r = await findSnapshot(db, id);
  if (!r) throw new NotFoundError(`No snapshot ${id}.`);
  return {
    id: r.id,
    title: r.title,
    createdAt: iso(r.created_at),
    createdBy: r.login ? { login: r.login, name: r.name } : null,
    registryVersion: Number(r.registry_version),
    software: r.software,
    methods: r.methods,
    prisma: r.prisma as PrismaCounts | null,
    flow: (r.flow as SynthesisFlow | null) ?? null,
    request: r.request as SynthesisRequest,
    effects: r.effects as SettledEffectRow[],
    output: r.output as SynthesisOutput,
    references: r.references as StoredSnapshot['references'],
  };
}

/** How to cite the snapshot itself (a data set of this registry), from what was stored when it was saved. */
export function snapshotCitation(s: StoredSnapshot, appOrigin: string): SnapshotCitation {
  const url = `${appOrigin}/snapshots/${s.id}`;
  const date = s.createdAt.slice(0, 10);
  const [y, m, d] = date.split('-').map(Number);
  const identifier = `chronometa:snapshot:${s.id}`;
  const key = `chronometa_${s.id}`;
  const cslJson = {
    id: key,
    'citation-key': key,
    type: 'dataset',
    title: s.title,
    author: [{ literal: `${SOFTWARE.name} registry` }],
    publisher: SOFTWARE.name,
    version: `registry version ${s.registryVersion}`,
    issued: { 'date-parts': [[y, m, d]] },
    URL: url,
    note: `Snapshot ${identifier}, registry version ${s.registryVersion}; ${s.software}`,
  };
  const text = `${SOFTWARE.name} registry (${y}). ${s.title} [Data set, registry version ${s.registryVersion}, saved ${date}]. ${SOFTWARE.name}. ${url}`;
  return { id: s.id, identifier, url, registryVersion: s.registryVersion, date, text, cslJson, ...cslEntries(cslJson) };
}

/** What GET /api/snapshots/:id answers: the frozen synthesis plus its provenance. */
export function snapshotView(s: StoredSnapshot, appOrigin: string): SnapshotView {
  const { references, ...rest } = s;
  return {
    ...rest.output,
    id: s.id,
    title: s.title,
    url: `${appOrigin}/snapshots/${s.id}`,
    createdAt: s.createdAt,
    createdBy: s.createdBy,
    registryVersion: s.registryVersion,
    software: s.software,
    methods: s.methods,
    prisma: s.prisma,
    flow: s.flow,
    citation: snapshotCitation(s, appOrigin),
    effects: s.effects,
    references: references.map(({ csl: _csl, ...r }) => r),
  };
}

/** One row per pooled unit (see studiesCsv). */
export const snapshotCsv = (s: StoredSnapshot) => studiesCsv(s.output, s.effects);

/** Every settled effect as it was coded. */
export const snapshotEffectsCsv = (s: StoredSnapshot) => effectsCsv(s.effects);

/** The PRISMA 2020 flow diagram of the snapshot's synthesis; snapshots saved before the flow was kept have none. */
export function snapshotFlowSvg(s: StoredSnapshot): string {
  if (!s.flow) throw new NotFoundError(`Snapshot ${s.id} was saved before the flow of records was kept, so it has no flow diagram; its methods paragraph gives the registry's counts.`);
  return flowSvg(s.flow, s.title);
}

export function snapshotBibtex(s: StoredSnapshot): string {
  const records = s.references.map((r) => ({ ...r.csl, id: (r.csl.id as string | undefined) ?? `ref${r.id}` }));
  return records.length ? toBibtex(records) : '';
}

export async function listSnapshots(db: Knex, q: { page: number; pageSize: number; sort: 'created_at' | 'k' | 'estimate' | 'title'; order: 'asc' | 'desc'; createdBy?: number }): Promise<SnapshotPage> {
  const { total, rows } = await snapshotRows(db, q);
  return pageOf(
    rows.map((r) => ({
      id: r.id,
      title: r.title,
      createdAt: iso(r.created_at),
      createdBy: r.login ?? null,
      metric: r.metric,
      k: r.k,
      estimate: r.estimate,
      registryVersion: Number(r.registry_version),
    })),
    total,
    q,
  );
}
