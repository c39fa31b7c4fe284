import { smdIndependent, smdPaired, smdPairedSds, dzFromDifferences } from '../../shared/stats/index.js';
import { gaussian, mulberry32 } from '../support/random.js';

export interface VarianceCheck {
  /** borenstein_4_28: g_rm's estimates with the variance of Borenstein et al. (2009) eq. 4.28 that the engine no longer uses */
  metric: 'g_s' | 'g_rm' | 'g_av' | 'g_z' | 'borenstein_4_28';
  n: number;
  r: number | null;
  /** mean of the variances the engine assigns / the simulated sampling variance of the estimates */
  ratio: number;
}

/** Running mean and variance (Welford). */
class Moments {
  k = 0;
  mean = 0;
  m2 = 0;
  add(x: number) {
    this.k++;
    const d = x - this.mean;
    this.mean += d / this.k;
    this.m2 += d * (x - this.mean);
  }
  get variance() {
    return this.m2 / (this.k - 1);
  }
}

/** χ² draws on k df by Marsaglia & Tsang's (2000) gamma method (shape k/2 ≥ 1, scale 2). */
function chiSquare(k: number, rnd: () => number, z: () => number): () => number {
  const d = k / 2 - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  return () => {
    for (;;) {
      const x = z();
      const t = 1 + c * x;
      if (t <= 0) continue;
      const v = t * t * t;
      const u = rnd();
      if (Math.log(u) < 0.5 * x * x + d - d * v + d * Math.log(v)) return 2 * d * v;
    }
  };
}

/**
 * Seeded Monte Carlo of the within-subject standardizers for n pairs from a bivariate normal with unit SDs,
 * correlation r and a raw-score effect `delta` (condition 1 − condition 2), the coder's r being that
 * correlation. Each replicate draws the sufficient statistics exactly: the mean difference ~ N(delta, 2(1 − r)/n),
 * independent of the sample covariance matrix, which is Wishart on n − 1 df drawn by Bartlett's decomposition
 * (B₁₁² ~ χ²(n − 1), B₂₂² ~ χ²(n − 2), B₂₁ ~ N(0, 1)). The engine then computes g_rm (mean and SD of the
 * differences with r), g_av (condition means and SDs with r) and g_z (mean and SD of the differences); the check
 * is the mean assigned variance over the variance of the estimates across replicates.
 */
export function withinSubjectChecks(n: number, r: number, delta: number, replicates: number, seed: number): VarianceCheck[] {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const chi1 = chiSquare(n - 1, rnd, z);
  const chi2 = chiSquare(n - 2, rnd, z);
  const s = Math.sqrt(1 - r * r);
  const seMean = Math.sqrt((2 * (1 - r)) / n);
  const est = { g_rm: new Moments(), g_av: new Moments(), g_z: new Moments() };
  const vars = { g_rm: new Moments(), g_av: new Moments(), g_z: new Moments() };
  const old = new Moments();
  for (let rep = 0; rep < replicates; rep++) {
    const md = delta + seMean * z();
    const b11 = Math.sqrt(chi1());
    const b21 = z();
    const b22 = Math.sqrt(chi2());
    // (n − 1)·S = L·B·Bᵀ·Lᵀ with L the Cholesky factor [[1, 0], [r, s]] of the population covariance
    const ss1 = b11 * b11;
    const ss2 = (r * b11 + s * b21) ** 2 + (s * b22) ** 2;
    const s12 = b11 * (r * b11 + s * b21);
    const sd1 = Math.sqrt(ss1 / (n - 1)), sd2 = Math.sqrt(ss2 / (n - 1));
    const sdd = Math.sqrt((ss1 + ss2 - 2 * s12) / (n - 1));
    const rm = smdPaired(md, sdd, n, r);
    const av = smdPairedSds(md, sd1, 0, sd2, n, r);
    const gz = dzFromDifferences(md, sdd, n);
    est.g_rm.add(rm.effect);
    vars.g_rm.add(rm.variance);
    est.g_av.add(av.effect);
    vars.g_av.add(av.variance);
    est.g_z.add(gz.effect);
    vars.g_z.add(gz.variance);
    const J = rm.hedges_j!.value;
    const d = rm.effect / J;
    old.add(J * J * (1 / n + (d * d) / (2 * n)) * 2 * (1 - r));
  }
  const checks: VarianceCheck[] = (['g_rm', 'g_av', 'g_z'] as const).map((metric) => ({ metric, n, r, ratio: vars[metric].mean / est[metric].variance }));
  checks.push({ metric: 'borenstein_4_28', n, r, ratio: old.mean / est.g_rm.variance });
  return checks;
}

/**
 * The same for g_s: two independent groups of n with unit SDs and a mean difference `delta`; the mean difference
 * ~ N(delta, 2/n) and the pooled variance (2n − 2)·S² ~ χ²(2n − 2), independent.
 */
export function independentGroupsCheck(n: number, delta: number, replicates: number, seed: number): VarianceCheck {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const chi = chiSquare(2 * n - 2, rnd, z);
  const seMean = Math.sqrt(2 / n);
  const est = new Moments();
  const vars = new Moments();
  for (let rep = 0; rep < replicates; rep++) {
    const md = delta + seMean * z();
    const sp = Math.sqrt(chi() / (2 * n - 2));
    const g = smdIndependent(md, sp, n, 0, sp, n);
    est.add(g.effect);
    vars.add(g.variance);
  }
  return { metric: 'g_s', n, r: null, ratio: vars.mean / est.variance };
}
