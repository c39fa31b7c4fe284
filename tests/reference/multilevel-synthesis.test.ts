// The synthesis pipeline under dependence { mode: "multilevel" } against R: metafor's rma.mv(yi, vi, random = ~ 1 |
// paper/effect, method = "REML") and clubSandwich's coef_test / conf_int (CR2, Satterthwaite) refitted in R for the
// whole set, without each paper (leave-one-paper-out), over the papers up to each (cumulative by paper year), in
// each subgroup and with a moderator; and, for dependence { mode: "aggregate" }, the sensitivity table over r
// against aggregate.escalc (struct = "CS") + rma(method = "DL"). Invented settled effects (seeded): 14 papers with
// 1–3 studies and 1–3 effects each. metafor's σ² are polished to the REML optimum (multilevel_polish.R); tolerance 1e-6.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { runSynthesis } from '../../shared/synthesis/run.js';
import { synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import type { SettledEffect, SensitivityRow } from '../../shared/synthesis/types.js';
import { rStrings, rVector, runRSource } from './r-reference.js';
import { relErr } from './python-reference.js';
import { gaussian, mulberry32 } from '../support/random.js';

const TOL = 1e-6;
const POLISH = path.join(path.dirname(fileURLToPath(import.meta.url)), 'multilevel_polish.R');

function invented(): SettledEffect[] {
  const rnd = mulberry32(2718);
  const z = gaussian(rnd);
  const out: SettledEffect[] = [];
  let id = 1;
  let studyId = 100;
  for (let p = 1; p <= 14; p++) {
    const u = Math.sqrt(0.05) * z();
    const year = 2000 + Math.floor(20 * rnd());
    const studies = 1 + Math.floor(3 * rnd());
    for (let s = 0; s < studies; s++, studyId++) {
      const task = rnd() < 0.5 ? 'reproduction' : 'bisection';
      const standardMs = 200 + 100 * Math.floor(10 * rnd());
      const n = 1 + Math.floor(3 * rnd());
      for (let e = 0; e < n; e++) {
        const variance = 0.01 + 0.12 * rnd();
        out.push({
          id: id++, referenceId: p, studyId, studyLabel: `Exp. ${s + 1}`, referenceLabel: `Invented ${p} (${year})`, year,
          outcome: 'duration_distortion', manipulation: 'luminance', metric: 'g_s', effect: 0.25 + 0.0004 * (standardMs - 600) + u + Math.sqrt(variance + 0.02) * z(),
          variance, n: 20, design: 'within', population: 'healthy_adults', modality: 'visual', task, standardMs,
        });
      }
    }
  }
  return out;
}

interface Fit { b: number[]; se: number[]; ci_lb: number[]; ci_ub: number[]; p: number[]; rb: number[]; rse: number[]; rdf: number[]; rp: number[]; rci_lb: number[]; rci_ub: number[]; sigma2: number[] }
interface Ref { all: Fit; l1o: Fit[]; cumul: Fit[]; groups: Record<string, Fit>; reg: Fit; agg: AggRow[]; aggw: AggRow[] }
interface AggRow { b: number; ci_lb: number; ci_ub: number; tau2: number }

function reference(effects: SettledEffect[], l1oOrder: number[], cumulOrder: number[]): Ref {
  return runRSource<Ref>(`
suppressPackageStartupMessages(library(clubSandwich))
dat <- data.frame(yi = ${rVector(effects.map((e) => e.effect))}, vi = ${rVector(effects.map((e) => e.variance))},
  paper = ${rVector(effects.map((e) => e.referenceId))}, study = ${rVector(effects.map((e) => e.studyId))},
  task = ${rStrings(effects.map((e) => e.task!))}, ms = ${rVector(effects.map((e) => e.standardMs!))})
dat$effect <- seq_len(nrow(dat))
source(${JSON.stringify(POLISH)})
fit <- function(d, mods = ~ 1) {
  d$paper <- factor(d$paper, levels = unique(d$paper))
  free <- rma.mv(yi, vi, mods = mods, random = ~ 1 | paper / effect, data = d, method = "REML")
  s2 <- polish(d$yi, d$vi, model.matrix(free), d$paper, free$sigma2)
  m <- rma.mv(yi, vi, mods = mods, random = ~ 1 | paper / effect, data = d, method = "REML", sigma2 = s2)
  vc <- vcovCR(m, cluster = d$paper, type = "CR2")
  ct <- coef_test(m, vcov = vc, test = "Satterthwaite")
  ci <- conf_int(m, vcov = vc, test = "Satterthwaite")
  list(b = I(as.vector(m$b)), se = I(m$se), ci_lb = I(m$ci.lb), ci_ub = I(m$ci.ub), p = I(m$pval), sigma2 = I(m$sigma2),
       rb = I(ct$beta), rse = I(ct$SE), rdf = I(ct$df_Satt), rp = I(ct$p_Satt), rci_lb = I(ci$CI_L), rci_ub = I(ci$CI_U))
}
l1o <- lapply(${rVector(l1oOrder)}, function(p) fit(dat[dat$paper != p, ]))
cumul <- lapply(seq_along(${rVector(cumulOrder)})[-1], function(m) fit(dat[dat$paper %in% ${rVector(cumulOrder)}[1:m], ]))
groups <- lapply(split(dat, dat$task), fit)
reg <- fit(dat, ~ ms)
agg_at <- function(weighted) lapply(c(0, 0.2, 0.4, 0.6, 0.8, 0.9), function(r) {
  a <- aggregate(escalc(measure = "GEN", yi = yi, vi = vi, data = dat), cluster = study, struct = "CS", rho = r, weighted = weighted)
  m <- rma(yi, vi, data = a, method = "DL")
  list(b = as.vector(m$b), ci_lb = m$ci.lb, ci_ub = m$ci.ub, tau2 = m$tau2)
})
cat(to_json(list(all = fit(dat), l1o = l1o, cumul = cumul, groups = groups, reg = reg, agg = agg_at(FALSE), aggw = agg_at(TRUE))))
`);
}

const request = (over: Record<string, unknown>) => synthesisRequestSchema.parse({ filters: { manipulation: 'luminance' }, ...over });

function worstRow(ours: SensitivityRow[], theirs: Fit[]): number {
  expect(ours.length).toBe(theirs.length);
  return Math.max(
    ...ours.flatMap((r, i) => [relErr(r.estimate, theirs[i].rb[0], theirs[i].rse[0]), relErr(r.ci_lower, theirs[i].rci_lb[0], theirs[i].rse[0]), relErr(r.ci_upper, theirs[i].rci_ub[0], theirs[i].rse[0]), relErr(r.p, theirs[i].rp[0], 1e-300)]),
  );
}

describe('a multilevel synthesis against metafor rma.mv and clubSandwich CR2', () => {
  const effects = invented();
  const out = runSynthesis(effects, request({ dependence: { mode: 'multilevel', robust: true } }));
  const papers = [...new Set(out.rows.map((r) => r.referenceId))];
  const cumulOrder = [...papers].sort((a, b) => {
    const pa = out.rows.find((r) => r.referenceId === a)!;
    const pb = out.rows.find((r) => r.referenceId === b)!;
    return (pa.year ?? 0) - (pb.year ?? 0) || (pa.paper! < pb.paper! ? -1 : 1);
  });
  const ref = reference(effects, papers, cumulOrder);

  it('pools every effect, clustered by paper, with the CR2 test (robust estimate, SE, df, CI, p) and the model fit', () => {
    expect(out.counts.effects).toBe(effects.length);
    expect(out.rows).toHaveLength(effects.length);
    expect(out.multilevel!.clusters).toBe(14);
    const r = out.result;
    const a = ref.all;
    expect(relErr(r.estimate, a.rb[0], a.rse[0])).toBeLessThan(TOL);
    expect(relErr(r.se, a.rse[0])).toBeLessThan(TOL);
    expect(relErr(r.statistic_df!, a.rdf[0])).toBeLessThan(TOL);
    expect(relErr(r.ci_lower, a.rci_lb[0], a.rse[0])).toBeLessThan(TOL);
    expect(relErr(r.ci_upper, a.rci_ub[0], a.rse[0])).toBeLessThan(TOL);
    expect(relErr(r.p, a.rp[0], 1e-300)).toBeLessThan(TOL);
    const m = out.multilevel!.model;
    expect(relErr(m.se, a.se[0])).toBeLessThan(TOL);
    expect(relErr(m.ci_lower, a.ci_lb[0], a.se[0])).toBeLessThan(TOL);
    expect(relErr(out.multilevel!.sigma2_between + out.multilevel!.sigma2_within, a.sigma2[0] + a.sigma2[1])).toBeLessThan(TOL);
    // the forest weights are the GLS weights: Σ wᵢyᵢ/100 is the estimate
    expect(relErr(out.rows.reduce((s, row) => s + (row.weight * row.effect) / 100, 0), r.estimate, a.se[0])).toBeLessThan(1e-9);
  });

  it('leave-one-paper-out and cumulative by paper year refit the model (robust) as metafor does on each subset', () => {
    expect(worstRow(out.leaveOneOut!, ref.l1o)).toBeLessThan(TOL);
    // the first row is the first paper alone (REML among its effects, tests/api/syntheses-multilevel); the rest refit the model
    expect(worstRow(out.cumulative!.slice(1), ref.cumul)).toBeLessThan(TOL);
  });

  it('subgroups fit the model in each subgroup, and meta-regression on standard duration gives the robust slope', () => {
    const sub = runSynthesis(effects, request({ dependence: { mode: 'multilevel', robust: true }, subgroup: 'task', moderator: 'standardMs' }));
    for (const g of sub.subgroups!.groups) {
      const t = ref.groups[g.value];
      expect(relErr(g.estimate, t.rb[0], t.rse[0])).toBeLessThan(TOL);
      expect(relErr(g.se, t.rse[0])).toBeLessThan(TOL);
      expect(relErr(g.ci_lower, t.rci_lb[0], t.rse[0])).toBeLessThan(TOL);
    }
    expect(sub.subgroups!.groups).toHaveLength(2);
    const mr = sub.metaRegression!;
    expect(relErr(mr.slope, ref.reg.rb[1], ref.reg.rse[1])).toBeLessThan(TOL);
    expect(relErr(mr.slope_se, ref.reg.rse[1])).toBeLessThan(TOL);
    expect(relErr(mr.slope_ci_lower, ref.reg.rci_lb[1], ref.reg.rse[1])).toBeLessThan(TOL);
    expect(relErr(mr.slope_p, ref.reg.rp[1], 1e-300)).toBeLessThan(TOL);
  });

  it('model-based (robust: false) gives rma.mv’s own z test', () => {
    const plain = runSynthesis(effects, request({ dependence: { mode: 'multilevel', robust: false } }));
    expect(plain.multilevel!.robustTest).toBeNull();
    expect(relErr(plain.result.se, ref.all.se[0])).toBeLessThan(TOL);
    expect(relErr(plain.result.ci_upper, ref.all.ci_ub[0], ref.all.se[0])).toBeLessThan(TOL);
    expect(relErr(plain.result.p, ref.all.p[0], 1e-300)).toBeLessThan(TOL);
  });

  for (const weighted of [false, true])
  it(`aggregate mode${weighted ? ', inverse-variance composite' : ''}: the sensitivity table over r = 0 … 0.9 matches aggregate.escalc (weighted = ${weighted ? 'TRUE' : 'FALSE'}) + rma (DL) at each r`, () => {
    const agg = runSynthesis(effects, request({ dependence: { mode: 'aggregate', r: 0.4, weighted } }));
    const rows = agg.correlationSensitivity!;
    expect(rows.map((r) => r.r)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 0.9]);
    rows.forEach((row, i) => {
      const t = (weighted ? ref.aggw : ref.agg)[i];
      expect(relErr(row.estimate, t.b, row.se)).toBeLessThan(1e-9);
      expect(relErr(row.ci_lower, t.ci_lb, row.se)).toBeLessThan(1e-9);
      expect(relErr(row.tau2!, t.tau2, 1e-12)).toBeLessThan(1e-9);
    });
    // the row at the chosen r is the analysis itself
    expect(rows[2].estimate).toBeCloseTo(agg.result.estimate, 12);
  });
});
