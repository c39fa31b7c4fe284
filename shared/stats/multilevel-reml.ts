import { cholesky, choleskyInverse, choleskyLogDet } from './small-symmetric.js';
import type { ClusteredData } from './multilevel-input.js';

/**
 * Restricted (REML) log-likelihood of the three-level model y = Xβ + u_j + e_ij + ε_ij at
 * θ = (σ²_between, σ²_within), with its analytic gradient, observed Hessian and expected information.
 *
 * Cluster j's marginal covariance V_j = A_j + σ²_b·11ᵀ with A_j = diag(v_ij + σ²_w) has the closed-form
 * inverse B_j = Ω_j − c_j ω_jω_jᵀ (Sherman–Morrison; ω = 1/diag A_j, c_j = σ²_b/(1 + σ²_b Σω)), so every
 * quantity below is a sum over clusters: O(k·p²) per evaluation, no k×k matrix. Formulas (Harville 1977;
 * Searle, Casella & McCulloch 1992, §6.6), with P = V⁻¹ − V⁻¹X(XᵀV⁻¹X)⁻¹XᵀV⁻¹ and V_b = ZZᵀ, V_w = I:
 *   ℓ = −½(k−p)log 2π + ½log|XᵀX| − ½log|V| − ½log|XᵀV⁻¹X| − ½yᵀPy
 *   ∂ℓ/∂θ_r = −½tr(PV_r) + ½yᵀPV_rPy
 *   ∂²ℓ/∂θ_r∂θ_s = ½tr(PV_rPV_s) − yᵀPV_rPV_sPy;  expected information ½tr(PV_rPV_s).
 * Cluster weighted means are subtracted before the rank-one correction so nothing cancels when σ²_b is large.
 */
export interface RemlPoint {
  ll: number;
  /** GLS coefficients (of the shifted effects) and their covariance (XᵀV⁻¹X)⁻¹ */
  beta: Float64Array;
  vcov: Float64Array;
}

export interface RemlDerivatives extends RemlPoint {
  /** [∂ℓ/∂σ²_b, ∂ℓ/∂σ²_w] */
  grad: [number, number];
  /** ½tr(PV_r) + ½yᵀPV_rPy: the size of the two terms that cancel in the gradient */
  gradScale: [number, number];
  /** observed Hessian and expected information, row-major 2×2 in (b, w) order */
  hessian: Float64Array;
  information: Float64Array;
}

/**
 * Σ log x over many positive factors with one log per ~hundred: factors in [1e-100, 1e100] are multiplied
 * (the running product kept within 1e±200, so nothing under- or overflows), others logged directly.
 */
class LogSum {
  private prod = 1;
  private sum = 0;
  add(x: number): void {
    if (x > 1e-100 && x < 1e100) {
      const q = this.prod * x;
      if (q > 1e200 || q < 1e-200) {
        this.sum += Math.log(q);
        this.prod = 1;
      } else this.prod = q;
    } else this.sum += Math.log(x);
  }
  value(): number {
    return this.sum + Math.log(this.prod);
  }
}

export class MultilevelReml {
  private readonly constant: number;
  private readonly xbar: Float64Array;
  private readonly omega: Float64Array;
  private readonly resid: Float64Array;

  constructor(readonly d: ClusteredData) {
    const { k, p, x } = d;
    const xtx = new Float64Array(p * p);
    for (let i = 0; i < k; i++)
      for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) xtx[a * p + b] += x[i * p + a] * x[i * p + b];
    const l = cholesky(xtx, p, 0);
    this.constant = -0.5 * (k - p) * Math.log(2 * Math.PI) + 0.5 * (l ? choleskyLogDet(l, p) : 0);
    this.xbar = new Float64Array(p);
    this.omega = new Float64Array(d.maxSize);
    this.resid = new Float64Array(d.maxSize);
  }

  /** ℓ and the GLS fit at θ; null if XᵀV⁻¹X is numerically singular. */
  point(sb: number, sw: number): RemlPoint | null {
    const g = this.gls(sb, sw);
    if (!g) return null;
    const rss = this.residualSquares(sb, sw, g.beta);
    return { ll: this.constant - 0.5 * g.logDetV - 0.5 * g.logDetXtVX - 0.5 * rss, beta: g.beta, vcov: g.vcov };
  }

  /**
   * ℓ at (b, σ²_w) for every b in `bs`, for ranking grid points: for fixed σ²_w each cluster's weighted
   * sums (s, x̄, ȳ and the centred cross-products) do not depend on σ²_b, so one pass over the effects
   * serves the whole row. yᵀPy = yᵀV⁻¹y − βᵀXᵀV⁻¹y here, which can lose digits when the residuals are small
   * against the effects: good enough to rank grid points, not for the optimum.
   */
  gridRow(sw: number, bs: number[]): number[] {
    const { p, clusters: J, y, v, x, start } = this.d;
    const pp = p * p;
    const sums = new Float64Array(J);
    const ybar = new Float64Array(J);
    const xbar = new Float64Array(J * p);
    const wxx = new Float64Array(pp);
    const wxy = new Float64Array(p);
    let wyy = 0;
    const logDiagSum = new LogSum();
    const omega = this.omega;
    for (let j = 0; j < J; j++) {
      const lo = start[j];
      const hi = start[j + 1];
      let sum = 0;
      let sy = 0;
      for (let i = lo; i < hi; i++) {
        const a = v[i] + sw;
        const om = 1 / a;
        omega[i - lo] = om;
        logDiagSum.add(a);
        sum += om;
        sy += om * y[i];
        for (let q = 0; q < p; q++) xbar[j * p + q] += om * x[i * p + q];
      }
      sums[j] = sum;
      const yb = sy / sum;
      ybar[j] = yb;
      for (let q = 0; q < p; q++) xbar[j * p + q] /= sum;
      for (let i = lo; i < hi; i++) {
        const om = omega[i - lo];
        const dy = y[i] - yb;
        wyy += om * dy * dy;
        for (let q = 0; q < p; q++) {
          const dq = om * (x[i * p + q] - xbar[j * p + q]);
          wxy[q] += dq * dy;
          for (let r = 0; r <= q; r++) wxx[q * p + r] += dq * (x[i * p + r] - xbar[j * p + r]);
        }
      }
    }
    const logDiag = logDiagSum.value();
    return bs.map((sb) => {
      const xtvx = Float64Array.from(wxx);
      const xtvy = Float64Array.from(wxy);
      let yvy = wyy;
      const logDen = new LogSum();
      for (let j = 0; j < J; j++) {
        const den = 1 + sb * sums[j];
        logDen.add(den);
        const sd = sums[j] / den;
        yvy += sd * ybar[j] * ybar[j];
        for (let q = 0; q < p; q++) {
          const xq = xbar[j * p + q];
          xtvy[q] += sd * xq * ybar[j];
          for (let r = 0; r <= q; r++) xtvx[q * p + r] += sd * xq * xbar[j * p + r];
        }
      }
      for (let q = 0; q < p; q++) for (let r = 0; r < q; r++) xtvx[r * p + q] = xtvx[q * p + r];
      const l = cholesky(xtvx, p);
      if (!l) return -Infinity;
      const h = choleskyInverse(l, p);
      let fitted = 0;
      for (let q = 0; q < p; q++) for (let r = 0; r < p; r++) fitted += xtvy[q] * h[q * p + r] * xtvy[r];
      const logDetV = logDiag + logDen.value();
      return this.constant - 0.5 * logDetV - 0.5 * choleskyLogDet(l, p) - 0.5 * Math.max(0, yvy - fitted);
    });
  }

  /** ℓ with gradient, observed Hessian and expected information. */
  derivatives(sb: number, sw: number): RemlDerivatives | null {
    const g = this.gls(sb, sw);
    if (!g) return null;
    return this.withDerivatives(sb, sw, g);
  }

  /** Pass 1: log|V|, XᵀV⁻¹X and XᵀV⁻¹y as Σ_j [Σ ω(x − x̄)(·)ᵀ + (s/den) x̄(·)ᵀ], the GLS β. */
  private gls(sb: number, sw: number) {
    const { p, clusters: J, y, v, x, start } = this.d;
    const xbar = this.xbar;
    const omega = this.omega;
    const xtvx = new Float64Array(p * p);
    const xtvy = new Float64Array(p);
    const logDet = new LogSum();
    for (let j = 0; j < J; j++) {
      const lo = start[j];
      const hi = start[j + 1];
      let s = 0;
      let sy = 0;
      xbar.fill(0);
      for (let i = lo; i < hi; i++) {
        const a = v[i] + sw;
        const om = 1 / a;
        omega[i - lo] = om;
        logDet.add(a);
        s += om;
        sy += om * y[i];
        for (let q = 0; q < p; q++) xbar[q] += om * x[i * p + q];
      }
      const ybar = sy / s;
      for (let q = 0; q < p; q++) xbar[q] /= s;
      const den = 1 + sb * s;
      logDet.add(den);
      const sd = s / den;
      for (let i = lo; i < hi; i++) {
        const om = omega[i - lo];
        const dy = y[i] - ybar;
        for (let q = 0; q < p; q++) {
          const dq = om * (x[i * p + q] - xbar[q]);
          xtvy[q] += dq * dy;
          for (let r = 0; r <= q; r++) xtvx[q * p + r] += dq * (x[i * p + r] - xbar[r]);
        }
      }
      for (let q = 0; q < p; q++) {
        xtvy[q] += sd * xbar[q] * ybar;
        for (let r = 0; r <= q; r++) xtvx[q * p + r] += sd * xbar[q] * xbar[r];
      }
    }
    for (let q = 0; q < p; q++) for (let r = 0; r < q; r++) xtvx[r * p + q] = xtvx[q * p + r];
    const l = cholesky(xtvx, p);
    if (!l) return null;
    const vcov = choleskyInverse(l, p);
    const beta = new Float64Array(p);
    for (let q = 0; q < p; q++) {
      let t = 0;
      for (let r = 0; r < p; r++) t += vcov[q * p + r] * xtvy[r];
      beta[q] = t;
    }
    return { logDetV: logDet.value(), logDetXtVX: choleskyLogDet(l, p), vcov, beta };
  }

  /** Pass 2 for ℓ alone: yᵀPy = eᵀV⁻¹e = Σ_j [Σ ω(e − ē)² + (s/den) ē²]. */
  private residualSquares(sb: number, sw: number, beta: Float64Array): number {
    const { p, clusters: J, y, v, x, start } = this.d;
    const omega = this.omega;
    const resid = this.resid;
    let rss = 0;
    for (let j = 0; j < J; j++) {
      const lo = start[j];
      const hi = start[j + 1];
      let s = 0;
      let se = 0;
      for (let i = lo; i < hi; i++) {
        const om = 1 / (v[i] + sw);
        let fit = 0;
        for (let q = 0; q < p; q++) fit += x[i * p + q] * beta[q];
        const e = y[i] - fit;
        omega[i - lo] = om;
        resid[i - lo] = e;
        s += om;
        se += om * e;
      }
      const ebar = se / s;
      let c = 0;
      for (let i = lo; i < hi; i++) {
        const de = resid[i - lo] - ebar;
        c += omega[i - lo] * de * de;
      }
      rss += c + (s / (1 + sb * s)) * ebar * ebar;
    }
    return rss;
  }

  /** Pass 2 with derivatives: residuals e = y − Xβ, r = V⁻¹e and the per-cluster trace pieces. */
  private withDerivatives(
    sb: number,
    sw: number,
    g: { logDetV: number; logDetXtVX: number; vcov: Float64Array; beta: Float64Array },
  ): RemlDerivatives {
    const { p, clusters: J, y, v, x, start } = this.d;
    const { beta, vcov: h } = g;
    const xbar = this.xbar;
    const omega = this.omega;
    const resid = this.resid;
    let rss = 0;
    let trB = 0, trB2 = 0, tSum = 0, t2Sum = 0, ggSum = 0;
    let rr = 0, rho2 = 0, rho2t = 0, rBr = 0, grSum = 0;
    const mw = new Float64Array(p * p); // Σ (BX)ᵀ(BX)
    const mb = new Float64Array(p * p); // Σ uuᵀ, u = XᵀB1
    const tuu = new Float64Array(p * p); // Σ t uuᵀ, t = 1ᵀB1
    const xb3x = new Float64Array(p * p); // Σ XᵀB³X
    const nbw = new Float64Array(p * p); // Σ (XᵀB²1) uᵀ
    const qw = new Float64Array(p); // XᵀV⁻¹r
    const qb = new Float64Array(p); // Σ ρ u, ρ = 1ᵀr
    const wbb = new Float64Array(p * p);
    const sv = new Float64Array(p);
    const bx = new Float64Array(p);
    const u = new Float64Array(p);

    for (let j = 0; j < J; j++) {
      const lo = start[j];
      const hi = start[j + 1];
      let s = 0;
      let se = 0;
      xbar.fill(0);
      for (let i = lo; i < hi; i++) {
        const om = 1 / (v[i] + sw);
        let fit = 0;
        for (let q = 0; q < p; q++) fit += x[i * p + q] * beta[q];
        const e = y[i] - fit;
        omega[i - lo] = om;
        resid[i - lo] = e;
        s += om;
        se += om * e;
        for (let q = 0; q < p; q++) xbar[q] += om * x[i * p + q];
      }
      const ebar = se / s;
      for (let q = 0; q < p; q++) xbar[q] /= s;
      const den = 1 + sb * s;
      const c = sb / den;
      let clusterRss = 0;
      let w2 = 0, w3 = 0, rho = 0, wr = 0, wr2 = 0;
      wbb.fill(0);
      sv.fill(0);
      for (let i = lo; i < hi; i++) {
        const om = omega[i - lo];
        const de = resid[i - lo] - ebar;
        clusterRss += om * de * de;
        const ri = om * (de + ebar / den);
        w2 += om * om;
        w3 += om * om * om;
        rr += ri * ri;
        rho += ri;
        wr += om * ri;
        wr2 += om * ri * ri;
        for (let q = 0; q < p; q++) bx[q] = om * (x[i * p + q] - xbar[q] + xbar[q] / den);
        for (let q = 0; q < p; q++) {
          const bq = bx[q];
          qw[q] += bq * ri;
          sv[q] += om * bq;
          for (let r = 0; r <= q; r++) {
            mw[q * p + r] += bq * bx[r];
            wbb[q * p + r] += om * bq * bx[r];
          }
        }
      }
      rss += clusterRss + (s / den) * ebar * ebar;
      const t = s / den;
      trB += s - c * w2;
      trB2 += w2 - 2 * c * w3 + c * c * w2 * w2;
      tSum += t;
      t2Sum += t * t;
      ggSum += w2 / (den * den);
      rho2 += rho * rho;
      rho2t += rho * rho * t;
      rBr += wr2 - c * wr * wr;
      grSum += (rho * wr) / den;
      for (let q = 0; q < p; q++) u[q] = (xbar[q] * s) / den;
      for (let q = 0; q < p; q++) {
        qb[q] += rho * u[q];
        for (let r = 0; r <= q; r++) {
          mb[q * p + r] += u[q] * u[r];
          tuu[q * p + r] += t * u[q] * u[r];
          xb3x[q * p + r] += wbb[q * p + r] - c * sv[q] * sv[r];
        }
        for (let r = 0; r < p; r++) nbw[q * p + r] += (sv[q] / den) * u[r];
      }
    }

    const ll = this.constant - 0.5 * g.logDetV - 0.5 * g.logDetXtVX - 0.5 * rss;
    for (const m of [mw, mb, tuu, xb3x]) for (let q = 0; q < p; q++) for (let r = 0; r < q; r++) m[r * p + q] = m[q * p + r];
    const trH = (m: Float64Array) => {
      let t = 0;
      for (let q = 0; q < p; q++) for (let r = 0; r < p; r++) t += h[q * p + r] * m[r * p + q];
      return t;
    };
    const hm = (m: Float64Array) => {
      const out = new Float64Array(p * p);
      for (let q = 0; q < p; q++)
        for (let r = 0; r < p; r++) {
          let t = 0;
          for (let a = 0; a < p; a++) t += h[q * p + a] * m[a * p + r];
          out[q * p + r] = t;
        }
      return out;
    };
    const trProd = (a: Float64Array, b: Float64Array) => {
      let t = 0;
      for (let q = 0; q < p; q++) for (let r = 0; r < p; r++) t += a[q * p + r] * b[r * p + q];
      return t;
    };
    const quad = (a: Float64Array, b: Float64Array) => {
      let t = 0;
      for (let q = 0; q < p; q++) for (let r = 0; r < p; r++) t += a[q] * h[q * p + r] * b[r];
      return t;
    };
    const hmw = hm(mw);
    const hmb = hm(mb);
    const trPw = trB - trH(mw);
    const trPb = tSum - trH(mb);
    const grad: [number, number] = [0.5 * (rho2 - trPb), 0.5 * (rr - trPw)];
    const gradScale: [number, number] = [0.5 * (rho2 + Math.abs(trPb)), 0.5 * (rr + Math.abs(trPw))];
    const tbb = t2Sum - 2 * trH(tuu) + trProd(hmb, hmb);
    const tww = trB2 - 2 * trH(xb3x) + trProd(hmw, hmw);
    const tbw = ggSum - 2 * trH(nbw) + trProd(hmb, hmw);
    const qbb = rho2t - quad(qb, qb);
    const qww = rBr - quad(qw, qw);
    const qbw = grSum - quad(qb, qw);
    const information = Float64Array.of(0.5 * tbb, 0.5 * tbw, 0.5 * tbw, 0.5 * tww);
    const hessian = Float64Array.of(0.5 * tbb - qbb, 0.5 * tbw - qbw, 0.5 * tbw - qbw, 0.5 * tww - qww);
    return { ll, beta, vcov: h, grad, gradScale, hessian, information };
  }
}

export interface RemlFit {
  sigma2Between: number;
  sigma2Within: number;
  at: RemlDerivatives;
  /** largest |projected gradient| / gradScale over the free components at the optimum */
  relativeGradient: number;
  iterations: number;
  /** every cluster holds one effect: only σ²_b + σ²_w is identified; it is split half and half */
  onlySingletons: boolean;
  /** residual Q of the fixed-effect fit (NaN if that fit is singular) */
  Q: number;
}

const TARGET = 1e-12;

/** Projected gradient relative to the size of its terms; components at 0 with a negative gradient count as 0. */
function relativeGradient(at: RemlDerivatives, th: [number, number], fixWithin: boolean): number {
  let worst = 0;
  for (let r = 0; r < 2; r++) {
    if (r === 1 && fixWithin) continue;
    const g = th[r] > 0 ? Math.abs(at.grad[r]) : Math.max(at.grad[r], 0);
    const rel = g === 0 ? 0 : g / at.gradScale[r];
    worst = Math.max(worst, rel);
  }
  return worst;
}

function solve2(a: Float64Array, g: [number, number], free: number[]): number[] | null {
  if (free.length === 1) {
    const r = free[0];
    const d = a[r * 2 + r];
    return d > 0 ? [g[r] / d] : null;
  }
  const det = a[0] * a[3] - a[1] * a[2];
  if (!(a[0] > 0 && det > 1e-14 * a[0] * a[3])) return null;
  return [(a[3] * g[0] - a[1] * g[1]) / det, (a[0] * g[1] - a[2] * g[0]) / det];
}

/**
 * Projected Newton ascent on θ ≥ 0 from (sb, sw): the free components are those inside the box or at 0
 * with a positive gradient; the step is Newton's (observed Hessian) when that is negative definite there,
 * else Fisher scoring, else a scaled gradient, each halved until ℓ rises (or, within ℓ's rounding, until the
 * projected gradient shrinks). Stops when the projected
 * gradient vanishes relative to its terms (1e-12) or no step can raise ℓ any further.
 */
function climb(model: MultilevelReml, sb: number, sw: number, fixWithin: boolean) {
  let th: [number, number] = [sb, fixWithin ? 0 : sw];
  let at = model.derivatives(th[0], th[1]);
  if (!at) return null;
  let iterations = 0;
  for (; iterations < 200; iterations++) {
    if (relativeGradient(at, th, fixWithin) <= TARGET) break;
    const free: number[] = [];
    for (let r = 0; r < 2; r++) {
      if (r === 1 && fixWithin) continue;
      if (th[r] > 0 || at.grad[r] > 0) free.push(r);
    }
    const negHess = at.hessian.map((x) => -x);
    const directions = [solve2(negHess, at.grad, free), solve2(at.information, at.grad, free)];
    directions.push(free.map((r) => at!.grad[r] / Math.max(at!.information[r * 3], 1e-300)));
    let moved = false;
    for (const dir of directions) {
      if (!dir) continue;
      let ascent = 0;
      free.forEach((r, m) => (ascent += at!.grad[r] * dir[m]));
      if (!(ascent > 0)) continue;
      let alpha = 1;
      for (let halving = 0; halving < 60; halving++, alpha /= 2) {
        const cand: [number, number] = [th[0], th[1]];
        free.forEach((r, m) => (cand[r] = Math.max(0, th[r] + alpha * dir[m])));
        if (cand[0] === th[0] && cand[1] === th[1]) break;
        const next = model.derivatives(cand[0], cand[1]);
        // ℓ must rise; within its rounding (near the optimum) the projected gradient must shrink instead
        const noise = 1e-12 * Math.max(1, Math.abs(at.ll));
        if (
          next &&
          (next.ll > at.ll ||
            (next.ll >= at.ll - noise && relativeGradient(next, cand, fixWithin) < relativeGradient(at, th, fixWithin)))
        ) {
          th = cand;
          at = next;
          moved = true;
          break;
        }
      }
      if (moved) break;
    }
    if (!moved) break;
  }
  return { th, at, iterations, rel: relativeGradient(at, th, fixWithin) };
}

/**
 * REML fit of (σ²_b, σ²_w) to the global maximum on σ² ≥ 0: ℓ is profiled over a grid (0 and 4^m times a
 * reference scale, m = −4 … 2, so both boundaries are included), and projected Newton runs from the best grid point and
 * from a moment-based start; the higher of the two optima wins.
 */
export function fitMultilevelReml(d: ClusteredData): RemlFit {
  const model = new MultilevelReml(d);
  const onlySingletons = d.maxSize === 1;
  const { k, p, v } = d;
  let sw1 = 0, sw2 = 0;
  for (let i = 0; i < k; i++) {
    sw1 += 1 / v[i];
    sw2 += 1 / (v[i] * v[i]);
  }
  const typicalV = ((k - 1) * sw1) / (sw1 * sw1 - sw2);
  const fe = model.point(0, 0);
  const Q = fe ? residualQ(d, fe.beta) : NaN;
  const tauMoment = fe ? Math.max(0, (Q - (k - p)) / (sw1 - sw2 / sw1)) : 0;
  const scale = Math.max(tauMoment, typicalV);

  const grid = [0];
  for (let m = -4; m <= 2; m++) grid.push(scale * Math.pow(4, m));
  let best: [number, number] = [scale / 2, onlySingletons ? 0 : scale / 2];
  let bestLl = -Infinity;
  for (const w of onlySingletons ? [0] : grid) {
    model.gridRow(w, grid).forEach((ll, m) => {
      if (ll > bestLl) {
        bestLl = ll;
        best = [grid[m], w];
      }
    });
  }
  const momentStart: [number, number] = onlySingletons
    ? [Math.max(tauMoment, 0.05 * typicalV), 0]
    : [Math.max(tauMoment, 0.05 * typicalV) / 2, Math.max(tauMoment, 0.05 * typicalV) / 2];
  let result: ReturnType<typeof climb> = null;
  for (const s of [best, momentStart]) {
    const r = climb(model, s[0], s[1], onlySingletons);
    if (r && (!result || r.at.ll > result.at.ll)) result = r;
  }
  if (!result) throw new Error('the REML fit failed: XᵀV⁻¹X is singular');
  let { th, at } = result;
  if (onlySingletons) {
    th = [th[0] / 2, th[0] / 2];
    at = model.derivatives(th[0], th[1]) ?? at;
  }
  return {
    sigma2Between: th[0],
    sigma2Within: th[1],
    at,
    relativeGradient: result.rel,
    iterations: result.iterations,
    onlySingletons,
    Q,
  };
}

/** Residual Q of the inverse-variance (fixed-effect) fit: Σ (y − Xβ)²/v. */
export function residualQ(d: ClusteredData, beta: Float64Array): number {
  const { k, p, y, v, x } = d;
  let q = 0;
  for (let i = 0; i < k; i++) {
    let fit = 0;
    for (let a = 0; a < p; a++) fit += x[i * p + a] * beta[a];
    const e = y[i] - fit;
    q += (e * e) / v[i];
  }
  return q;
}
