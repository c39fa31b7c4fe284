// pool(), metaRegression() and subgroups() against R metafor's rma() (Debian's r-cran-metafor) on metafor's
// bundled published data sets and an invented sheet: FE, DL, REML, PM, each with z tests and with
// test = "knha". Tolerances: 1e-9 relative for FE and DL (closed form), 1e-6 for REML and PM (iterative; metafor
// is run with its convergence thresholds tightened to 1e-12 so its own stopping error is far below that).
import { beforeAll, describe, expect, it } from 'vitest';
import { metaRegression, pool, subgroups, type Method } from '../../shared/stats/index.js';
import type { ModeratorColumn } from '../../shared/stats/index.js';
import { Agreement, CLOSED, ITERATIVE, report, rStrings, rVector, runRSource } from './r-reference.js';
import { gaussian, mulberry32 } from '../support/random.js';

const METHODS = ['FE', 'DL', 'REML', 'PM'] as const;
const TESTS = ['z', 'knha'] as const;
const tolerance = (m: Method) => (m === 'FE' || m === 'DL' ? CLOSED : ITERATIVE);

interface Fit {
  b: number[]; se: number[]; stat: number[]; p: number[]; ci_lb: number[]; ci_ub: number[];
  tau2: number; QM: number; QMp: number; QE: number; QEp: number; R2: number | null; I2: number | null; k: number;
}
interface Case {
  name: string;
  d: Record<string, (number | string)[]>;
  pooled: Record<string, Fit>;
  mods: { formula: string; fits: Record<string, Fit> }[];
  subgroup: string | null;
  sub: Record<string, { pooled: Fit; cells: Fit; separate: { levels: string[]; b: number[]; se: number[]; tau2: number[]; Qb: number; Qbp: number } }> | null;
}

/** An invented sheet: standard duration (ms), year and modality as moderators of a duration-distortion effect. */
function inventedSheet() {
  const rnd = mulberry32(31);
  const z = gaussian(rnd);
  const k = 40;
  const standard = Array.from({ length: k }, () => [300, 500, 800, 1200, 2000][Math.floor(rnd() * 5)]);
  const year = Array.from({ length: k }, () => 1995 + Math.floor(rnd() * 28));
  const modality = Array.from({ length: k }, () => ['auditory', 'tactile', 'visual'][Math.floor(rnd() * 3)]);
  const vi = Array.from({ length: k }, () => 0.01 + 0.08 * rnd());
  const yi = vi.map((v, i) => 0.1 + 0.0001 * standard[i] + (modality[i] === 'visual' ? 0.15 : 0) + Math.sqrt(v + 0.02) * z());
  return { yi, vi, standard_ms: standard, year, modality };
}

const invented = inventedSheet();
let cases: Case[];

beforeAll(() => {
  cases = runRSource<{ cases: Case[] }>(`
ctl <- list(threshold = 1e-12, tol = 1e-12, maxiter = 10000)
info <- function(res) list(b = I(as.numeric(res$beta)), se = I(res$se), stat = I(res$zval), p = I(res$pval),
  ci_lb = I(res$ci.lb), ci_ub = I(res$ci.ub), tau2 = res$tau2, QM = res$QM, QMp = res$QMp, QE = res$QE, QEp = res$QEp,
  R2 = if (is.null(res$R2)) NA else res$R2, I2 = if (is.null(res$I2)) NA else res$I2, k = res$k)
fits <- function(d, mods) {
  out <- list()
  for (m in c("FE", "DL", "REML", "PM")) for (t in c("z", "knha")) {
    res <- suppressWarnings(if (is.null(mods)) rma(yi, vi, data = d, method = m, test = t, control = ctl)
      else rma(yi, vi, mods = as.formula(mods), data = d, method = m, test = t, control = ctl))
    out[[paste(m, t)]] <- info(res)
  }
  out
}
subs <- function(d, g) {
  out <- list()
  d$g <- d[[g]]
  lv <- sort(unique(as.character(d$g)))
  for (m in c("FE", "DL", "REML", "PM")) for (t in c("z", "knha")) {
    pooled <- suppressWarnings(rma(yi, vi, mods = ~ factor(g), data = d, method = m, test = t, control = ctl))
    cells <- suppressWarnings(rma(yi, vi, mods = ~ factor(g) - 1, data = d, method = m, test = t, control = ctl))
    sep <- lapply(lv, function(l) suppressWarnings(rma(yi, vi, data = d, subset = g == l, method = m, test = t, control = ctl)))
    b <- sapply(sep, function(r) as.numeric(r$beta)); se <- sapply(sep, function(r) r$se)
    qb <- rma(b, sei = se, method = "FE")
    out[[paste(m, t)]] <- list(pooled = info(pooled), cells = info(cells),
      separate = list(levels = I(lv), b = I(b), se = I(se), tau2 = I(sapply(sep, function(r) r$tau2)), Qb = qb$QE, Qbp = qb$QEp))
  }
  out
}
mk <- function(name, d, mods, subgroup = NULL) {
  d <- as.data.frame(d)
  list(name = name, d = d, pooled = fits(d, NULL), mods = lapply(mods, function(f) list(formula = f, fits = fits(d, f))),
    subgroup = subgroup, sub = if (is.null(subgroup)) NULL else subs(d, subgroup))
}
bcg <- escalc("RR", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = dat.bcg)
normand <- escalc("SMD", m1i = m1i, sd1i = sd1i, n1i = n1i, m2i = m2i, sd2i = sd2i, n2i = n2i, data = dat.normand1999)
molloy <- escalc("ZCOR", ri = ri, ni = ni, data = dat.molloy2014)
inv <- data.frame(yi = ${rVector(invented.yi)}, vi = ${rVector(invented.vi)}, standard_ms = ${rVector(invented.standard_ms)},
  year = ${rVector(invented.year)}, modality = ${rStrings(invented.modality)}, stringsAsFactors = FALSE)
cat(to_json(list(cases = list(
  mk("dat.bcg (Colditz et al. 1994), log risk ratio", data.frame(yi = bcg$yi, vi = bcg$vi, ablat = bcg$ablat, year = bcg$year, alloc = bcg$alloc),
     c("~ ablat", "~ ablat + year", "~ alloc + ablat"), "alloc"),
  mk("dat.raudenbush1985 (Raudenbush 1984, teacher expectancy)", dat.raudenbush1985[, c("yi", "vi", "weeks", "setting", "tester")],
     c("~ weeks", "~ weeks + setting + tester"), "tester"),
  mk("dat.bangertdrowns2004 (Bangert-Drowns et al. 2004, writing-to-learn)", na.omit(dat.bangertdrowns2004[, c("yi", "vi", "length", "imag", "meta")]),
     c("~ length", "~ length + imag + meta")),
  mk("dat.hackshaw1998 (Hackshaw et al. 1998, passive smoking), log odds ratio", dat.hackshaw1998[, c("yi", "vi", "year", "design")],
     c("~ year", "~ design + year"), "design"),
  mk("dat.molloy2014 (Molloy et al. 2014), Fisher's z", data.frame(yi = molloy$yi, vi = molloy$vi, quality = molloy$quality, design = molloy$design),
     c("~ quality", "~ design + quality"), "design"),
  mk("dat.normand1999 (Normand 1999), SMD", data.frame(yi = normand$yi, vi = normand$vi), character(0)),
  mk("invented sheet (k = 40)", inv, c("~ standard_ms", "~ standard_ms + year + modality"), "modality")
))))
`).cases;
}, 180_000);

const terms = (formula: string) => formula.replace('~', '').split('+').map((t) => t.trim());
const column = (c: Case, name: string): ModeratorColumn => ({ name, values: c.d[name] as number[] | string[] });
const tau2Scale = (c: Case) => Math.min(...(c.d.vi as number[]));
const pick = (c: Case) => ({ effects: c.d.yi as number[], variances: c.d.vi as number[] });

describe('rma (metafor) without moderators against pool()', () => {
  it('estimate, SE, CI, p, τ², Q and I² (τ²-based for REML and PM) on every data set', () => {
    const a = new Agreement();
    for (const c of cases)
      for (const method of METHODS)
        for (const test of TESTS) {
          const ref = c.pooled[`${method} ${test}`];
          const r = pool({ ...pick(c), method, hksj: test === 'knha' });
          const tol = tolerance(method);
          const at = `${c.name} ${method} ${test}`;
          a.check(`${at} estimate`, r.estimate, ref.b[0], tol);
          a.check(`${at} se`, r.se, ref.se[0], tol);
          a.check(`${at} statistic`, r.statistic, ref.stat[0], tol);
          a.check(`${at} p`, r.p, ref.p[0], tol);
          a.check(`${at} ci_lower`, r.ci_lower, ref.ci_lb[0], tol);
          a.check(`${at} ci_upper`, r.ci_upper, ref.ci_ub[0], tol);
          a.check(`${at} Q`, r.Q, ref.QE, CLOSED);
          if (method !== 'FE') a.check(`${at} tau2`, r.tau2, ref.tau2, tol, tau2Scale(c)); // τ² near 0 on the scale of the smallest within-study variance
          a.check(`${at} I2`, method === 'REML' || method === 'PM' ? r.I2_tau : r.I2, ref.I2, tol, 1); // percent: near 0 on the scale of one point
        }
    report('rma (no moderators) vs pool', a);
    expect(a.compared).toBeGreaterThan(400);
    expect(a.errors).toEqual([]);
  });
});

describe('rma (metafor) with mods, one and several, z and knha, against metaRegression()', () => {
  it('coefficients, SEs, statistics, p, CIs, residual τ², QM (F under knha), QE and R²', () => {
    const a = new Agreement();
    let several = 0;
    for (const c of cases)
      for (const m of c.mods) {
        const names = terms(m.formula);
        if (names.length > 1) several++;
        for (const method of METHODS)
          for (const test of TESTS) {
            const ref = m.fits[`${method} ${test}`];
            const r = metaRegression({ ...pick(c), moderators: names.map((n) => column(c, n)), method, hksj: test === 'knha' });
            const tol = tolerance(method);
            const at = `${c.name} ${m.formula} ${method} ${test}`;
            expect(r.coefficients.length, at).toBe(ref.b.length);
            r.coefficients.forEach((co, j) => {
              a.check(`${at} b[${j}]`, co.estimate, ref.b[j], tol);
              a.check(`${at} se[${j}]`, co.se, ref.se[j], tol);
              a.check(`${at} stat[${j}]`, co.statistic, ref.stat[j], tol);
              a.check(`${at} p[${j}]`, co.p, ref.p[j], tol);
              a.check(`${at} ci_lb[${j}]`, co.ci_lower, ref.ci_lb[j], tol);
              a.check(`${at} ci_ub[${j}]`, co.ci_upper, ref.ci_ub[j], tol);
            });
            if (method !== 'FE') a.check(`${at} tau2`, r.tau2, ref.tau2, tol, tau2Scale(c)); // τ² near 0 on the scale of the smallest within-study variance
            a.check(`${at} QM`, r.QM, ref.QM, tol);
            a.check(`${at} QMp`, r.QM_p, ref.QMp, tol);
            a.check(`${at} QE`, r.QE, ref.QE, CLOSED);
            a.check(`${at} QEp`, r.QE_p, ref.QEp, CLOSED);
            if (method !== 'FE') a.check(`${at} R2`, r.R2 === null ? null : 100 * r.R2, ref.R2, tol, 1e-4);
          }
      }
    report('rma with mods vs metaRegression', a);
    expect(several).toBeGreaterThanOrEqual(5);
    expect(a.errors).toEqual([]);
  });
});

describe('subgroups against rma (metafor): one pooled τ² (mods = ~ factor) and separate τ² (subset fits)', () => {
  it('between test, τ², and each subgroup estimate and SE', () => {
    const a = new Agreement();
    let n = 0;
    for (const c of cases) {
      if (!c.subgroup || !c.sub) continue;
      const groups = (c.d[c.subgroup] as string[]).map(String);
      for (const method of METHODS)
        for (const test of TESTS) {
          const ref = c.sub[`${method} ${test}`];
          const tol = tolerance(method);
          const at = `${c.name} by ${c.subgroup} ${method} ${test}`;
          const pooledRes = subgroups({ ...pick(c), groups, method, hksj: test === 'knha', tau2Model: 'pooled' });
          a.check(`${at} pooled between`, pooledRes.Q_between, ref.pooled.QM, tol);
          a.check(`${at} pooled between p`, pooledRes.Q_between_p, ref.pooled.QMp, tol);
          if (method !== 'FE') a.check(`${at} pooled tau2`, pooledRes.tau2_pooled, ref.pooled.tau2, tol, tau2Scale(c)); // τ² near 0 on the scale of the smallest within-study variance
          const levels = ref.separate.levels;
          levels.forEach((level, j) => {
            const row = pooledRes.groups.find((g) => g.group === level)!;
            a.check(`${at} pooled ${level} estimate`, row.estimate, ref.cells.b[j], tol);
            a.check(`${at} pooled ${level} se`, row.se, ref.cells.se[j], tol);
            a.check(`${at} pooled ${level} ci_lower`, row.ci_lower, ref.cells.ci_lb[j], tol);
          });
          const sep = subgroups({ ...pick(c), groups, method, hksj: test === 'knha' });
          levels.forEach((level, j) => {
            const row = sep.groups.find((g) => g.group === level)!;
            a.check(`${at} separate ${level} estimate`, row.estimate, ref.separate.b[j], tol);
            a.check(`${at} separate ${level} se`, row.se, ref.separate.se[j], tol);
            if (method !== 'FE' && row.k > 1) a.check(`${at} separate ${level} tau2`, row.tau2, ref.separate.tau2[j], tol, tau2Scale(c)); // τ² near 0 on the scale of the smallest within-study variance
          });
          a.check(`${at} separate Q_between`, sep.Q_between, ref.separate.Qb, tol);
          a.check(`${at} separate Q_between p`, sep.Q_between_p, ref.separate.Qbp, tol);
          n++;
        }
    }
    report('subgroups vs rma', a);
    expect(n).toBe(5 * 8);
    expect(a.errors).toEqual([]);
  });
});
