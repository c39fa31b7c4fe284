// Trial data on a coding sheet: upload (rows in PostgreSQL), fits per participant × condition as a job on the
// worker-thread pool, the effect two conditions give, and the downloads (the sheet's coder and curators; then
// the snapshots that use them).
import type { Knex } from 'knex';
import { toCsv, type CsvCell } from '../../shared/export/csv.js';
import { hasRole } from '../../shared/roles.js';
import type { Sheet } from '../../shared/schemas/extraction.js';
import type { ContrastAnswer, Derivation, TrialSet, TrialSetDetail, TrialSetList, TrialUpload } from '../../shared/schemas/trials.js';
import { StatsInputError } from '../../shared/stats/errors.js';
import { deriveContrast, type ContrastRequest } from '../../shared/trials/contrast.js';
import { countsByCell, parseTrialsCsv, TRIAL_ERRORS_LISTED, type TrialRow } from '../../shared/trials/csv.js';
import type { CellFit } from '../../shared/trials/fits.js';
import type { JobQueue } from '../adapters/jobs.js';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors.js';
import { createFitPool, type FitPool } from '../psychophysics/fit-pool.js';
import { fitCells } from '../psychophysics/fit-trials.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, isoOrNull } from '../repositories/db.js';
import { findExtraction } from '../repositories/extractions.js';
import type { ExtractionRow, TrialSetRow } from '../repositories/rows.js';
import {
  cellCount, fitsOf, findTrialSet, insertTrialRows, insertTrialSet, lockTrialSet, replaceFits, trialRowsOf, trialSetIdsOfEffects, trialSetsByIds, trialSetsOf, updateTrialSet,
  type TrialSetWithUploader,
} from '../repositories/trials.js';
import type { Actor } from './coding.js';
import type { Deps } from './deps.js';

export const TRIALS_FIT_QUEUE = 'trials.fit';
/** The most participant × condition cells one set may have (each is one bootstrapped fit). */
export const MAX_CELLS = 2000;

// Trial data are visible to the coder of the sheet and to curators; anyone else gets the very answer of a missing id.

function canSee(actor: Actor, x: ExtractionRow) {
  return x.coder_id === actor.id || hasRole(actor.roles, 'curator');
}

async function sheetFor(db: Knex | Knex.Transaction, extractionId: number): Promise<ExtractionRow> {
  const x = await findExtraction(db, extractionId);
  if (!x) throw new NotFoundError(`No extraction ${extractionId}.`);
  return x;
}

async function visibleSet(db: Knex, actor: Actor, setId: number) {
  const set = await findTrialSet(db, setId);
  if (!set) throw new NotFoundError(`No trial data set ${setId}.`);
  const x = await sheetFor(db, set.extraction_id);
  if (!canSee(actor, x)) throw new NotFoundError(`No trial data set ${setId}.`);
  return { set, x };
}

function assertCoderDraft(actor: Actor, x: ExtractionRow) {
  if (x.kind !== 'coding') throw new UnprocessableError('Trial data are added on a coding sheet, not on a settled record.');
  if (x.coder_id !== actor.id) throw new ForbiddenError('Only the coder of this sheet can add trial data or start its fits.');
  if (x.state !== 'draft') throw new ConflictError(`This sheet is ${x.state}; trial data can be added while it is a draft.`);
}

function setView(s: TrialSetWithUploader, editable: boolean): TrialSet {
  return {
    id: s.id, extractionId: s.extraction_id, label: s.label, task: s.task, model: s.model, modality: s.modality, format: s.format, fileName: s.file_name,
    rows: s.row_count, trials: s.trial_count, participants: s.participant_count, conditions: s.conditions, levelMin: s.level_min, levelMax: s.level_max,
    uploadedBy: s.uploaded_by_login, createdAt: iso(s.created_at),
    fit: { state: s.fit_state, done: s.fit_done, total: s.fit_total, resamples: s.fit_resamples, error: s.fit_error, fittedAt: isoOrNull(s.fitted_at) },
    editable,
  };
}

const editableFor = (actor: Actor, x: ExtractionRow) => x.kind === 'coding' && x.coder_id === actor.id && x.state === 'draft';

/** Problems the fits would hit, named by the first line of the cell: too few levels for the model. */
function cellProblems(rows: readonly TrialRow[], task: TrialUpload['task']) {
  const need = task === 'simultaneity' ? 3 : 2;
  const first = new Map<string, { line: number; levels: Set<number>; participant: string; condition: string }>();
  for (const r of rows) {
    const key = JSON.stringify([r.participant, r.condition]);
    const c = first.get(key) ?? { line: r.line, levels: new Set<number>(), participant: r.participant, condition: r.condition };
    c.levels.add(r.level);
    first.set(key, c);
  }
  const errors: { line: number; message: string }[] = [];
  for (const c of first.values()) {
    if (c.levels.size < need) {
      errors.push({ line: c.line, message: `participant ${c.participant} in condition ${c.condition} has ${c.levels.size} level${c.levels.size === 1 ? '' : 's'}; a ${task === 'simultaneity' ? 'simultaneity window' : 'psychometric function'} needs at least ${need}` });
    }
  }
  return { errors, cells: first.size };
}

function refuseRows(errors: { line: number; message: string }[]): never {
  const listed = errors.slice(0, TRIAL_ERRORS_LISTED);
  const more = errors.length - listed.length;
  throw new ValidationError(
    `${errors.length} row${errors.length === 1 ? ' has a problem' : 's have problems'}; nothing was stored. Fix ${errors.length === 1 ? 'it' : 'them'} and upload the file again.${more > 0 ? ` (The first ${listed.length} are listed.)` : ''}`,
    listed.map((e) => ({ path: `file.line.${e.line}`, message: `Line ${e.line}: ${e.message}` })),
  );
}

/** Stores an uploaded CSV of trials or counts on a coding sheet (the whole file or nothing). */
export async function uploadTrialSet(db: Knex, actor: Actor, extractionId: number, file: { name: string; text: string }, meta: TrialUpload): Promise<TrialSet> {
  const x = await sheetFor(db, extractionId);
  if (!canSee(actor, x)) throw new NotFoundError(`No extraction ${extractionId}.`);
  assertCoderDraft(actor, x);
  const parsed = parseTrialsCsv(file.text);
  if (parsed.errors.length) refuseRows(parsed.errors);
  const { errors, cells } = cellProblems(parsed.rows, meta.task);
  if (errors.length) refuseRows(errors);
  if (cells > MAX_CELLS) throw new ValidationError(`The file has ${cells} participant × condition cells; at most ${MAX_CELLS} are fitted in one set.`, [{ path: 'file', message: `at most ${MAX_CELLS} cells` }]);
  const rows = parsed.rows;
  let lo = Infinity;
  let hi = -Infinity;
  let trials = 0;
  for (const r of rows) {
    if (r.level < lo) lo = r.level;
    if (r.level > hi) hi = r.level;
    trials += r.n;
  }
  const conditions = [...new Set(rows.map((r) => r.condition))];
  const participants = new Set(rows.map((r) => r.participant)).size;
  const set = await db.transaction(async (trx) => {
    const s = await insertTrialSet(trx, {
      extraction_id: extractionId, label: meta.label, task: meta.task, model: meta.model, modality: meta.modality, format: parsed.format!, file_name: file.name.slice(0, 200),
      row_count: rows.length, trial_count: trials, participant_count: participants, conditions, level_min: lo, level_max: hi, uploaded_by: actor.id,
    });
    await insertTrialRows(trx, s.id, rows);
    await recordAudit(trx, { actorId: actor.id, action: 'trials.upload', entityType: 'trial_set', entityId: s.id, details: { extractionId, rows: rows.length, format: parsed.format } });
    return s;
  });
  return setView((await findTrialSet(db, set.id))!, true);
}

export async function listTrialSets(db: Knex, actor: Actor, extractionId: number): Promise<TrialSetList> {
  const x = await sheetFor(db, extractionId);
  if (!canSee(actor, x)) throw new NotFoundError(`No extraction ${extractionId}.`);
  return { items: (await trialSetsOf(db, extractionId)).map((s) => setView(s, editableFor(actor, x))) };
}

const cellFitOf = (r: { result: unknown }) => r.result as CellFit;

export async function getTrialSet(db: Knex, actor: Actor, setId: number): Promise<TrialSetDetail> {
  const { set, x } = await visibleSet(db, actor, setId);
  const fits = set.fit_state === 'done' ? (await fitsOf(db, setId)).map(cellFitOf) : [];
  const count = (pred: (f: CellFit) => boolean) => fits.filter(pred).length;
  return {
    set: setView(set, editableFor(actor, x)),
    fits,
    flagged: {
      notConverged: count((f) => f.flags.some((g) => g.code === 'not_converged')),
      outsideRange: count((f) => f.flags.some((g) => g.code === 'outside_range')),
      plausibility: count((f) => f.flags.some((g) => g.commonPractice)),
    },
  };
}

/** Queues the fits of a set (one bootstrapped fit per participant × condition); without a job queue it stays queued. */
export async function startFits(deps: Pick<Deps, 'db' | 'jobs'>, actor: Actor, setId: number, opts: { resamples: number }) {
  const { x } = await visibleSet(deps.db, actor, setId);
  assertCoderDraft(actor, x);
  const total = await cellCount(deps.db, setId);
  await deps.db.transaction(async (trx) => {
    const set = await lockTrialSet(trx, setId);
    if (set?.fit_state === 'queued' || set?.fit_state === 'running') throw new ConflictError('The fits of this data set are already running.');
    await updateTrialSet(trx, setId, { fit_state: 'queued', fit_done: 0, fit_total: total, fit_resamples: opts.resamples, fit_error: null });
    await recordAudit(trx, { actorId: actor.id, action: 'trials.fit', entityType: 'trial_set', entityId: setId, details: { resamples: opts.resamples } });
  });
  const jobId = deps.jobs ? await deps.jobs.send(TRIALS_FIT_QUEUE, { setId, resamples: opts.resamples }, { retryLimit: 1 }) : null;
  if (jobId) await updateTrialSet(deps.db, setId, { fit_job_id: jobId });
  return { state: 'queued' as const, total, jobId };
}

let chain: Promise<unknown> = Promise.resolve();

/** Runs one set's fits (the job's body); progress lands in the set's row at most every quarter second. */
export async function runFitJob(db: Knex, data: { setId: number; resamples: number }, fitPool?: FitPool): Promise<void> {
  const set = await findTrialSet(db, data.setId);
  if (!set) return;
  try {
    const cells = countsByCell(await trialRowsOf(db, set.id));
    await updateTrialSet(db, set.id, { fit_state: 'running', fit_done: 0, fit_total: cells.length });
    let last = 0;
    let writing: Promise<unknown> = Promise.resolve();
    // A pool per job: its threads end with the job, so an idle server holds none.
    const usePool = fitPool ?? createFitPool();
    let fits: CellFit[];
    try {
      fits = await fitCells(usePool, cells, { task: set.task, model: set.model, audiovisual: set.modality === 'audiovisual', resamples: data.resamples }, (done) => {
        const now = Date.now();
        if (now - last < 250) return;
        last = now;
        writing = writing.then(() => updateTrialSet(db, set.id, { fit_done: done }));
      });
    } finally {
      if (!fitPool) await usePool.close();
    }
    await writing;
    await db.transaction(async (trx) => {
      await replaceFits(trx, set.id, fits.map((f) => ({ participant: f.participant, condition: f.condition, converged: f.fit.converged, result: f as unknown as Record<string, unknown> })));
      await updateTrialSet(trx, set.id, { fit_state: 'done', fit_done: fits.length, fit_total: fits.length, fittedNow: true });
    });
  } catch (err) {
    await updateTrialSet(db, set.id, { fit_state: 'failed', fit_error: err instanceof Error ? err.message : String(err) });
  }
}

/** The fit job's worker: one set at a time on one pool of worker threads. */
export async function registerTrialWorkers(deps: Pick<Deps, 'db'> & { jobs: JobQueue }): Promise<void> {
  await deps.jobs.work<{ setId: number; resamples: number }>(TRIALS_FIT_QUEUE, (data) => {
    const next = chain.then(() => runFitJob(deps.db, data));
    chain = next.catch(() => undefined);
    return next;
  });
}

function derivationOf(set: TrialSetRow, c: ReturnType<typeof deriveContrast>): Derivation {
  const s = c.summary;
  return {
    source: 'trial_data', trialSetId: set.id, parameter: c.parameter, conditionA: c.conditionA, conditionB: c.conditionB, measure: c.measure,
    setLabel: set.label, fittedAt: isoOrNull(set.fitted_at) ?? undefined, n: s.n, mean1: s.mean1, sd1: s.sd1, mean2: s.mean2, sd2: s.sd2, r: s.r, excluded: c.excluded.length,
  };
}

async function contrastOf(db: Knex | Knex.Transaction, set: TrialSetRow, req: ContrastRequest) {
  if (set.fit_state !== 'done') throw new UnprocessableError('Fit the data set first: the effect comes from its fits.');
  const fits = (await fitsOf(db, set.id)).map(cellFitOf);
  const allowed = set.task === 'simultaneity' ? ['width', 'centre'] : ['pse', 'jnd'];
  if (!allowed.includes(req.parameter)) throw new ValidationError(`A ${set.task} task gives ${allowed.join(' or ')}, not ${req.parameter}.`, [{ path: 'query.parameter', message: `choose ${allowed.join(' or ')}` }]);
  for (const [k, v] of [['conditionA', req.conditionA], ['conditionB', req.conditionB]] as const) {
    if (!set.conditions.includes(v)) throw new ValidationError(`The data set has no condition "${v}".`, [{ path: `query.${k}`, message: `choose one of ${set.conditions.join(', ')}` }]);
  }
  try {
    return deriveContrast(fits, req);
  } catch (err) {
    if (err instanceof StatsInputError) throw new UnprocessableError(`No effect from these fits: ${err.message}.`, [{ path: `query.${err.field ?? 'parameter'}`, message: err.message }]);
    throw err;
  }
}

/** The effect the fits of two conditions give, as the sheet would code it. */
export async function trialContrast(db: Knex, actor: Actor, setId: number, req: ContrastRequest): Promise<ContrastAnswer> {
  const { set } = await visibleSet(db, actor, setId);
  const c = await contrastOf(db, set, req);
  return {
    parameter: c.parameter, conditionA: c.conditionA, conditionB: c.conditionB, measure: c.measure, summary: c.summary, excluded: c.excluded, form: c.form,
    reported: c.reported as Record<string, number>,
    effect: { metric: c.computed.metric, effect: c.computed.effect, variance: c.computed.variance, formula: c.computed.formula },
    derivation: derivationOf(set, c),
  };
}

/**
 * Before a coder's sheet is saved: every effect derived from trial data gets its numbers from the fits (what the
 * coder sent for them is replaced), so a derived effect always says what its fits give.
 */
export async function refreshDerivations(trx: Knex.Transaction, extractionId: number, sheet: Sheet): Promise<Sheet> {
  const sets = new Map<number, TrialSetRow>();
  const problems: { path: string; message: string }[] = [];
  for (const [i, s] of sheet.studies.entries()) {
    for (const [j, e] of s.effects.entries()) {
      const d = e.derivation;
      if (!d) continue;
      const path = `sheet.studies.${i}.effects.${j}.derivation`;
      const set = sets.get(d.trialSetId) ?? (await findTrialSet(trx, d.trialSetId));
      if (!set || set.extraction_id !== extractionId) {
        problems.push({ path, message: `trial data set ${d.trialSetId} is not on this sheet` });
        continue;
      }
      sets.set(set.id, set);
      try {
        const c = await contrastOf(trx, set, d);
        e.form = c.form;
        e.reported = { ...c.reported };
        e.assumedR = undefined;
        e.derivation = derivationOf(set, c);
      } catch (err) {
        problems.push({ path, message: err instanceof Error ? err.message : String(err) });
      }
    }
  }
  if (problems.length) throw new ValidationError('An effect from trial data cannot be computed from its fits.', problems);
  return sheet;
}

const csvOf = (rows: Array<Record<string, CsvCell>>) => toCsv(rows);

function trialsCsvRows(set: TrialSetRow, rows: Awaited<ReturnType<typeof trialRowsOf>>, withSet: boolean) {
  return rows.map((r) => ({
    ...(withSet ? { trial_set_id: set.id, trial_set: set.label, task: set.task } : {}),
    participant: r.participant,
    condition: r.condition,
    level: r.level,
    ...(set.format === 'trials' ? { response: r.k } : { n: r.n, k: r.k }),
  }));
}

/** The set's rows as uploaded (trials or counts), for its coder and curators. */
export async function trialSetCsv(db: Knex, actor: Actor, setId: number): Promise<{ name: string; csv: string }> {
  const { set } = await visibleSet(db, actor, setId);
  return { name: `chronometa-trials-${set.id}.csv`, csv: csvOf(trialsCsvRows(set, await trialRowsOf(db, set.id), false)) };
}

/** The trials behind a snapshot's effects derived from trial data (as counts per level, one file for all sets). */
export async function snapshotTrialsCsv(db: Knex, effectIds: number[]): Promise<string> {
  const sets = await trialSetsByIds(db, await trialSetIdsOfEffects(db, effectIds));
  const out: Array<Record<string, CsvCell>> = [];
  for (const set of sets) {
    for (const r of await trialRowsOf(db, set.id)) {
      out.push({ trial_set_id: set.id, trial_set: set.label, task: set.task, participant: r.participant, condition: r.condition, level: r.level, n: r.n, k: r.k });
    }
  }
  if (!out.length) return 'trial_set_id,trial_set,task,participant,condition,level,n,k\n';
  return csvOf(out);
}
