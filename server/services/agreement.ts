import type { Knex } from 'knex';
import { cohensKappaFromPairs } from '../../shared/agreement/cohens-kappa.js';
import { icc } from '../../shared/agreement/icc.js';
import { iccWithheldReason } from '../../shared/agreement/reporting.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { Sheet } from '../../shared/schemas/extraction.js';
import type { AgreementForReference, AgreementSummary, OverallAgreement, ReferenceAgreementPage } from '../../shared/schemas/reconciliation.js';
import { toSheet } from '../../shared/extraction/stored-sheet.js';
import { comparedPairs } from '../repositories/assignments.js';
import { refLabel } from '../repositories/db.js';
import { pairSheets, readSheet } from '../repositories/extractions.js';
import { effectValue } from './comparison.js';

const CATEGORICAL_STUDY = ['design', 'population', 'modality', 'task'] as const;
const CATEGORICAL_EFFECT = ['outcome', 'manipulation', 'metric'] as const;

interface PairData {
  assignmentId: number;
  referenceId: number;
  referenceLabel: string;
  coders: [string, string];
  categorical: Record<string, [string, string][]>;
  effects: Record<string, [number, number][]>;
}

/** Collects the paired values of two submitted codings, aligned by study and effect position. */
function pairValues(a: Sheet, b: Sheet) {
  const categorical: Record<string, [string, string][]> = {};
  const effects: Record<string, [number, number][]> = {};
  const add = (f: string, x: unknown, y: unknown) => (categorical[f] ??= []).push([String(x ?? '—'), String(y ?? '—')]);
  for (let i = 0; i < Math.min(a.studies.length, b.studies.length); i++) {
    const sa = a.studies[i];
    const sb = b.studies[i];
    for (const f of CATEGORICAL_STUDY) add(f, sa[f], sb[f]);
    for (let j = 0; j < Math.min(sa.effects.length, sb.effects.length); j++) {
      const va = effectValue(sa.effects[j]);
      const vb = effectValue(sb.effects[j]);
      add('outcome', sa.effects[j].outcome, sb.effects[j].outcome);
      add('manipulation', sa.effects[j].manipulation, sb.effects[j].manipulation);
      add('metric', va.metric, vb.metric);
      if (va.metric && va.metric === vb.metric && va.effect != null && vb.effect != null) (effects[va.metric] ??= []).push([va.effect, vb.effect]);
    }
  }
  return { categorical, effects };
}

async function loadPairs(db: Knex, filter: { referenceId?: number; assignmentId?: number } = {}): Promise<PairData[]> {
  const rows = await comparedPairs(db, filter);
  const out: PairData[] = [];
  for (const r of rows) {
    const xs = await pairSheets(db, r.id, { submittedOnly: true });
    const xa = xs.find((x) => x.coder_id === r.coder1_id);
    const xb = xs.find((x) => x.coder_id === r.coder2_id);
    if (!xa || !xb) continue;
    const values = pairValues(toSheet(await readSheet(db, xa.id)), toSheet(await readSheet(db, xb.id)));
    out.push({ assignmentId: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), coders: [r.l1, r.l2], ...values });
  }
  return out;
}


/** Percent agreement and Cohen's kappa per categorical field (and pooled over fields), ICC(2,1) per metric. */
export function summarize(pairs: PairData[]): AgreementSummary {
  const byField: Record<string, [string, string][]> = {};
  const byMetric: Record<string, [number, number][]> = {};
  for (const p of pairs) {
    for (const [f, v] of Object.entries(p.categorical)) (byField[f] ??= []).push(...v);
    for (const [m, v] of Object.entries(p.effects)) (byMetric[m] ??= []).push(...v);
  }
  const fields = [...CATEGORICAL_STUDY, ...CATEGORICAL_EFFECT].filter((f) => byField[f]?.length);
  const categorical = fields.map((f) => {
    const k = cohensKappaFromPairs(byField[f]);
    return { field: f, items: k.n, percentAgreement: k.percentAgreement, kappa: k.kappa, kappaSe: k.se };
  });
  // Pooled over fields: a category is the field and its value, so "within" never meets "visual".
  const pooled = fields.flatMap((f) => byField[f].map(([a, b]) => [`${f}:${a}`, `${f}:${b}`] as [string, string]));
  const all = pooled.length ? cohensKappaFromPairs(pooled) : null;
  const effectSizes = Object.entries(byMetric)
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([metric, v]) => {
      const iccNote = iccWithheldReason(v.length);
      return { metric, items: v.length, icc: iccNote ? null : icc(v.map(([a, b]) => [a, b])).icc2_1, iccNote };
    });
  return {
    pairs: pairs.length,
    categorical,
    allCategorical: { items: all?.n ?? 0, percentAgreement: all?.percentAgreement ?? null, kappa: all?.kappa ?? null },
    effectSizes,
  };
}

export async function overallAgreement(db: Knex): Promise<OverallAgreement> {
  const pairs = await loadPairs(db);
  const byCoders = new Map<string, PairData[]>();
  for (const p of pairs) {
    const key = [...p.coders].sort().join(' & ');
    byCoders.set(key, [...(byCoders.get(key) ?? []), p]);
  }
  return {
    overall: summarize(pairs),
    coderPairs: [...byCoders.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([coders, ps]) => ({ coders, ...summarize(ps) })),
  };
}

export async function referenceAgreement(db: Knex, q: { page: number; pageSize: number; sort: 'reference' | 'agreement'; order: 'asc' | 'desc' }): Promise<ReferenceAgreementPage> {
  const pairs = await loadPairs(db);
  const items = pairs.map((p) => {
    const s = summarize([p]);
    return { assignmentId: p.assignmentId, referenceId: p.referenceId, referenceLabel: p.referenceLabel, coders: p.coders.join(' & '), ...s.allCategorical, effectSizes: s.effectSizes };
  });
  const dir = q.order === 'asc' ? 1 : -1;
  items.sort((a, b) => dir * (q.sort === 'reference' ? a.referenceLabel.localeCompare(b.referenceLabel) : (a.percentAgreement ?? -1) - (b.percentAgreement ?? -1)) || a.assignmentId - b.assignmentId);
  return pageOf(items.slice((q.page - 1) * q.pageSize, q.page * q.pageSize), items.length, q);
}

export async function agreementForReference(db: Knex, referenceId: number): Promise<AgreementForReference> {
  const pairs = await loadPairs(db, { referenceId });
  return { referenceId, ...summarize(pairs) };
}
