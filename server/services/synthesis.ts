import type { Knex } from 'knex';
import { filterLoaded, lastLoaded, settledEffectsAt, settledEffectsFor } from './settled-effects-cache.js';
import { UnprocessableError, ValidationError } from '../lib/errors.js';
import type { SettledEffectFilters } from '../repositories/settled-effects.js';
import { querySettledEffects } from '../repositories/effects.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';
import { effectsCsv, studiesCsv } from '../../shared/export/synthesis-csv.js';
import type { SynthesisAnswer, SynthesisFacets, SynthesisRequest, SynthesisRowsQuery, SYNTHESIS_EXPORT_FILES } from '../../shared/schemas/synthesis.js';
import { MixedMetricsError, MixedOutcomesError, MixedQuantitiesError, NoEffectsError, runSynthesis } from '../../shared/synthesis/run.js';
import { SmdFamilyFilterError, metricFilter } from '../../shared/synthesis/metric-choice.js';
import { MultilevelModelError } from '../../shared/synthesis/run-multilevel.js';
import { rowOrder } from '../../shared/synthesis/answer-rows.js';
import type { SettledEffect, SynthesisOutput } from '../../shared/synthesis/types.js';
import { PARAMETER_LABELS, UNIT_LABELS, type Parameter, type Unit } from '../../shared/vocabulary/parameters.js';
import { fieldProblemInWords } from '../../shared/schemas/plain-words.js';

/** The settled-effect filters a request means (an SMD family widens the metric filter to its members). */
export function requestFilters(request: SynthesisRequest): SettledEffectFilters {
  try {
    return { ...request.filters, metric: metricFilter(request) };
  } catch (err) {
    if (err instanceof SmdFamilyFilterError) throw new ValidationError(fieldProblemInWords('smdFamily', err.message), [{ path: 'body.smdFamily', message: err.message }]);
    throw err;
  }
}

/** Runs the pure pipeline, turning its refusals into 422s that say what to do. */
export function synthesize(effects: readonly SettledEffect[], request: SynthesisRequest): SynthesisOutput {
  try {
    return runSynthesis(effects, request);
  } catch (err) {
    if (err instanceof MixedOutcomesError) throw new UnprocessableError(err.message, { outcomes: err.outcomes, choices: err.choices, inWords: err.inWords });
    if (err instanceof MixedMetricsError) throw new UnprocessableError(err.message, { metrics: err.metrics, choices: err.choices, inWords: err.inWords });
    if (err instanceof MixedQuantitiesError) throw new UnprocessableError(err.message, { quantities: err.quantities, choices: err.choices, inWords: err.inWords });
    if (err instanceof NoEffectsError) throw new UnprocessableError(err.message, { effects: 0 });
    if (err instanceof MultilevelModelError) throw new UnprocessableError(err.message, { dependence: 'multilevel' });
    throw err;
  }
}

/** A synthesis over the current settled registry, with the registry version it was computed on. */
export async function synthesizeRegistry(db: Knex | Knex.Transaction, request: SynthesisRequest) {
  const { registryVersion, effects } = await settledEffectsFor(db, requestFilters(request));
  return { registryVersion, effects, output: synthesize(effects, request) };
}

/** How many settled effects a request covers (what its computation costs grows with). */
export async function synthesisSize(db: Knex, request: SynthesisRequest): Promise<number> {
  return (await settledEffectsFor(db, requestFilters(request))).effects.length;
}

/** The same count from the settled effects as last loaded, without a query (0 before the first load): an estimate. */
export function synthesisSizeGuess(db: Knex, request: SynthesisRequest): number {
  const loaded = lastLoaded(db);
  return loaded ? filterLoaded(loaded, requestFilters(request)).length : 0;
}

/** What POST /api/syntheses answers: the synthesis and the registry version it was computed on. */
export async function registrySynthesis(db: Knex, request: SynthesisRequest): Promise<SynthesisAnswer> {
  const { registryVersion, output } = await synthesizeRegistry(db, request);
  return { registryVersion, ...output };
}

/**
 * A synthesis answer with its per-study rows (and `result.weights`, which stand beside them) as asked: all of
 * them, one page sorted on the server (missing values last, ties in the engine's order), or none. The pooled
 * results, figures and sensitivity analyses are those of the whole synthesis in every case.
 */
export function synthesisRowsView(answer: SynthesisAnswer, q: SynthesisRowsQuery): SynthesisAnswer {
  if (q.rows === 'all') return answer;
  const total = answer.rows.length;
  if (q.rows === 'none') return { ...answer, rows: [], result: { ...answer.result, weights: [] }, rowsPage: { rows: 'none', total } };
  const order = rowOrder(answer.rows, q.sort, q.order).slice((q.page - 1) * q.pageSize, q.page * q.pageSize);
  return {
    ...answer,
    rows: order.map((i) => answer.rows[i]),
    result: { ...answer.result, weights: order.map((i) => answer.result.weights[i]) },
    rowsPage: { rows: 'page', total, page: q.page, pageSize: q.pageSize, sort: q.sort, order: q.order },
  };
}

/**
 * A live synthesis as a download (no snapshot is saved): the rows, the effects and the registry version come
 * from one consistent view of the registry, and the file name carries that version.
 */
export async function liveSynthesisExport(db: Knex, request: SynthesisRequest, file: Exclude<(typeof SYNTHESIS_EXPORT_FILES)[number], 'flow.svg'>) {
  const { registryVersion, effects, output } = await db.transaction(
    async (trx) => {
      const version = await currentRegistryVersion(trx);
      const rows = await querySettledEffects(trx, requestFilters(request));
      return { registryVersion: version, effects: rows, output: synthesize(rows, request) };
    },
    { isolationLevel: 'repeatable read', readOnly: true },
  );
  const stem = `chronometa-synthesis-v${registryVersion}`;
  if (file === 'studies.csv') return { name: `${stem}-studies.csv`, type: 'text/csv; charset=utf-8', body: studiesCsv(output, effects) };
  if (file === 'effects.csv') return { name: `${stem}-effects.csv`, type: 'text/csv; charset=utf-8', body: effectsCsv(effects) };
  const answer: SynthesisAnswer & { effects: typeof effects } = { registryVersion, ...output, effects };
  return { name: `${stem}.json`, type: 'application/json; charset=utf-8', body: JSON.stringify(answer) };
}

/** Distinct filter values among settled effects, with counts (for the synthesis form). */
export async function synthesisFacets(db: Knex): Promise<SynthesisFacets> {
  const rows = (await settledEffectsAt(db)).effects;
  const tally = (pick: (r: SettledEffect) => string | null) => {
    const m = new Map<string, number>();
    for (const r of rows) {
      const v = pick(r);
      if (v != null) m.set(v, (m.get(v) ?? 0) + 1);
    }
    return [...m].map(([value, count]) => ({ value, count })).sort((a, b) => (a.value < b.value ? -1 : a.value > b.value ? 1 : 0));
  };
  const labels = new Map(rows.map((r) => [r.manipulation, r.manipulationLabel]));
  const years = rows.map((r) => r.year).filter((y): y is number => y != null);
  return {
    effects: rows.length,
    manipulations: tally((r) => r.manipulation).map((f) => ({ ...f, label: labels.get(f.value) ?? f.value })),
    outcomes: tally((r) => r.outcome),
    parameters: tally((r) => r.parameter ?? null).map((f) => ({ ...f, label: PARAMETER_LABELS[f.value as Parameter] ?? f.value })),
    units: tally((r) => r.unit ?? null).map((f) => ({ ...f, label: UNIT_LABELS[f.value as Unit] ?? f.value })),
    metrics: tally((r) => r.metric),
    populations: tally((r) => r.population),
    modalities: tally((r) => r.modality),
    tasks: tally((r) => r.task),
    designs: tally((r) => r.design),
    years: years.length ? { min: Math.min(...years), max: Math.max(...years) } : null,
  };
}
