import type { SubgroupVariable, SynthesisRequest } from '../schemas/synthesis.js';
import { chiSquareUpperTail } from '../stats/chi-square.js';
import { normalQuantileUpper, normalTwoTailed } from '../stats/normal.js';
import { pool, poolMultilevel, poolMultilevelWithRobust, type MultilevelResult, type PoolResult, type RobustResult } from './engine.js';
import type { MultilevelSummary, PooledRow, SensitivityRow, SettledEffect, SubgroupComparison, SubgroupResult } from './types.js';

/** Leave-one-paper-out and cumulative refit the model once per paper: beyond these they are skipped. */
export const MULTILEVEL_REFIT_MAX_PAPERS = 400;
const MULTILEVEL_REFIT_MAX_WORK = 400_000; // papers × effects

type MultilevelRequest = SynthesisRequest & { dependence: { mode: 'multilevel'; robust: boolean } };

/** One fit: the three-level model, and CR2 inference when asked for and possible. */
export interface MultilevelFit {
  model: MultilevelResult;
  robust: RobustResult | null;
  robustError?: string;
  /** the inference used: robust when it could be formed, else the model's */
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  p: number;
  statistic: number;
  statistic_df: number | null;
}

export interface MultilevelInputRows {
  y: ArrayLike<number>;
  v: ArrayLike<number>;
  cluster: ArrayLike<number>;
  moderators?: number[][];
}

export function fitThreeLevel(d: MultilevelInputRows, request: MultilevelRequest): MultilevelFit {
  const input = { effects: d.y, variances: d.v, cluster: d.cluster, moderators: d.moderators, level: request.level };
  const test = request.hksj ? 't' : 'z';
  let model: MultilevelResult;
  let robust: RobustResult | null = null;
  let robustError: string | undefined;
  if (request.dependence.robust) {
    const both = poolMultilevelWithRobust({ ...input, test });
    model = both.model;
    if (both.robust instanceof Error) robustError = both.robust.message;
    else robust = both.robust;
  } else model = poolMultilevel({ ...input, test });
  const fit: MultilevelFit = robust
    ? { model, robust, estimate: robust.estimate, se: robust.se, ci_lower: robust.ci_lower, ci_upper: robust.ci_upper, p: robust.p, statistic: robust.t, statistic_df: robust.df }
    : { model, robust, estimate: model.estimate, se: model.se, ci_lower: model.ci_lower, ci_upper: model.ci_upper, p: model.p, statistic: model.statistic, statistic_df: model.statistic_df };
  if (robustError) fit.robustError = robustError;
  return fit;
}

/**
 * Percent weight of each effect in the pooled estimate: its entry of V⁻¹1/1ᵀV⁻¹1 (generalised least squares),
 * per paper in closed form, V_j⁻¹1 = ω(1 − c_jΣω), ω = 1/(v + σ²_w), c_j = σ²_b/(1 + σ²_b Σω).
 */
export function multilevelWeights(v: ArrayLike<number>, cluster: ArrayLike<number>, sb: number, sw: number): number[] {
  const sums = new Map<number, number>();
  for (let i = 0; i < v.length; i++) sums.set(cluster[i], (sums.get(cluster[i]) ?? 0) + 1 / (v[i] + sw));
  const w = new Array<number>(v.length);
  let total = 0;
  for (let i = 0; i < v.length; i++) {
    const s = sums.get(cluster[i])!;
    w[i] = (1 / (v[i] + sw)) * (1 - (sb * s) / (1 + sb * s));
    total += w[i];
  }
  for (let i = 0; i < w.length; i++) w[i] = (100 * w[i]) / total;
  return w;
}

/** The pooled result in the shape every screen reads (k counts effects; τ² is σ²_between + σ²_within). */
export function asPoolResult(fit: MultilevelFit, weights: number[], level: number): PoolResult {
  const m = fit.model;
  const tau2 = m.sigma2_between + m.sigma2_within;
  return {
    k: m.k,
    method: 'REML',
    hksj: false,
    level,
    estimate: fit.estimate,
    se: fit.se,
    ci_lower: fit.ci_lower,
    ci_upper: fit.ci_upper,
    statistic: fit.statistic,
    statistic_df: fit.statistic_df,
    p: fit.p,
    tau2,
    tau: Math.sqrt(tau2),
    tau2_ci_lower: null,
    tau2_ci_upper: null,
    Q: m.Q,
    Q_df: m.Q_df,
    Q_p: m.Q_p,
    I2: m.I2_between + m.I2_within,
    I2_tau: m.I2_between + m.I2_within,
    H2: null,
    pi_lower: m.pi_lower,
    pi_upper: m.pi_upper,
    egger: null,
    weights,
  };
}

export function multilevelSummary(fit: MultilevelFit, robustAsked: boolean): MultilevelSummary {
  const m = fit.model;
  const out: MultilevelSummary = {
    clusters: m.clusters,
    sigma2_between: m.sigma2_between,
    sigma2_within: m.sigma2_within,
    I2_between: m.I2_between,
    I2_within: m.I2_within,
    loglik: m.loglik,
    robust: fit.robust !== null,
    model: { estimate: m.estimate, se: m.se, ci_lower: m.ci_lower, ci_upper: m.ci_upper, statistic: m.statistic, statistic_df: m.statistic_df, p: m.p },
    robustTest: fit.robust ? { se: fit.robust.se, df: fit.robust.df, t: fit.robust.t, p: fit.robust.p, ci_lower: fit.robust.ci_lower, ci_upper: fit.robust.ci_upper } : null,
  };
  if (robustAsked && fit.robustError) out.robustUnavailable = fit.robustError;
  return out;
}

/** The paper's own estimate of μ + u_j: its effects weighted by 1/(v + σ²_w), for the forest plot's paper line. */
export function paperLine(v: number[], y: number[], sw: number, level: number) {
  let sw1 = 0, swy = 0;
  for (let i = 0; i < v.length; i++) {
    sw1 += 1 / (v[i] + sw);
    swy += y[i] / (v[i] + sw);
  }
  const est = swy / sw1;
  const half = normalQuantileUpper((1 - level) / 2) / Math.sqrt(sw1);
  return { estimate: est, ci_lower: est - half, ci_upper: est + half };
}

/** Effects grouped into papers for refits: paper order, each paper's effect indices. */
export interface Papers {
  order: number[];
  members: Map<number, number[]>;
}

function subsetFit(idx: number[], y: ArrayLike<number>, v: ArrayLike<number>, cluster: ArrayLike<number>, request: MultilevelRequest) {
  return fitThreeLevel({ y: idx.map((i) => y[i]), v: idx.map((i) => v[i]), cluster: idx.map((i) => cluster[i]) }, request);
}

const sensitivityRow = (label: string, studyId: number, year: number | null, f: MultilevelFit): SensitivityRow => ({
  label,
  studyId,
  year,
  k: f.model.k,
  estimate: f.estimate,
  ci_lower: f.ci_lower,
  ci_upper: f.ci_upper,
  p: f.p,
  tau2: f.model.sigma2_between + f.model.sigma2_within,
  I2: f.model.I2_between + f.model.I2_within,
});

export interface PaperInfo {
  id: number;
  label: string;
  year: number | null;
  firstStudyId: number;
}

/** Why refits per paper are not run here, or null when they are. */
export function refitRefusal(papers: number, effects: number): string | null {
  if (papers > MULTILEVEL_REFIT_MAX_PAPERS) return `refits the three-level model once per paper; not run for more than ${MULTILEVEL_REFIT_MAX_PAPERS} papers (${papers} here)`;
  if (papers * effects > MULTILEVEL_REFIT_MAX_WORK) return `refits the three-level model once per paper; not run for ${papers} papers × ${effects} effects (more than ${MULTILEVEL_REFIT_MAX_WORK.toLocaleString('en')})`;
  return null;
}

/** Leave-one-paper-out: the model refitted without each paper in turn (needs 3 papers). */
export function leaveOnePaperOut(papers: PaperInfo[], byPaper: Map<number, number[]>, y: ArrayLike<number>, v: ArrayLike<number>, cluster: ArrayLike<number>, request: MultilevelRequest): SensitivityRow[] {
  const all = papers.flatMap((p) => byPaper.get(p.id)!);
  return papers.map((p) => {
    const out = new Set(byPaper.get(p.id));
    return sensitivityRow(p.label, p.firstStudyId, p.year, subsetFit(all.filter((i) => !out.has(i)), y, v, cluster, request));
  });
}

/**
 * The first cumulative row: one paper cannot separate σ²_between from σ²_within, so its effects are pooled by
 * REML random effects among themselves (a single effect stands as it is, tau² null).
 */
function onePaperRow(p: PaperInfo, idx: number[], y: ArrayLike<number>, v: ArrayLike<number>, request: MultilevelRequest): SensitivityRow {
  const level = request.level ?? 0.95;
  if (idx.length === 1) {
    const half = normalQuantileUpper((1 - level) / 2) * Math.sqrt(v[idx[0]]);
    const e = y[idx[0]];
    return { label: p.label, studyId: p.firstStudyId, year: p.year, k: 1, estimate: e, ci_lower: e - half, ci_upper: e + half, p: normalTwoTailed(e / Math.sqrt(v[idx[0]])), tau2: null, I2: null };
  }
  const f = pool({ effects: idx.map((i) => y[i]), variances: idx.map((i) => v[i]), method: 'REML', hksj: request.hksj, level });
  return { label: p.label, studyId: p.firstStudyId, year: p.year, k: f.k, estimate: f.estimate, ci_lower: f.ci_lower, ci_upper: f.ci_upper, p: f.p, tau2: f.tau2, I2: f.I2 };
}

/** Cumulative by paper year: each row fits every paper up to this one; the first paper alone as onePaperRow says. */
export function cumulativeByPaper(papers: PaperInfo[], byPaper: Map<number, number[]>, y: ArrayLike<number>, v: ArrayLike<number>, cluster: ArrayLike<number>, request: MultilevelRequest): SensitivityRow[] {
  const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
  const ordered = [...papers].sort((a, b) => (a.year ?? 9999) - (b.year ?? 9999) || cmp(a.label, b.label));
  const idx: number[] = [];
  const rows: SensitivityRow[] = [];
  ordered.forEach((p, m) => {
    idx.push(...byPaper.get(p.id)!);
    rows.push(m === 0 ? onePaperRow(p, idx, y, v, request) : sensitivityRow(p.label, p.firstStudyId, p.year, subsetFit(idx, y, v, cluster, request)));
  });
  return rows;
}

/**
 * Subgroups under the three-level model: a separate fit in each subgroup (its own σ²), compared with the Wald
 * Q between the subgroup estimates, Σ w_g(μ̂_g − μ̄)² with w_g = 1/SE_g², on G − 1 df. A subgroup the model
 * cannot fit (fewer than 2 papers) is left out and named in `skipped`.
 */
export function multilevelSubgroups(
  variable: SubgroupVariable,
  groupOf: string[],
  labelOf: (value: string) => string,
  y: ArrayLike<number>,
  v: ArrayLike<number>,
  cluster: ArrayLike<number>,
  request: MultilevelRequest,
): { comparison: SubgroupComparison; skipped: Array<{ value: string; reason: string }> } {
  const members = new Map<string, number[]>();
  groupOf.forEach((g, i) => {
    const m = members.get(g);
    if (m) m.push(i);
    else members.set(g, [i]);
  });
  const groups: SubgroupResult[] = [];
  const skipped: Array<{ value: string; reason: string }> = [];
  for (const [value, idx] of members) {
    try {
      const f = subsetFit(idx, y, v, cluster, request);
      groups.push({ value, label: labelOf(value), k: f.model.k, estimate: f.estimate, se: f.se, ci_lower: f.ci_lower, ci_upper: f.ci_upper, tau2: f.model.sigma2_between + f.model.sigma2_within, I2: f.model.I2_between + f.model.I2_within, p: f.p });
    } catch (err) {
      skipped.push({ value, reason: (err as Error).message });
    }
  }
  let Q: number | null = null;
  let df: number | null = null;
  let p: number | null = null;
  if (groups.length >= 2) {
    let sw = 0, swy = 0;
    for (const g of groups) {
      sw += 1 / (g.se * g.se);
      swy += g.estimate / (g.se * g.se);
    }
    const mean = swy / sw;
    Q = groups.reduce((a, g) => a + (g.estimate - mean) ** 2 / (g.se * g.se), 0);
    df = groups.length - 1;
    p = chiSquareUpperTail(Q, df);
  }
  return { comparison: { variable, groups, Q_between: Q, df, p }, skipped };
}

/** Rows for the result table and forest plot: one per effect, labelled under its paper. */
export function effectRow(e: SettledEffect, position: number, weight: number): PooledRow {
  return {
    studyId: e.studyId,
    referenceId: e.referenceId,
    label: `${e.referenceLabel}${e.studyLabel ? ` · ${e.studyLabel}` : ''} · effect ${position}`,
    paper: e.referenceLabel,
    effect: e.effect,
    variance: e.variance,
    year: e.year,
    n: e.n,
    effectIds: [e.id],
    weight,
  };
}
