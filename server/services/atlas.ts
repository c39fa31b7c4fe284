import type { Knex } from 'knex';
import { querySettledEffects, querySynthesisRows } from '../repositories/effects.js';
import { findManipulation, liveVocabulary } from '../repositories/manipulations.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';
import { NotFoundError } from '../lib/errors.js';
import { pageOf } from '../../shared/schemas/common.js';
import {
  synthesisRequestSchema, type AtlasLanding, type AtlasManipulation, type AtlasOutcome, type AtlasPooled, type AtlasReferencePage, type PooledCell,
} from '../../shared/schemas/synthesis.js';
import { OUTCOMES, type OutcomeKind } from '../../shared/vocabulary/outcomes.js';
import { quantityLabel, SIGN_CONVENTIONS } from '../../shared/vocabulary/parameters.js';
import { runSynthesis, metricLabel } from '../../shared/synthesis/run.js';
import { cautionsFor } from '../../shared/synthesis/cautions.js';


const count = (rows: SettledEffect[]) => ({
  effects: rows.length,
  studies: new Set(rows.map((r) => r.studyId)).size,
  references: new Set(rows.map((r) => r.referenceId)).size,
});

function groupBy<T>(xs: T[], key: (x: T) => string): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const x of xs) {
    const k = key(x);
    const g = m.get(k);
    if (g) g.push(x);
    else m.set(k, [x]);
  }
  return m;
}

const outcomeLabel = (o: string) => OUTCOMES[o as OutcomeKind]?.label ?? o;

/** Every manipulation (with its current pooled estimates) and outcome kind with counts of settled references, studies and effects. */
export async function atlasLanding(db: Knex): Promise<AtlasLanding> {
  const [rows, vocab] = await Promise.all([querySynthesisRows(db, {}), liveVocabulary(db)]);
  const byManip = groupBy(rows, (r) => r.manipulation);
  const byOutcome = groupBy(rows, (r) => r.outcome);
  const known = new Set(vocab.map((v) => v.term));
  const extra = [...byManip.keys()].filter((t) => !known.has(t)).map((t) => ({ term: t, label: byManip.get(t)![0].manipulationLabel ?? t, description: '' }));
  return {
    totals: count(rows),
    manipulations: [...vocab, ...extra].map((m) => {
      const rs = byManip.get(m.term) ?? [];
      return {
        term: m.term, label: m.label, description: m.description, ...count(rs), outcomes: [...new Set(rs.map((r) => r.outcome))].sort(),
        estimates: pooledCells(rs, (r) => ({ manipulation: m.term, outcome: r.outcome, metric: r.metric }), false),
      };
    }),
    outcomes: Object.keys(OUTCOMES).map((kind) => {
      const rs = byOutcome.get(kind) ?? [];
      return { kind, label: outcomeLabel(kind), typicalReport: OUTCOMES[kind as OutcomeKind].typicalReport, ...count(rs), metrics: [...new Set(rs.map((r) => r.metric))].sort() };
    }),
  };
}

const DEFAULT_REQUEST = { method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } } as const;

/** The filters of one cell: the given ones and the cell's parameter and unit (when recorded). */
const withQuantity = (f: Record<string, string>, r: SettledEffect): Record<string, string> => ({ ...f, ...(r.parameter && r.unit ? { parameter: r.parameter, unit: r.unit } : {}) });

/** The current pooled estimate of each (outcome kind, parameter and unit, metric) cell of one manipulation's or outcome's effects. */
function pooledCells(rows: SettledEffect[], filters: (first: SettledEffect) => Record<string, string>, withFigure: boolean): PooledCell[] {
  const cells = groupBy(rows, (r) => `${r.outcome}\u0000${r.manipulation}\u0000${r.parameter ?? ''}\u0000${r.unit ?? ''}\u0000${r.metric}`);
  return [...cells.values()]
    .map((rs) => {
      const f = withQuantity(filters(rs[0]), rs[0]);
      const request = synthesisRequestSchema.parse({ ...DEFAULT_REQUEST, filters: f });
      const out = runSynthesis(rs, request);
      const r = out.result;
      return {
        outcome: rs[0].outcome,
        outcomeLabel: outcomeLabel(rs[0].outcome),
        manipulation: rs[0].manipulation,
        manipulationLabel: rs[0].manipulationLabel ?? rs[0].manipulation,
        parameter: rs[0].parameter ?? null,
        unit: rs[0].unit ?? null,
        quantityLabel: rs[0].parameter && rs[0].unit ? quantityLabel(rs[0].parameter, rs[0].unit) : null,
        metric: rs[0].metric,
        metricLabel: metricLabel(rs[0].metric),
        signConvention: SIGN_CONVENTIONS[rs[0].outcome as OutcomeKind] ?? '',
        filters: f,
        counts: out.counts,
        pooled: { estimate: r.estimate, ci_lower: r.ci_lower, ci_upper: r.ci_upper, pi_lower: r.pi_lower, pi_upper: r.pi_upper, tau2: r.tau2, I2: r.I2, Q_p: r.Q_p, p: r.p, level: r.level, method: r.method },
        cautions: cautionsFor(r, out.counts.studies).filter((c) => c.code !== 'not_clinical'),
        ...(withFigure ? { forest: out.figures.forest } : {}),
      };
    })
    .sort((a, b) => a.outcome.localeCompare(b.outcome) || a.manipulation.localeCompare(b.manipulation) || b.counts.studies - a.counts.studies);
}

async function manipulationRow(db: Knex, term: string) {
  const m = await findManipulation(db, term);
  if (!m) throw new NotFoundError(`No manipulation "${term}" in the vocabulary.`);
  return m;
}

export async function atlasManipulation(db: Knex, term: string): Promise<AtlasManipulation> {
  const m = await manipulationRow(db, term);
  const rows = await querySynthesisRows(db, { manipulation: term });
  return {
    manipulation: { term: m.term, label: m.label, description: m.description, retired: !!m.retired_at },
    totals: count(rows),
    cells: pooledCells(rows, (r) => ({ manipulation: term, outcome: r.outcome, metric: r.metric }), true),
  };
}

/** Only the pooled numbers of a manipulation (what scripts and the atlas cards need). */
export async function atlasManipulationPooled(db: Knex, term: string): Promise<AtlasPooled> {
  await manipulationRow(db, term);
  const rows = await querySynthesisRows(db, { manipulation: term });
  return { term, totals: count(rows), cells: pooledCells(rows, (r) => ({ manipulation: term, outcome: r.outcome, metric: r.metric }), false) };
}

export async function atlasOutcome(db: Knex, kind: string): Promise<AtlasOutcome> {
  if (!(kind in OUTCOMES)) throw new NotFoundError(`No outcome kind "${kind}".`);
  const rows = await querySynthesisRows(db, { outcome: kind });
  const info = OUTCOMES[kind as OutcomeKind];
  return {
    outcome: { kind, label: info.label, typicalReport: info.typicalReport, metrics: [...info.metrics], metricLabels: info.metrics.map(metricLabel) },
    totals: count(rows),
    cells: pooledCells(rows, (r) => ({ manipulation: r.manipulation, outcome: kind, metric: r.metric }), false),
  };
}

type RefSort = 'year' | 'label' | 'title' | 'effects';

/** The references behind an atlas page, paged and sorted on the server. */
export async function atlasReferences(
  db: Knex,
  where: { manipulation?: string; outcome?: string },
  q: { page: number; pageSize: number; sort: RefSort; order: 'asc' | 'desc' },
): Promise<AtlasReferencePage> {
  const rows = await querySettledEffects(db, where);
  const byRef = groupBy(rows, (r) => String(r.referenceId));
  const items = [...byRef.values()].map((rs) => ({
    id: rs[0].referenceId,
    label: rs[0].referenceLabel,
    title: rs[0].title,
    year: rs[0].year,
    doi: rs[0].doi,
    studies: new Set(rs.map((r) => r.studyId)).size,
    effects: rs.length,
  }));
  const dir = q.order === 'asc' ? 1 : -1;
  const key = q.sort;
  items.sort((a, b) => {
    const x = key === 'label' ? a.label : key === 'title' ? a.title : key === 'year' ? (a.year ?? 0) : a.effects;
    const y = key === 'label' ? b.label : key === 'title' ? b.title : key === 'year' ? (b.year ?? 0) : b.effects;
    return (typeof x === 'string' ? x.localeCompare(y as string) : (x as number) - (y as number)) * dir || a.id - b.id;
  });
  return pageOf(items.slice((q.page - 1) * q.pageSize, q.page * q.pageSize), items.length, q);
}
