// The variances the engine assigns to standardized mean differences, held to the sampling variance of the same
// estimators in a seeded Monte Carlo (normal data, unit SDs, raw-score effect 0.5; the coder's r is the true r).
import { describe, expect, it } from 'vitest';
import { hedgesCorrection } from '../../shared/stats/index.js';
import { independentGroupsCheck, withinSubjectChecks } from './monte-carlo-variances.js';

const REPLICATES = 400_000; // Monte Carlo SE of each ratio ≈ 0.25%; the closest cell sits 1.6% inside the band
const DELTA = 0.5;

describe('Monte Carlo: each variance within 10% of the simulated sampling variance (n 15 and 30, r .2/.5/.8/.9)', () => {
  let seed = 20_240;
  for (const n of [15, 30]) {
    it(`g_s, two groups of ${n}`, () => {
      const c = independentGroupsCheck(n, DELTA, REPLICATES, seed++);
      expect(c.ratio).toBeGreaterThan(0.9);
      expect(c.ratio).toBeLessThan(1.1);
    });
    for (const r of [0.2, 0.5, 0.8, 0.9]) {
      it(`g_rm, g_av and g_z, n = ${n}, r = ${r}`, { timeout: 120_000 }, () => {
        const checks = withinSubjectChecks(n, r, DELTA, REPLICATES, seed++);
        for (const c of checks.filter((x) => x.metric !== 'borenstein_4_28')) {
          expect(c.ratio, `${c.metric}`).toBeGreaterThan(0.9);
          expect(c.ratio, `${c.metric}`).toBeLessThan(1.1);
        }
        // the variance the engine replaced (Borenstein et al. 2009, eq. 4.28) falls below the band at high r
        const old = checks.find((x) => x.metric === 'borenstein_4_28')!.ratio;
        if (r >= 0.8) expect(old).toBeLessThan(0.9);
      });
    }
  }

  it('the simulation itself: the sampling variance of g_z matches the exact noncentral-t variance (n 15, r .9)', { timeout: 120_000 }, () => {
    // g_z = J·t/√n with t noncentral on ν = n − 1 df, λ = √n·δ_z: Var = J²·ν(1 + λ²)/((ν − 2)n) − δ_z²
    const n = 15, r = 0.9, nu = n - 1;
    const dz = DELTA / Math.sqrt(2 * (1 - r));
    const J = hedgesCorrection(nu);
    const exact = (J * J * nu * (1 + n * dz * dz)) / ((nu - 2) * n) - dz * dz;
    const meanAssigned = 1 / n + (dz * dz + exact) / (2 * n); // E[1/n + g²/(2n)], E g = δ_z
    const gz = withinSubjectChecks(n, r, DELTA, REPLICATES, 99).find((c) => c.metric === 'g_z')!;
    expect(Math.abs(gz.ratio / (meanAssigned / exact) - 1)).toBeLessThan(0.01);
  });
});
