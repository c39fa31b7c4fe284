// The synthesis pipeline's analyses (runSynthesis, one effect per study) against R metafor (Debian's r-cran-metafor)
// on metafor's bundled published data sets, carried in as settled effects:
//   - the meta-regression on several moderators vs rma(yi, vi, mods = ~ x1 + x2 [+ factor(g)], method, test = "z"/"knha");
//   - subgroups with one shared τ² vs rma(mods = ~ factor(g)) (the between test) and ~ factor(g) − 1 (each subgroup);
//   - τ² and I² by each estimator vs rma(method = m) ($tau2, $I2, $H2, confint()'s Q-profile τ² interval);
//   - I² of the leave-one-out and cumulative rows under the chosen estimator vs leave1out() / cumul();
//   - Begg's test vs ranktest(exact = TRUE).
// Columns a data set lacks in our vocabulary are carried in the nearest slot, named beside each case.
// Tolerances: 1e-9 relative for FE and DL (closed form), 1e-6 for REML and PM (iterative; metafor's thresholds 1e-12).
import { beforeAll, describe, expect, it } from 'vitest';
import { runSynthesis } from '../../shared/synthesis/run.js';
import { estimatorI2 } from '../../shared/synthesis/analyses.js';
import { synthesisRequestSchema, type RegressionModerator, type SynthesisRequestInput } from '../../shared/schemas/synthesis.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';
import { Agreement, CLOSED, ITERATIVE, report, runRSource } from './r-reference.js';

const METHODS = ['FE', 'DL', 'REML', 'PM'] as const;
type M = (typeof METHODS)[number];
const TESTS = ['z', 'knha'] as const;
const tolerance = (m: M) => (m === 'FE' || m === 'DL' ? CLOSED : ITERATIVE);

interface Fit {
  b: number[]; se: number[]; stat: number[]; p: number[]; ci_lb: number[]; ci_ub: number[];
  tau2: number; QM: number; QMp: number; QE: number; QEp: number; R2: number | null; I2: number | null; H2: number | null;
  tau2_lb: number | null; tau2_ub: number | null;
}
interface Rows { I2: number[] }
interface DataSet {
  name: string;
  /** what each of our columns holds */
  yi: number[]; vi: number[]; year: number[]; ms: number[]; g: string[]; h: string[];
  /** per "<method> <test>": the plain model, each moderator formula, the factor model and its cells */
  fits: Record<string, { plain: Fit; mods: Fit[]; factor: Fit; cells: Fit; l1o: Rows; cumul: Rows }>;
  formulas: string[];
  rank: { tau: number; p: number };
  rank_normal: { tau: number; p: number };
}

/** Our moderators for each R formula (ms, year, g and h as the data set's columns below say). */
const OURS: Record<string, RegressionModerator[]> = {
  '~ ms + year': ['standardMs', 'year'],
  '~ ms + factor(g)': ['standardMs', 'design'],
  '~ year + factor(g)': ['year', 'design'],
  '~ ms + factor(g) + factor(h)': ['standardMs', 'design', 'modality'],
};

let sets: DataSet[];

beforeAll(() => {
  sets = runRSource<{ sets: DataSet[] }>(`
ctl <- list(threshold = 1e-12, tol = 1e-12, maxiter = 10000)
num <- function(x) if (is.null(x)) NA else x
info <- function(res) {
  ci <- if (res$method == "FE") NULL else tryCatch(confint(res, control = ctl)$random, error = function(e) NULL)
  list(b = I(as.numeric(res$beta)), se = I(res$se), stat = I(res$zval), p = I(res$pval), ci_lb = I(res$ci.lb), ci_ub = I(res$ci.ub),
    tau2 = res$tau2, QM = res$QM, QMp = res$QMp, QE = res$QE, QEp = res$QEp, R2 = num(res$R2), I2 = num(res$I2), H2 = num(res$H2),
    tau2_lb = if (is.null(ci)) NA else ci["tau^2", "ci.lb"], tau2_ub = if (is.null(ci)) NA else ci["tau^2", "ci.ub"])
}
one <- function(name, d, formulas) {
  fits <- list()
  for (m in c("FE", "DL", "REML", "PM")) for (t in c("z", "knha")) {
    f <- function(mods = NULL) suppressWarnings(if (is.null(mods)) rma(yi, vi, data = d, method = m, test = t, control = ctl)
      else rma(yi, vi, mods = as.formula(mods), data = d, method = m, test = t, control = ctl))
    plain <- f()
    cu <- suppressWarnings(cumul(plain, order = d$year * 1000 + seq_len(nrow(d))))
    fits[[paste(m, t)]] <- list(plain = info(plain), mods = lapply(formulas, function(x) info(f(x))),
      factor = info(f("~ factor(g)")), cells = info(f("~ factor(g) - 1")),
      l1o = list(I2 = I(as.numeric(suppressWarnings(leave1out(plain))$I2))), cumul = list(I2 = I(as.numeric(cu$I2))))
  }
  rk <- suppressWarnings(ranktest(rma(yi, vi, data = d, method = "FE"), exact = TRUE))
  rn <- suppressWarnings(ranktest(rma(yi, vi, data = d, method = "FE"), exact = FALSE))
  list(name = name, yi = I(d$yi), vi = I(d$vi), year = I(d$year), ms = I(d$ms), g = I(as.character(d$g)), h = I(as.character(d$h)),
    fits = fits, formulas = I(formulas),
    rank = list(tau = as.numeric(rk$tau), p = rk$pval), rank_normal = list(tau = as.numeric(rn$tau), p = rn$pval))
}
bcg <- escalc("RR", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = dat.bcg)
bcg <- data.frame(yi = bcg$yi, vi = bcg$vi, year = bcg$year, ms = bcg$ablat, g = bcg$alloc, h = bcg$alloc, label = sprintf("%02d", bcg$trial))
hack <- dat.hackshaw1998
hack <- data.frame(yi = hack$yi, vi = hack$vi, year = hack$year, ms = hack$year, g = hack$design, h = hack$country, label = sprintf("%02d", hack$study))
raud <- dat.raudenbush1985
raud <- data.frame(yi = raud$yi, vi = raud$vi, year = raud$year, ms = raud$weeks, g = raud$setting, h = raud$tester, label = sprintf("%02d", raud$study))
cat(to_json(list(sets = list(
  one("dat.bcg (Colditz et al. 1994): log risk ratio; ablat as standardMs, allocation as design", bcg, c("~ ms + year", "~ ms + factor(g)")),
  one("dat.hackshaw1998 (Hackshaw et al. 1998): log odds ratio; study design as design", hack, c("~ year + factor(g)")),
  one("dat.raudenbush1985 (Raudenbush 1984): SMD; weeks as standardMs, setting as design, tester as modality", raud, c("~ ms + factor(g)", "~ ms + factor(g) + factor(h)"))
))))
`).sets;
}, 400_000);

/** Each row of a data set as one settled effect of its own study and reference (labels sort as R's order(year, label)). */
function settled(s: DataSet): SettledEffect[] {
  return s.yi.map((effect, i) => ({
    id: i + 1, referenceId: i + 1, studyId: i + 1, studyLabel: 'Exp. 1', referenceLabel: String(i + 1).padStart(2, '0'), year: s.year[i],
    outcome: 'duration_distortion', manipulation: 'luminance', metric: 'g_s', effect, variance: s.vi[i], n: 20,
    design: s.g[i], population: 'healthy_adults', modality: s.h[i], task: 'reproduction', standardMs: s.ms[i],
  }));
}
const run = (s: DataSet, extra: SynthesisRequestInput) => runSynthesis(settled(s), synthesisRequestSchema.parse({ dependence: { mode: 'one' }, ...extra }));
const tau2Scale = (s: DataSet) => Math.min(...s.vi);

describe('several moderators at once (runSynthesis) against rma(mods = ..., test = "z"/"knha")', () => {
  it('every coefficient, SE, statistic, p and CI; residual τ², QM (F under knha) and its p, QE, R²', () => {
    const a = new Agreement();
    let fits = 0;
    for (const s of sets)
      s.formulas.forEach((formula, f) => {
        for (const method of METHODS)
          for (const test of TESTS) {
            const out = run(s, { method, hksj: test === 'knha', moderators: OURS[formula] });
            const reg = out.regression!;
            const ref = s.fits[`${method} ${test}`].mods[f];
            const tol = tolerance(method);
            const at = `${s.name} ${formula} ${method} ${test}`;
            expect(reg, at).toBeTruthy();
            expect(reg.terms.length, at).toBe(ref.b.length);
            expect(reg.QM_test, at).toBe(test === 'knha' ? 'F' : 'chisq');
            reg.terms.forEach((t, j) => {
              a.check(`${at} b[${j}]`, t.estimate, ref.b[j], tol);
              a.check(`${at} se[${j}]`, t.se, ref.se[j], tol);
              a.check(`${at} stat[${j}]`, t.statistic, ref.stat[j], tol);
              a.check(`${at} p[${j}]`, t.p, ref.p[j], tol);
              a.check(`${at} ci_lb[${j}]`, t.ci_lower, ref.ci_lb[j], tol);
              a.check(`${at} ci_ub[${j}]`, t.ci_upper, ref.ci_ub[j], tol);
              if (test === 'knha') expect(t.df, at).toBe(s.yi.length - ref.b.length);
            });
            a.check(`${at} QM`, reg.QM, ref.QM, tol);
            a.check(`${at} QMp`, reg.QM_p, ref.QMp, tol);
            a.check(`${at} QE`, reg.QE, ref.QE, CLOSED);
            a.check(`${at} QEp`, reg.QE_p, ref.QEp, CLOSED);
            if (method !== 'FE') {
              a.check(`${at} tau2`, reg.tau2, ref.tau2, tol, tau2Scale(s));
              a.check(`${at} R2`, reg.R2 === null ? null : 100 * reg.R2, ref.R2, tol, 1e-4);
            }
            fits++;
          }
      });
    report('synthesis: several moderators vs rma(mods)', a);
    expect(fits).toBe(5 * 8);
    expect(a.errors).toEqual([]);
  });
});

describe('subgroups with one shared τ² (runSynthesis) against rma(mods = ~ factor(g))', () => {
  it('the between test (χ², or F under knha), its p, the shared τ², each subgroup estimate, SE and CI', () => {
    const a = new Agreement();
    for (const s of sets)
      for (const method of METHODS)
        for (const test of TESTS) {
          const out = run(s, { method, hksj: test === 'knha', subgroup: 'design', subgroupTau2: 'pooled' });
          const sub = out.subgroups!;
          const ref = s.fits[`${method} ${test}`];
          const tol = tolerance(method);
          const at = `${s.name} ${method} ${test}`;
          expect(sub.tau2Model, at).toBe('pooled');
          expect(sub.test, at).toBe(test === 'knha' ? 'F' : 'chisq');
          a.check(`${at} between`, sub.Q_between, ref.factor.QM, tol);
          a.check(`${at} between p`, sub.p, ref.factor.QMp, tol);
          if (method !== 'FE') a.check(`${at} shared tau2`, sub.tau2_pooled, ref.factor.tau2, tol, tau2Scale(s));
          const levels = [...new Set(s.g)].sort();
          levels.forEach((level, j) => {
            const g = sub.groups.find((x) => x.value === level)!;
            a.check(`${at} ${level} estimate`, g.estimate, ref.cells.b[j], tol);
            a.check(`${at} ${level} se`, g.se, ref.cells.se[j], tol);
            a.check(`${at} ${level} ci_lower`, g.ci_lower, ref.cells.ci_lb[j], tol);
            a.check(`${at} ${level} ci_upper`, g.ci_upper, ref.cells.ci_ub[j], tol);
          });
        }
    report('synthesis: subgroups with one τ² vs rma(~ factor)', a);
    expect(a.errors).toEqual([]);
  });
});

describe('τ² and I² by each estimator, and the I² of every refit row, against rma, leave1out and cumul', () => {
  it('each estimator its own τ² (with its Q-profile interval), I² and H²; the rows carry the chosen estimator’s I²', () => {
    const a = new Agreement();
    for (const s of sets)
      for (const test of TESTS) {
        const chosen = run(s, { method: 'DL', hksj: test === 'knha' });
        expect(chosen.estimators!.map((e) => e.method)).toEqual(['FE', 'DL', 'REML', 'PM']);
        for (const e of chosen.estimators!) {
          const ref = s.fits[`${e.method} ${test}`].plain;
          const tol = tolerance(e.method);
          const at = `${s.name} ${e.method} ${test}`;
          a.check(`${at} estimate`, e.estimate, ref.b[0], tol);
          a.check(`${at} ci_lower`, e.ci_lower, ref.ci_lb[0], tol);
          a.check(`${at} I2`, e.I2, ref.I2, tol, 1);
          a.check(`${at} H2`, e.H2, ref.H2, tol);
          if (e.method !== 'FE') {
            a.check(`${at} tau2`, e.tau2, ref.tau2, tol, tau2Scale(s));
            a.check(`${at} tau2 lower`, e.tau2_ci_lower, ref.tau2_lb, ITERATIVE, tau2Scale(s));
            a.check(`${at} tau2 upper`, e.tau2_ci_upper, ref.tau2_ub, ITERATIVE, tau2Scale(s));
          }
        }
        for (const method of METHODS) {
          const out = method === 'DL' ? chosen : run(s, { method, hksj: test === 'knha' });
          const ref = s.fits[`${method} ${test}`];
          const tol = tolerance(method);
          const at = `${s.name} ${method} ${test}`;
          a.check(`${at} pooled I2`, estimatorI2(method, out.result), ref.plain.I2, tol, 1);
          out.leaveOneOut!.forEach((r, i) => a.check(`${at} leave-one-out[${i}] I2`, estimatorI2(method, r), ref.l1o.I2[r.studyId - 1], tol, 1));
          out.cumulative!.slice(1).forEach((r, i) => a.check(`${at} cumulative[${i + 1}] I2`, estimatorI2(method, r), ref.cumul.I2[i + 1], tol, 1));
        }
      }
    report('synthesis: I² by estimator and in refit rows', a);
    expect(a.errors).toEqual([]);
  });
});

describe("Begg's test (runSynthesis) against ranktest(exact = TRUE), or exact = FALSE with ties", () => {
  it("Kendall's τ and the p: exact for k ≤ 50 without ties, the normal approximation with ties (dat.raudenbush1985 has tied variances)", () => {
    const a = new Agreement();
    let exact = 0;
    for (const s of sets) {
      const b = run(s, {}).begg!;
      const ties = new Set(s.vi).size < s.vi.length;
      expect(b.p_method, s.name).toBe(ties ? 'normal' : 'exact');
      if (!ties) exact++;
      const ref = ties ? s.rank_normal : s.rank;
      a.check(`${s.name} tau`, b.tau, ref.tau, CLOSED);
      a.check(`${s.name} p (${b.p_method})`, b.p, ref.p, CLOSED);
    }
    expect(exact).toBeGreaterThanOrEqual(2);
    report('synthesis: Begg vs ranktest', a);
    expect(a.errors).toEqual([]);
  });
});
