// leaveOneOut(), cumulative(), begg() and trimFill() against R metafor's leave1out(), cumul(), ranktest() and
// trimfill() (Debian's r-cran-metafor) on metafor's bundled published data sets and invented sheets.
// Tolerances: 1e-9 relative for FE and DL and for the rank test (closed form), 1e-6 for REML and PM (iterative;
// metafor run with its thresholds tightened to 1e-12).
import { beforeAll, describe, expect, it } from 'vitest';
import { begg, cumulative, leaveOneOut, trimFill, type Method } from '../../shared/stats/index.js';
import { Agreement, CLOSED, ITERATIVE, report, rVector, runRSource } from './r-reference.js';
import { gaussian, mulberry32 } from '../support/random.js';

const METHODS = ['FE', 'DL', 'REML', 'PM'] as const;
const tolerance = (m: Method) => (m === 'FE' || m === 'DL' ? CLOSED : ITERATIVE);
/** τ² near its boundary 0 is compared on the scale of the smallest within-study variance (metafor's REML stops at ~1e-12 there). */
const tau2Scale = (vi: number[]) => Math.min(...vi);

interface Rows { estimate: number[]; se: number[]; p: number[]; ci_lb: number[]; ci_ub: number[]; tau2: number[] | null; I2: number[]; Q: number[] }
interface TrimFill { k0: number; side: string; b: number; se: number; ci_lb: number; ci_ub: number; tau2: number; filled: number[] }
interface DataSet {
  name: string;
  yi: number[];
  vi: number[];
  fits: Record<string, { l1o: Rows; cumul: Rows; trimfill: TrimFill }>;
  rank: { tau: number; p: number };
  rank_normal: { tau: number; p: number };
}

/** Invented sheets: a funnel with small studies missing on the left (k 30 and 50), and a large one (k 80). */
function invented(seed: number, k: number) {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const yi: number[] = [];
  const vi: number[] = [];
  while (yi.length < k) {
    const v = 0.005 + 0.2 * rnd() ** 2;
    const y = 0.3 + Math.sqrt(v + 0.01) * z();
    if (y / Math.sqrt(v) < 0.5 && rnd() < 0.7) continue; // small, null-looking studies go unpublished
    yi.push(y);
    vi.push(v);
  }
  return { yi, vi };
}
const sheets = [invented(41, 30), invented(42, 50), invented(43, 80)];

let sets: DataSet[];
beforeAll(() => {
  sets = runRSource<{ sets: DataSet[] }>(`
ctl <- list(threshold = 1e-12, tol = 1e-12, maxiter = 10000)
col <- function(x) if (is.null(x)) NULL else I(as.numeric(x))
rows <- function(x) list(estimate = col(x$estimate), se = col(x$se), p = col(x$pval), ci_lb = col(x$ci.lb), ci_ub = col(x$ci.ub),
  tau2 = col(x$tau2), I2 = col(x$I2), Q = col(x$Q))
one <- function(name, yi, vi) {
  fits <- list()
  for (m in c("FE", "DL", "REML", "PM")) for (t in c("z", "knha")) {
    res <- suppressWarnings(rma(yi, vi, method = m, test = t, control = ctl))
    tf <- suppressWarnings(trimfill(res, control = ctl, test = t))
    fits[[paste(m, t)]] <- list(l1o = rows(suppressWarnings(leave1out(res))), cumul = rows(suppressWarnings(cumul(res))),
      trimfill = list(k0 = tf$k0, side = tf$side, b = as.numeric(tf$beta), se = tf$se, ci_lb = tf$ci.lb, ci_ub = tf$ci.ub, tau2 = tf$tau2,
        filled = I(sort(as.numeric(tf$yi[tf$fill])))))
  }
  rk <- suppressWarnings(ranktest(yi, vi))
  rn <- suppressWarnings(ranktest(yi, vi, exact = FALSE))
  list(name = name, yi = I(as.numeric(yi)), vi = I(as.numeric(vi)), fits = fits,
    rank = list(tau = as.numeric(rk$tau), p = rk$pval), rank_normal = list(tau = as.numeric(rn$tau), p = rn$pval))
}
byyear <- function(d) d[order(d$year), ]
bcg <- byyear(escalc("RR", ai = tpos, bi = tneg, ci = cpos, di = cneg, data = dat.bcg))
molloy <- byyear(escalc("ZCOR", ri = ri, ni = ni, data = dat.molloy2014))
hack <- byyear(dat.hackshaw1998); raud <- byyear(dat.raudenbush1985); bd <- byyear(dat.bangertdrowns2004)
cat(to_json(list(sets = list(
  one("dat.bcg (Colditz et al. 1994), log risk ratio, by year", bcg$yi, bcg$vi),
  one("dat.hackshaw1998 (Hackshaw et al. 1998), by year", hack$yi, hack$vi),
  one("dat.raudenbush1985 (Raudenbush 1984), by year", raud$yi, raud$vi),
  one("dat.bangertdrowns2004 (Bangert-Drowns et al. 2004), by year", bd$yi, bd$vi),
  one("dat.molloy2014 (Molloy et al. 2014), Fisher's z, by year", molloy$yi, molloy$vi),
  one("invented sheet k = 30", ${rVector(sheets[0].yi)}, ${rVector(sheets[0].vi)}),
  one("invented sheet k = 50", ${rVector(sheets[1].yi)}, ${rVector(sheets[1].vi)}),
  one("invented sheet k = 80", ${rVector(sheets[2].yi)}, ${rVector(sheets[2].vi)})
))))
`).sets;
}, 180_000);

/** Sensitivity rows against metafor's: estimate, SE, p, CI; τ², I² (τ²-based for REML and PM) and Q where k > 1. */
function compareRows(a: Agreement, at: string, ours: ReturnType<typeof leaveOneOut>, ref: Rows, method: Method, heteroFrom: number, tau2Scale: number) {
  const tol = tolerance(method);
  expect(ours.length, at).toBe(ref.estimate.length);
  ours.forEach((r, i) => {
    a.check(`${at}[${i}] estimate`, r.estimate, ref.estimate[i], tol);
    a.check(`${at}[${i}] se`, r.se, ref.se[i], tol);
    a.check(`${at}[${i}] ci_lower`, r.ci_lower, ref.ci_lb[i], tol);
    a.check(`${at}[${i}] ci_upper`, r.ci_upper, ref.ci_ub[i], tol);
    if (i < heteroFrom) return;
    a.check(`${at}[${i}] Q`, r.Q, ref.Q[i], CLOSED);
    a.check(`${at}[${i}] I2`, method === 'REML' || method === 'PM' ? r.I2_tau : r.I2, ref.I2[i], tol, 1); // percent: near 0 on the scale of one point
    if (method !== 'FE') a.check(`${at}[${i}] tau2`, r.tau2, ref.tau2![i], tol, tau2Scale);
  });
}

describe('leave1out and cumul (metafor) against leaveOneOut() and cumulative()', () => {
  for (const kind of ['leave-one-out', 'cumulative'] as const) {
    it(`${kind}: every row, FE/DL/REML/PM, z and knha`, () => {
      const a = new Agreement();
      for (const s of sets)
        for (const method of METHODS)
          for (const test of ['z', 'knha'] as const) {
            const input = { effects: s.yi, variances: s.vi, method, hksj: test === 'knha' };
            const fit = s.fits[`${method} ${test}`];
            if (kind === 'leave-one-out') compareRows(a, `${s.name} ${method} ${test} leave-one-out`, leaveOneOut(input), fit.l1o, method, 0, tau2Scale(s.vi));
            else compareRows(a, `${s.name} ${method} ${test} cumulative`, cumulative(input), fit.cumul, method, 1, tau2Scale(s.vi));
          }
      report(`${kind} vs metafor`, a);
      expect(a.errors).toEqual([]);
    });
  }
});

describe('ranktest (metafor) against begg()', () => {
  it('Kendall tau and p: exact for k ≤ 50 without ties (metafor exact = TRUE), normal above or with ties (exact = FALSE)', () => {
    const a = new Agreement();
    let exact = 0;
    for (const s of sets) {
      const r = begg({ effects: s.yi, variances: s.vi })!;
      const ref = r.p_method === 'exact' ? s.rank : s.rank_normal;
      if (r.p_method === 'exact') exact++;
      const ties = new Set(s.vi).size < s.vi.length;
      expect(r.p_method, s.name).toBe(s.yi.length <= 50 && !ties ? 'exact' : 'normal');
      a.check(`${s.name} tau`, r.tau, ref.tau, CLOSED);
      a.check(`${s.name} p (${r.p_method})`, r.p, ref.p, CLOSED);
    }
    report('ranktest vs begg', a);
    expect(exact).toBeGreaterThanOrEqual(4);
    expect(a.errors).toEqual([]);
  });
});

describe('trimfill (metafor) against trimFill()', () => {
  it('k0, side, filled effects and the adjusted estimate, SE, CI and τ² (FE/DL/REML/PM, z and knha)', () => {
    const a = new Agreement();
    let filledSomewhere = 0;
    for (const s of sets)
      for (const method of METHODS)
        for (const test of ['z', 'knha'] as const) {
          const ref = s.fits[`${method} ${test}`].trimfill;
          const r = trimFill({ effects: s.yi, variances: s.vi, method, hksj: test === 'knha' });
          const at = `${s.name} ${method} ${test}`;
          const tol = tolerance(method);
          if (r.k0 !== ref.k0 || r.side !== ref.side) {
            a.errors.push(`${at}: k0 ${r.k0} on the ${r.side}, metafor ${ref.k0} on the ${ref.side}`);
            continue;
          }
          if (r.k0 > 0) filledSomewhere++;
          const filled = r.filled.map((f) => f.effect).sort((x, y) => x - y);
          filled.forEach((f, j) => a.check(`${at} filled[${j}]`, f, ref.filled[j], tol));
          a.check(`${at} estimate`, r.estimate, ref.b, tol);
          a.check(`${at} se`, r.se, ref.se, tol);
          a.check(`${at} ci_lower`, r.ci_lower, ref.ci_lb, tol);
          a.check(`${at} ci_upper`, r.ci_upper, ref.ci_ub, tol);
          if (method !== 'FE') a.check(`${at} tau2`, r.tau2, ref.tau2, tol, tau2Scale(s.vi));
        }
    report('trimfill vs trimFill', a);
    expect(filledSomewhere).toBeGreaterThan(10);
    expect(a.errors).toEqual([]);
  });
});
