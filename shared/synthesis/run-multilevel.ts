import type { SynthesisRequest } from '../schemas/synthesis.js';
import { FOREST_MAX_ROWS, forestFigure } from '../plots/forest.js';
import { StatsInputError } from './engine.js';
import { cautionsFor } from './cautions.js';
import type { AnalysisLog, ModelPart } from './run.js';
import {
  asPoolResult,
  cumulativeByPaper,
  effectRow,
  fitThreeLevel,
  leaveOnePaperOut,
  multilevelSubgroups,
  multilevelSummary,
  multilevelWeights,
  paperLine,
  refitRefusal,
  type MultilevelFit,
  type PaperInfo,
} from './multilevel.js';
import type { Caution, PooledRow, SettledEffect, SubgroupComparison, SynthesisOutput } from './types.js';

/** Raised when the three-level model cannot be fitted to these effects (one paper only, too few effects). */
export class MultilevelModelError extends Error {
  constructor(reason: string) {
    super(
      `The three-level model cannot be fitted to these effects: ${reason}. Widen the filters so that effects from at least 2 papers match, ` +
        'or handle several effects per study by aggregation or by keeping one per study.',
    );
  }
}

type MultilevelRequest = SynthesisRequest & { dependence: { mode: 'multilevel'; robust: boolean } };

const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
const NOT_UNDER_MULTILEVEL = 'assumes independent effects; not run under the three-level model (aggregate or keep one effect per study to run it)';

/**
 * The three-level model's part of the synthesis: every effect kept, clustered by paper (reference); the pooled
 * estimate, subgroups, meta-regression, leave-one-paper-out and cumulative by paper year from the model,
 * with the CR2 robust variance when asked for.
 */
export function multilevelPart(effects: readonly SettledEffect[], request: MultilevelRequest, metric: string, mLabel: string, { unavailable, attempt }: AnalysisLog): ModelPart {
  const sg = request.subgroup;
  const { order, groups } = inRowOrder(effects, sg);
  const k = order.length;
  const y = new Float64Array(k);
  const v = new Float64Array(k);
  const cluster = new Float64Array(k);
  order.forEach((at, i) => {
    const e = effects[at];
    y[i] = e.effect;
    v[i] = e.variance;
    cluster[i] = e.referenceId;
  });
  let fit: MultilevelFit;
  try {
    fit = fitThreeLevel({ y, v, cluster }, request);
  } catch (err) {
    if (err instanceof StatsInputError) throw new MultilevelModelError(err.message);
    throw err;
  }
  const m = fit.model;
  const weights = multilevelWeights(v, cluster, m.sigma2_between, m.sigma2_within);
  const result = asPoolResult(fit, weights, request.level);

  const papers = new Map<number, PaperInfo>();
  const byPaper = new Map<number, number[]>();
  const rows: PooledRow[] = Array.from(order, (at, i) => {
    const e = effects[at];
    const group = groups?.[at];
    const idx = byPaper.get(e.referenceId);
    if (idx) idx.push(i);
    else {
      byPaper.set(e.referenceId, [i]);
      papers.set(e.referenceId, { id: e.referenceId, label: e.referenceLabel, year: e.year, firstStudyId: e.studyId });
    }
    const row = effectRow(e, byPaper.get(e.referenceId)!.length, weights[i]);
    if (group !== undefined) row.subgroup = group;
    if (request.moderator) row.moderator = request.moderator === 'year' ? e.year : e.standardMs;
    return row;
  });
  const paperList = [...papers.values()];

  const subgroups = (labelOf: (value: string) => string) => {
    const sub = multilevelSubgroups(sg!, rows.map((r) => r.subgroup!), labelOf, y, v, cluster, request);
    for (const s of sub.skipped) unavailable.push({ analysis: `subgroup ${labelOf(s.value)}`, reason: s.reason });
    return sub.comparison;
  };

  const regress = (withX: number[]) => {
    const reg = fitThreeLevel({ y: withX.map((i) => y[i]), v: withX.map((i) => v[i]), cluster: withX.map((i) => cluster[i]), moderators: [withX.map((i) => rows[i].moderator as number)] }, request);
    const [intercept, slope] = (reg.robust?.coefficients ?? reg.model.coefficients)!;
    return {
      k: reg.model.k,
      intercept: intercept.estimate,
      slope: slope.estimate,
      slope_se: slope.se,
      slope_ci_lower: slope.ci_lower,
      slope_ci_upper: slope.ci_upper,
      slope_p: slope.p,
      tau2: reg.model.sigma2_between + reg.model.sigma2_within,
      R2: null,
    };
  };

  const refits = () => {
    const refusal = refitRefusal(paperList.length, k);
    let leaveOut: SynthesisOutput['leaveOneOut'] = null;
    let cumulativeRows: SynthesisOutput['cumulative'] = null;
    if (refusal) {
      unavailable.push({ analysis: 'leave-one-out', reason: refusal }, { analysis: 'cumulative', reason: refusal });
    } else {
      if (paperList.length >= 3) leaveOut = attempt('leave-one-out', () => leaveOnePaperOut(paperList, byPaper, y, v, cluster, request));
      else unavailable.push({ analysis: 'leave-one-out', reason: 'leaving a paper out needs at least 3 papers under the three-level model' });
      cumulativeRows = attempt('cumulative', () => cumulativeByPaper(paperList, byPaper, y, v, cluster, request));
    }
    unavailable.push({ analysis: "Egger's test", reason: NOT_UNDER_MULTILEVEL }, { analysis: "Begg's test", reason: NOT_UNDER_MULTILEVEL }, { analysis: 'trim-and-fill', reason: NOT_UNDER_MULTILEVEL });
    return { leaveOneOut: leaveOut, cumulative: cumulativeRows, begg: null, trimFill: null };
  };

  const forest = (groups: SubgroupComparison | null) => {
    const shown = largestWeights(weights, FOREST_MAX_ROWS);
    const shownPapers = new Set(shown.map((i) => rows[i].referenceId));
    return forestFigure({
      metric,
      metricLabel: mLabel,
      level: request.level,
      studies: shown.map((i) => {
        const r = rows[i];
        return { label: sg ? r.label : r.label.slice(r.paper!.length + 3), year: r.year, n: r.n, effect: r.effect, variance: r.variance, weight: r.weight, group: sg ? r.subgroup : String(r.referenceId) };
      }),
      omitted: k - shown.length,
      rowNoun: 'effects',
      pooled: { label: `Three-level estimate (REML${fit.robust ? ', CR2 robust' : ''})`, estimate: result.estimate, ci_lower: result.ci_lower, ci_upper: result.ci_upper, pi_lower: result.pi_lower, pi_upper: result.pi_upper },
      subgroups: sg
        ? groups?.groups.map((g) => ({ key: g.value, label: g.label, estimate: g.estimate, ci_lower: g.ci_lower, ci_upper: g.ci_upper }))
        : paperList.filter((p) => shownPapers.has(p.id)).map((p) => {
            const idx = byPaper.get(p.id)!;
            return { key: String(p.id), label: p.label, ...paperLine(idx.map((i) => v[i]), idx.map((i) => y[i]), m.sigma2_within, request.level) };
          }),
      grouping: sg ? 'subgroup' : 'paper',
    });
  };

  const finish = () => {
    const summary = multilevelSummary(fit, request.dependence.robust);
    if (summary.robustUnavailable) unavailable.push({ analysis: 'robust variance', reason: `${summary.robustUnavailable}; the model-based test is shown` });
    return {
      cautions: multilevelCautions(fit, paperList.length, result),
      multilevel: summary,
      papersWithSeveralEffects: [...byPaper.values()].filter((x) => x.length > 1).length,
    };
  };

  return {
    rows,
    result,
    counts: { effects: k, studies: new Set(effects.map((e) => e.studyId)).size, references: paperList.length },
    subgroups,
    regress,
    refits,
    forest,
    funnelTrimFill: () => null,
    finish,
  };
}

/**
 * Effects in row order: subgroup, paper year, paper label, paper, study, effect. The effects are gathered by
 * subgroup and paper first (year and label are the paper's), so only those groups are sorted, strings ranked
 * once in code-point order; a group's effects keep their order when it is already by study and id. Returns
 * the effects' indices in that order and each effect's subgroup value.
 */
function inRowOrder(effects: readonly SettledEffect[], sg: MultilevelRequest['subgroup']) {
  const groups = sg ? effects.map((e) => String(e[sg] ?? 'not reported')) : null;
  const gRank = new Map<string, number>();
  if (groups) [...new Set(groups)].sort(cmp).forEach((x, i) => gRank.set(x, i));
  const slot = new Map<number, number>();
  const firsts: number[] = [];
  const members: number[][] = [];
  const stride = 2 ** 31;
  effects.forEach((e, i) => {
    const key = groups ? gRank.get(groups[i])! * stride + e.referenceId : e.referenceId;
    const at = slot.get(key);
    if (at === undefined) {
      slot.set(key, members.length);
      firsts.push(i);
      members.push([i]);
    } else members[at].push(i);
  });
  const labels = [...new Set(firsts.map((i) => effects[i].referenceLabel))].sort(cmp);
  const labelRank = new Map(labels.map((x, i) => [x, i]));
  const G = firsts.length;
  const gOf = new Float64Array(G), year = new Float64Array(G), label = new Float64Array(G), ref = new Float64Array(G);
  firsts.forEach((i, m) => {
    const e = effects[i];
    gOf[m] = groups ? gRank.get(groups[i])! : 0;
    year[m] = e.year ?? 9999;
    label[m] = labelRank.get(e.referenceLabel)!;
    ref[m] = e.referenceId;
  });
  const order = Array.from({ length: G }, (_, m) => m).sort((a, b) => gOf[a] - gOf[b] || year[a] - year[b] || label[a] - label[b] || ref[a] - ref[b]);
  const within = (a: number, b: number) => effects[a].studyId - effects[b].studyId || effects[a].id - effects[b].id;
  const out = new Int32Array(effects.length);
  let n = 0;
  for (const m of order) {
    const idx = members[m];
    let sorted = true;
    for (let t = 1; t < idx.length && sorted; t++) sorted = within(idx[t - 1], idx[t]) < 0;
    if (!sorted) idx.sort(within);
    for (const i of idx) out[n++] = i;
  }
  return { order: out, groups };
}

/** Indices (in row order) of the `max` rows with the largest weights. */
function largestWeights(weights: number[], max: number): number[] {
  if (weights.length <= max) return weights.map((_, i) => i);
  const sorted = Float64Array.from(weights).sort();
  const cut = sorted[weights.length - max];
  let above = 0;
  for (const w of weights) if (w > cut) above++;
  let ties = max - above;
  const out: number[] = [];
  weights.forEach((w, i) => {
    if (w > cut || (w === cut && ties-- > 0)) out.push(i);
  });
  return out;
}

function multilevelCautions(fit: MultilevelFit, papers: number, result: ReturnType<typeof asPoolResult>): Caution[] {
  const out: Caution[] = [];
  if (fit.robust && fit.robust.df < 4)
    out.push({
      code: 'few_clusters',
      text: `The robust test rests on ${fit.robust.df.toFixed(1)} Satterthwaite degrees of freedom (${papers} papers): below 4 its p value and interval are unreliable (Tipton, 2015).`,
    });
  else if (!fit.robust && papers < 5)
    out.push({ code: 'few_clusters', text: `Only ${papers} papers: the between-paper variance is poorly estimated and the model-based interval may be too narrow; consider the robust variance.` });
  // the usual cautions, counted in papers (the DL caution does not apply: σ² are REML)
  return [...out, ...cautionsFor({ ...result, hksj: true }, papers, ['paper', 'papers'])];
}
