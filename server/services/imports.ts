import type { Knex } from 'knex';
import { DoiLookupError } from '../adapters/citations.js';
import { pageOf } from '../../shared/schemas/common.js';
import { IMPORT_JOB_THRESHOLD, normaliseDoi, type ImportBatchView, type ImportEntryView, type ImportPage, type ImportResult } from '../../shared/schemas/references.js';
import { NotFoundError, UnprocessableError } from '../lib/errors.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, isoOrNull, type PageRequest } from '../repositories/db.js';
import {
  batchEntries, countStatuses, entryCounts, entryReferenceIds, finishBatchIfDone, findBatch, insertBatch, insertEntries, listBatches, lockJobBatch, markBatchDone,
  pendingSaying, pendingEntries, settleEntry, updateJobBatch, type BatchWithLogin, type EntryCounts,
} from '../repositories/imports.js';
import { findRefByDoi, insertRefs, insertRefUnlessDoiTaken, liveRefsWithTitleKeys, refIdsByDoi } from '../repositories/refs.js';
import type { EntryStatus, ImportEntryRow } from '../repositories/rows.js';
import type { Deps, SearchDeps } from './deps.js';
import { countEntriesRoughly, describeEntry, fieldLengthProblem, parseDoiList, parseEntries, parseRawEntries, splitEntries, type ParsedEntry } from './import-parsing.js';
import { authorKey, cleanCsl, refColumns, type Csl, type RefColumns } from './reference-fields.js';
import { findDuplicate, offerDuplicate } from './references.js';
import { syncReferences } from './search.js';

export const DOI_QUEUE = 'doi.resolve';
/**
 * A job whose look-ups found the resolver away fails, so pg-boss runs it again with exponential backoff (as mail:
 * 11 retries from 2 s span at least 68 min); only entries still pending are asked again, and the last attempt
 * rejects what is still unanswered.
 */
export const DOI_RETRY = { retryLimit: 11, retryDelay: 2, retryBackoff: true } as const;
export const RESOLVER_UNREACHABLE = 'resolver unreachable, will retry';
const DOI_CHUNK = 10;
/** An import answers its counts and the first page of its entry report; the rest is paged (GET ?entryPage=). */
export const IMPORT_REPORT_PAGE = 100;
const firstReportPage = { page: 1, pageSize: IMPORT_REPORT_PAGE };
const DOI_CONCURRENCY = 4;

type EntryRow = ImportEntryRow;

const clip = (s: string, n = 2000) => (s.length > n ? `${s.slice(0, n)}…` : s);
const fingerprint = (c: Pick<RefColumns, 'title_key' | 'year' | 'first_author'>) => `${c.title_key}|${c.year ?? ''}|${authorKey(c.first_author)}`;

/** Entries a job reads and inserts per transaction; it yields to other requests between chunks. */
export const IMPORT_JOB_CHUNK = 250;
export const IMPORT_JOB_QUEUE = 'import.text';

/**
 * What earlier chunks of the same file created: later chunks treat them as earlier entries of this file, not as
 * references found in the registry.
 */
interface FileSoFar {
  ids: Set<number>;
  byDoi: Map<string, number>;
  byPrint: Map<string, Array<{ id: number; doi: string | null }>>;
}
const emptyFileSoFar = (): FileSoFar => ({ ids: new Set(), byDoi: new Map(), byPrint: new Map() });

/**
 * Imports a BibTeX or RIS text. Each entry ends imported, duplicate (of which reference) or rejected (with the
 * entry, field and problem named); the good entries of a file with bad ones still import, and a file imported twice
 * creates nothing the second time. A small text is one batch in one transaction (answered 201 with its report); a
 * large one (IMPORT_JOB_THRESHOLD) is stored with a queued batch and read by a job (answered 202).
 */
export async function importText(
  ctx: SearchDeps & Partial<Pick<Deps, 'jobs'>>,
  input: { format: 'bibtex' | 'ris'; text: string; label?: string; userId: number | null },
): Promise<ImportResult> {
  const rough = countEntriesRoughly(input.format, input.text);
  if (rough >= IMPORT_JOB_THRESHOLD.entries || (rough > 0 && input.text.length >= IMPORT_JOB_THRESHOLD.chars)) return queueTextImport(ctx, input, rough);
  const parsed = parseEntries(input.format, input.text);
  if (!parsed.length) throw noEntries(input.format);
  const batchId = await ctx.db.transaction(async (trx) => {
    const batchId = await insertBatch(trx, { format: input.format, label: input.label ?? null, total: parsed.length, created_by: input.userId });
    const entryRows = await importChunk(trx, { batchId, format: input.format, userId: input.userId }, parsed, emptyFileSoFar());
    await markBatchDone(trx, batchId);
    const counts = countStatuses(entryRows);
    await recordAudit(trx, { actorId: input.userId, action: 'import.create', entityType: 'import_batch', entityId: batchId, details: { format: input.format, total: parsed.length, ...counts } });
    return batchId;
  });
  const created = await entryReferenceIds(ctx.db, batchId, 'imported');
  await syncReferences(ctx, created);
  return getImport(ctx.db, batchId, firstReportPage);
}

function noEntries(format: 'bibtex' | 'ris') {
  const hint = format === 'bibtex' ? 'a BibTeX entry starts like @article{key, …}' : 'a RIS record starts with "TY  -" and ends with "ER  -"';
  return new UnprocessableError(`no entries found: the text holds no ${format === 'bibtex' ? 'BibTeX' : 'RIS'} entry (${hint})`, [{ path: 'body.text', message: 'no entries found' }]);
}

/** Stores a large text with a queued batch and sends the job (without a job queue, it runs here after answering). */
async function queueTextImport(
  ctx: SearchDeps & Partial<Pick<Deps, 'jobs'>>,
  input: { format: 'bibtex' | 'ris'; text: string; label?: string; userId: number | null },
  rough: number,
): Promise<ImportResult> {
  const batchId = await ctx.db.transaction(async (trx) => {
    const id = await insertBatch(trx, { format: input.format, label: input.label ?? null, total: rough, created_by: input.userId, state: 'queued', source_text: input.text, processed: 0 });
    await recordAudit(trx, { actorId: input.userId, action: 'import.create', entityType: 'import_batch', entityId: id, details: { format: input.format, total: rough, job: true } });
    return id;
  });
  try {
    if (ctx.jobs) await ctx.jobs.send(IMPORT_JOB_QUEUE, { batchId }, { retryLimit: 1, retryDelay: 5, expireInSeconds: 4 * 3600 });
    else setImmediate(() => void runImportJob(ctx, batchId).catch((err) => console.error('[imports] import job failed:', (err as Error).message)));
  } catch (err) {
    await updateJobBatch(ctx.db, batchId, { state: 'failed', failure: `the import could not be queued: ${reasonOf(err)}`, source_text: null, finished: true });
    throw err;
  }
  return { ...(await getImport(ctx.db, batchId, firstReportPage)), statusUrl: `/api/imports/${batchId}` };
}

/** A database error's own words, without the statement knex puts before them. */
function reasonOf(err: unknown): string {
  const m = err instanceof Error ? err.message : String(err);
  const own = err && typeof err === 'object' && 'code' in err && m.includes(' - ') ? m.slice(m.lastIndexOf(' - ') + 3) : m;
  return clip(own, 300);
}

const yieldToOthers = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * The `import.text` job: reads the stored text IMPORT_JOB_CHUNK entries at a time, each chunk with its entries,
 * references and the batch's progress in one transaction, yielding between chunks. On failure the batch says
 * failed, why, and how far it got; the chunks before stay imported. A batch found running was cut off (the process
 * ended): it is marked failed rather than read twice.
 */
export async function runImportJob(ctx: SearchDeps, batchId: number): Promise<void> {
  const batch = await ctx.db.transaction(async (trx) => {
    const b = await lockJobBatch(trx, batchId);
    if (!b || b.state === 'done' || b.state === 'failed' || b.format === 'doi') return null;
    if (b.state === 'running') {
      const failure = `the import stopped after ${(b.processed ?? 0).toLocaleString('en')} of ${b.total.toLocaleString('en')} entries when its worker ended; the entries read before stay imported (import the file again: they will be reported as duplicates)`;
      await updateJobBatch(trx, batchId, { state: 'failed', failure, source_text: null, finished: true });
      return null;
    }
    await updateJobBatch(trx, batchId, { state: 'running' });
    return b;
  });
  if (!batch) return;
  const format = batch.format as 'bibtex' | 'ris';
  let processed = 0;
  let total = batch.total;
  try {
    const { strings, entries } = splitEntries(format, batch.source_text ?? '');
    if (!entries.length) throw noEntries(format);
    total = entries.length;
    if (total !== batch.total) await updateJobBatch(ctx.db, batchId, { total });
    const soFar = emptyFileSoFar();
    for (let i = 0; i < entries.length; i += IMPORT_JOB_CHUNK) {
      await yieldToOthers();
      const raw = entries.slice(i, i + IMPORT_JOB_CHUNK);
      const parsed = parseRawEntries(format, strings, raw);
      await yieldToOthers();
      const rows = await ctx.db.transaction(async (trx) => {
        const rows = await importChunk(trx, { batchId, format, userId: batch.created_by }, parsed, soFar);
        await updateJobBatch(trx, batchId, { processed: i + raw.length });
        return rows;
      });
      processed = i + raw.length;
      await syncReferences(ctx, rows.filter((r) => r.status === 'imported' && r.reference_id).map((r) => r.reference_id!));
    }
    await ctx.db.transaction(async (trx) => {
      await updateJobBatch(trx, batchId, { state: 'done', processed, source_text: null, finished: true });
      await recordAudit(trx, { actorId: batch.created_by, action: 'import.finish', entityType: 'import_batch', entityId: batchId, details: { format, total, ...(await entryCounts(trx, batchId)) } });
    });
  } catch (err) {
    const failure = `the import stopped after ${processed.toLocaleString('en')} of ${total.toLocaleString('en')} entries: ${reasonOf(err)}; the entries read before stay imported`;
    await ctx.db.transaction(async (trx) => {
      await updateJobBatch(trx, batchId, { state: 'failed', failure, processed, source_text: null, finished: true });
      await recordAudit(trx, { actorId: batch.created_by, action: 'import.fail', entityType: 'import_batch', entityId: batchId, details: { format, total, processed, failure } });
    });
    throw err;
  }
}

/**
 * Decides and writes one run of parsed entries of a batch: looks up what already exists in bulk (by DOI, merged
 * records pointing to their survivor, and by title key), inserts the new references, their entries and the likely
 * duplicates offered to curators. Entries of earlier chunks of the file (`soFar`, updated here) count as earlier
 * entries of this file.
 */
async function importChunk(
  trx: Knex.Transaction,
  batch: { batchId: number; format: 'bibtex' | 'ris'; userId: number | null },
  parsed: ParsedEntry[],
  soFar: FileSoFar,
): Promise<EntryRow[]> {
  const good = parsed.filter((p) => p.ok);
  const cols = new Map<number, { csl: Csl; cols: RefColumns }>();
  for (const p of good) {
    const csl = cleanCsl(p.csl);
    cols.set(p.index, { csl, cols: refColumns(csl) });
  }

  const dois = [...new Set([...cols.values()].map((c) => c.cols.doi).filter(Boolean))] as string[];
  const byDoi = await refIdsByDoi(trx, dois);
  const keys = [...new Set([...cols.values()].map((c) => c.cols.title_key))];
  const byPrint = new Map<string, Array<{ id: number; doi: string | null }>>();
  for (const r of await liveRefsWithTitleKeys(trx, keys)) {
    if (soFar.ids.has(r.id)) continue;
    const f = fingerprint(r);
    if (!byPrint.has(f)) byPrint.set(f, []);
    byPrint.get(f)!.push({ id: r.id, doi: r.doi });
  }

  // Decide every entry in file order; entries new to the registry get a slot filled after the insert.
  type Ref = number | { slot: number };
  type Decision = { kind: 'rejected'; message: string } | { kind: 'duplicate'; of: Ref; message: string } | { kind: 'new'; slot: number; likely?: Ref };
  const newRows: Array<{ csl: Csl; cols: RefColumns; print: string }> = [];
  const slotByDoi = new Map<string, number>();
  const slotsByPrint = new Map<string, Array<{ ref: Ref; doi: string | null }>>();
  const decisions = new Map<number, Decision>();
  for (const p of parsed) {
    if (!p.ok) {
      decisions.set(p.index, { kind: 'rejected', message: p.message });
      continue;
    }
    const { csl, cols: c } = cols.get(p.index)!;
    const where = describeEntry(p, batch.format);
    const earlierDoi = c.doi ? (soFar.byDoi.get(c.doi) ?? (slotByDoi.has(c.doi) ? { slot: slotByDoi.get(c.doi)! } : undefined)) : undefined;
    if (c.doi && earlierDoi === undefined && byDoi.has(c.doi)) {
      decisions.set(p.index, { kind: 'duplicate', of: byDoi.get(c.doi)!, message: `${where}: duplicate of reference #${byDoi.get(c.doi)} (same DOI ${c.doi})` });
      continue;
    }
    if (c.doi && earlierDoi !== undefined) {
      decisions.set(p.index, { kind: 'duplicate', of: earlierDoi, message: `${where}: same DOI ${c.doi} as an earlier entry of this file` });
      continue;
    }
    const f = fingerprint(c);
    const existing = byPrint.get(f) ?? [];
    const earlier = [...(soFar.byPrint.get(f) ?? []).map((r) => ({ ref: r.id as Ref, doi: r.doi })), ...(slotsByPrint.get(f) ?? [])];
    if (!c.doi) {
      const twin = existing.find((r) => !r.doi);
      if (twin) {
        decisions.set(p.index, { kind: 'duplicate', of: twin.id, message: `${where}: duplicate of reference #${twin.id} (same title, year and first author; neither has a DOI)` });
        continue;
      }
      const twinEarlier = earlier.find((r) => !r.doi);
      if (twinEarlier) {
        decisions.set(p.index, { kind: 'duplicate', of: twinEarlier.ref, message: `${where}: same title, year and first author as an earlier entry of this file` });
        continue;
      }
    }
    const slot = newRows.length;
    newRows.push({ csl, cols: c, print: f });
    if (c.doi) slotByDoi.set(c.doi, slot);
    if (!slotsByPrint.has(f)) slotsByPrint.set(f, []);
    slotsByPrint.get(f)!.push({ ref: { slot }, doi: c.doi });
    const likely = existing[0]?.id ?? earlier[0]?.ref;
    decisions.set(p.index, { kind: 'new', slot, likely });
  }

  const slotIds = await insertRefs(trx, newRows.map((r) => ({ csl: r.csl, cols: r.cols, source: batch.format, createdBy: batch.userId })));
  newRows.forEach((r, slot) => {
    const id = slotIds[slot];
    soFar.ids.add(id);
    if (r.cols.doi) soFar.byDoi.set(r.cols.doi, id);
    if (!soFar.byPrint.has(r.print)) soFar.byPrint.set(r.print, []);
    soFar.byPrint.get(r.print)!.push({ id, doi: r.cols.doi });
  });
  const resolve = (v: Ref) => (typeof v === 'number' ? v : slotIds[v.slot]);

  const entryRows: EntryRow[] = parsed.map((p) => {
    const d = decisions.get(p.index)!;
    const base = { batch_id: batch.batchId, idx: p.index, entry_key: p.key ?? null, input: null as string | null, likely_duplicate_of: null as number | null };
    if (d.kind === 'rejected') return { ...base, status: 'rejected', message: d.message, input: clip(p.text), reference_id: null };
    if (d.kind === 'duplicate') return { ...base, status: 'duplicate', message: d.message, reference_id: resolve(d.of) };
    const id = slotIds[d.slot];
    const likely = d.likely === undefined ? null : resolve(d.likely);
    return {
      ...base,
      status: 'imported',
      reference_id: id,
      likely_duplicate_of: likely,
      message: likely ? `imported; looks like reference #${likely} (same title, year and first author) and is offered to curators as a likely duplicate` : null,
    };
  });
  await insertEntries(trx, entryRows);
  for (const e of entryRows) if (e.likely_duplicate_of && e.reference_id) await offerDuplicate(trx, e.likely_duplicate_of, e.reference_id, 'same title, year and first author');
  return entryRows;
}

/** A DOI list: a batch whose entries are resolved by background jobs; answers at once with the batch. */
export async function importDois(ctx: Pick<Deps, 'db' | 'search' | 'jobs' | 'doi'>, input: { text: string; label?: string; userId: number | null }): Promise<ImportResult> {
  const list = parseDoiList(input.text);
  if (!list.length) throw new UnprocessableError('no entries found: the list holds no DOI (one per line, like 10.5555/abc)', [{ path: 'body.text', message: 'no entries found' }]);
  const seen = new Map<string, number>();
  const batchId = await ctx.db.transaction(async (trx) => {
    const batch = { id: await insertBatch(trx, { format: 'doi', label: input.label ?? null, total: list.length, created_by: input.userId }) };
    // a DOI the registry already holds is a duplicate of that reference at once, whatever the resolver would say
    const known = await refIdsByDoi(trx, [...new Set(list.map((e) => e.doi).filter((d): d is string => !!d))]);
    const rows: EntryRow[] = list.map((e) => {
      const base = { batch_id: batch.id, idx: e.index, entry_key: e.text.slice(0, 200), input: null, reference_id: null, likely_duplicate_of: null };
      if (!e.doi) return { ...base, status: 'rejected' as const, message: `${describeEntry(e, 'doi')}: "${clip(e.text, 80)}" is not a DOI (a DOI looks like 10.5555/abc)`, input: clip(e.text) };
      if (seen.has(e.doi)) return { ...base, status: 'duplicate' as const, message: `${describeEntry(e, 'doi')}: ${e.doi} is listed twice (first as entry ${seen.get(e.doi)})` };
      seen.set(e.doi, e.index);
      const existing = known.get(e.doi);
      if (existing) return { ...base, status: 'duplicate' as const, reference_id: existing, message: `${describeEntry(e, 'doi')}: ${e.doi} is already reference #${existing}` };
      return { ...base, status: 'pending' as const, message: null };
    });
    await insertEntries(trx, rows);
    await recordAudit(trx, { actorId: input.userId, action: 'import.create', entityType: 'import_batch', entityId: batch.id, details: { format: 'doi', total: list.length } });
    return batch.id as number;
  });
  const pending = (await pendingEntries(ctx.db, batchId)).map((e) => e.idx);
  if (!pending.length) await finishIfDone(ctx.db, batchId);
  else if (ctx.jobs) {
    for (let i = 0; i < pending.length; i += DOI_CHUNK) {
      await ctx.jobs.send(DOI_QUEUE, { batchId, entries: pending.slice(i, i + DOI_CHUNK) }, DOI_RETRY);
    }
  } else {
    // No workers in this process (JOBS_ENABLED=false): resolve here, after answering, on the same schedule.
    const attempt = (retryCount: number) => {
      resolveDoiEntries(ctx, { batchId, entries: pending }, { final: retryCount >= DOI_RETRY.retryLimit }).then(
        (waiting) => {
          if (waiting) setTimeout(() => attempt(retryCount + 1), DOI_RETRY.retryDelay * 1000 * 2 ** retryCount).unref();
        },
        (err) => console.error('[imports] DOI batch failed:', (err as Error).message),
      );
    };
    setImmediate(() => attempt(0));
  }
  return getImport(ctx.db, batchId, firstReportPage);
}

/** The `doi.resolve` job handler: a look-up that found the resolver away fails the job, so pg-boss retries it. */
export async function resolveDoiJob(ctx: Pick<Deps, 'db' | 'search' | 'doi'>, job: { batchId: number; entries: number[] }, retryCount: number): Promise<void> {
  const waiting = await resolveDoiEntries(ctx, job, { final: retryCount >= DOI_RETRY.retryLimit });
  if (waiting) throw new Error(`${waiting} DOI look-ups of batch ${job.batchId}: ${RESOLVER_UNREACHABLE}`);
}

/**
 * Resolves pending entries of a batch; safe to run twice (only pending entries are touched). An entry whose
 * look-up found the resolver unreachable stays pending and says it will be retried (rejected on the final
 * attempt); returns how many wait so.
 */
export async function resolveDoiEntries(
  ctx: Pick<Deps, 'db' | 'search' | 'doi'>,
  job: { batchId: number; entries: number[] },
  attempt: { final: boolean } = { final: true },
): Promise<number> {
  const batch = await findBatch(ctx.db, job.batchId);
  if (!batch) return 0;
  const rows = await pendingEntries(ctx.db, job.batchId, job.entries);
  const created: number[] = [];
  let waiting = 0;
  let next = 0;
  const worker = async () => {
    while (next < rows.length) {
      const row = rows[next++];
      const doi = normaliseDoi(row.entry_key) ?? row.entry_key!.trim();
      const where = `Line ${row.idx}`;
      let update: Partial<EntryRow>;
      try {
        const csl = cleanCsl(await ctx.doi(doi));
        csl.DOI = csl.DOI ?? doi;
        update = await ctx.db.transaction(async (trx) => {
          const cols = refColumns(csl);
          if (!cols.title) return { status: 'rejected' as const, message: `${where}: ${doi}: the resolver's record has no title` };
          const long = fieldLengthProblem(csl);
          if (long) return { status: 'rejected' as const, message: `${where}: ${doi}: the resolver's record is refused: ${long}` };
          if (!cols.doi) cols.doi = doi.toLowerCase();
          const dup = await findDuplicate(trx, cols);
          if (dup.exact) return { status: 'duplicate' as const, reference_id: dup.exact, message: `${where}: ${doi} is already reference #${dup.exact}` };
          const id = await insertRefUnlessDoiTaken(trx, { csl, cols, source: 'doi', createdBy: batch.created_by });
          if (id === null) {
            const other = await findRefByDoi(trx, cols.doi);
            return { status: 'duplicate' as const, reference_id: other?.merged_into ?? other?.id ?? null, message: `${where}: ${doi} was imported at the same moment by another entry` };
          }
          created.push(id);
          if (dup.likely) await offerDuplicate(trx, dup.likely, id, 'same title, year and first author');
          return {
            status: 'imported' as const,
            reference_id: id,
            likely_duplicate_of: dup.likely ?? null,
            message: dup.likely ? `imported; looks like reference #${dup.likely} (same title, year and first author) and is offered to curators as a likely duplicate` : null,
          };
        });
      } catch (err) {
        const away = err instanceof DoiLookupError && err.transient;
        if (away && !attempt.final) {
          waiting++;
          update = { status: 'pending', message: `${where}: ${doi}: ${RESOLVER_UNREACHABLE} (${(err as Error).message})` };
        } else {
          update = { status: 'rejected', message: `${where}: ${doi}: ${(err as Error).message}${away ? ' (the last of the retries)' : ''}` };
        }
      }
      await settleEntry(ctx.db, row.batch_id, row.idx, update);
    }
  };
  await Promise.all(Array.from({ length: Math.min(DOI_CONCURRENCY, rows.length) }, worker));
  await syncReferences(ctx, created);
  await finishIfDone(ctx.db, job.batchId);
  return waiting;
}

async function finishIfDone(db: Knex, batchId: number) {
  await db.transaction(async (trx) => {
    const finished = await finishBatchIfDone(trx, batchId);
    if (finished) await recordAudit(trx, { actorId: finished.created_by ?? null, action: 'import.finish', entityType: 'import_batch', entityId: batchId, details: await entryCounts(trx, batchId) });
  });
}

function batchView(row: BatchWithLogin, counts: EntryCounts): ImportBatchView {
  return {
    id: row.id,
    format: row.format,
    label: row.label,
    state: row.state,
    total: row.total,
    processed: row.processed ?? row.total - counts.pending,
    failure: row.failure,
    counts,
    createdAt: iso(row.created_at),
    finishedAt: isoOrNull(row.finished_at),
    createdBy: row.created_by ? { id: row.created_by, login: row.login ?? '' } : null,
  };
}

/**
 * A batch and its entries. Without paging the answer holds every entry (the API contract); the screen asks
 * for one page of entries at a time, optionally of one status.
 */
export async function getImport(db: Knex, id: number, paging?: PageRequest & { status?: EntryStatus }): Promise<ImportResult> {
  const row = await findBatch(db, id);
  if (!row) throw new NotFoundError(`There is no import batch ${id}.`);
  const counts = await entryCounts(db, id);
  const { total, rows } = await batchEntries(db, id, paging);
  const view = rows.map((e): ImportEntryView => ({
    index: e.idx,
    status: e.status,
    ...(e.message ? { message: e.message } : {}),
    ...(e.reference_id ? { referenceId: e.reference_id } : {}),
    ...(e.entry_key ? { key: e.entry_key } : {}),
    ...(e.likely_duplicate_of ? { likelyDuplicateOf: e.likely_duplicate_of } : {}),
  }));
  const resolverUnreachable = counts.pending ? await pendingSaying(db, id, RESOLVER_UNREACHABLE) : 0;
  return { batch: batchView(row, counts), entries: view, entriesTotal: total, resolverUnreachable };
}

export async function listImports(db: Knex, q: PageRequest & { sort: 'created_at' | 'format' | 'total'; order: 'asc' | 'desc' }): Promise<ImportPage> {
  const { total, rows } = await listBatches(db, q);
  return pageOf(rows.map((r) => batchView(r.row, r.counts)), total, q);
}
