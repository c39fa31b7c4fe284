// Compares pool(), egger(), begg() with Debian's statsmodels 0.13.5 (combine_effects, OLS) and scipy
// (brentq roots, Kendall's tau) on seeded random data sets. See statsmodels_reference.py for how the two
// known statsmodels traits (unclipped DL tau², PM collapse to 0) are handled without loosening tolerances.
import { describe, expect, it } from 'vitest';
import { pool, egger, begg, normalTwoTailed, type Method } from '../../shared/stats/index.js';
import { referenceDataSets } from './seeded-data.js';
import { relErr, runReference } from './python-reference.js';

// The tolerances: closed forms 1e-9 relative; iterative estimators and anything needing a t quantile 1e-7.
const CLOSED = 1e-9;
const ITER = 1e-7;

interface Summary { estimate: number; se: number; ci_lower: number; ci_upper: number }
interface Ref {
  k: number; Q: number; Q_statsmodels: number; H2_statsmodels: number; Q_p: number; H2: number; I2: number;
  dl_tau2_unclipped: number; dl_clipped: boolean; DL_tau2: number;
  pm_collapsed: boolean; pm_statsmodels_tau2: number; PM_tau2: number; PM_tau2_brentq: number;
  FE: Record<'false' | 'true', Summary>; DL: Record<'false' | 'true', Summary>; PM: Record<'false' | 'true', Summary>;
  tau2_ci: [number, number]; REML_tau2: number; prediction_t: number | null;
  egger: { intercept: number; se: number; t: number; p: number } | null;
  begg?: { tau: number; p: number; p_exact: number | null };
}

const sets = referenceDataSets();
const reference = runReference<{ statsmodels: string; results: Ref[] }>('statsmodels_reference.py', { datasets: sets, level: 0.95 });

function check(errors: string[], label: string, actual: number | null, expected: number, tol: number, scale = 0) {
  if (actual === null || !(relErr(actual, expected, scale) <= tol)) errors.push(`${label}: got ${actual}, reference ${expected}`);
}

describe(`pool() against statsmodels ${reference.statsmodels} combine_effects`, () => {
  it('covers every data-set family, including DL clipping and a PM collapse', () => {
    expect(reference.results).toHaveLength(sets.length);
    expect(reference.results.some((r) => r.dl_clipped)).toBe(true);
    expect(reference.results.some((r) => r.pm_collapsed)).toBe(true);
    expect(Math.min(...sets.map((s) => s.effects.length))).toBe(2);
    expect(Math.max(...sets.map((s) => s.effects.length))).toBe(200);
  });

  for (const [i, set] of sets.entries()) {
    it(`${set.name}: FE, DL, PM with and without HKSJ`, () => {
      const ref = reference.results[i];
      const errors: string[] = [];
      for (const method of ['FE', 'DL', 'PM'] as Method[]) {
        for (const hksj of [false, true]) {
          const r = pool({ effects: set.effects, variances: set.variances, method, hksj });
          const s = ref[method as 'FE' | 'DL' | 'PM'][String(hksj) as 'false' | 'true'];
          const tol = method === 'PM' || hksj ? ITER : CLOSED;
          const tag = `${method}${hksj ? '+HKSJ' : ''}`;
          check(errors, `${tag} estimate`, r.estimate, s.estimate, method === 'PM' ? ITER : CLOSED, s.se);
          const identicalHksj = hksj && set.effects.every((e) => e === set.effects[0]);
          if (identicalHksj) {
            // identical effects: the HKSJ SE is exactly 0; statsmodels' value is its rounding residue
            expect(r.se).toBe(0);
            expect(s.se).toBeLessThan(1e-12 * ref[method as 'FE' | 'DL' | 'PM'].false.se);
          } else {
            check(errors, `${tag} se`, r.se, s.se, tol);
            // interval bounds are estimate ± c·SE: compared on the SE's scale when a bound is near 0
            check(errors, `${tag} ci_lower`, r.ci_lower, s.ci_lower, tol, s.se);
            check(errors, `${tag} ci_upper`, r.ci_upper, s.ci_upper, tol, s.se);
          }
          check(errors, `${tag} Q (two-pass fsum)`, r.Q, ref.Q, CLOSED);
          if (ref.Q > 0) {
            check(errors, `${tag} Q (statsmodels q)`, r.Q, ref.Q_statsmodels, CLOSED);
            check(errors, `${tag} H2 (statsmodels h2)`, r.H2, ref.H2_statsmodels, CLOSED);
          }
          check(errors, `${tag} I2`, r.I2, ref.I2, CLOSED);
          check(errors, `${tag} H2`, r.H2, ref.H2, CLOSED);
          check(errors, `${tag} Q_p`, r.Q_p, ref.Q_p, CLOSED);
          if (method === 'FE') expect(r.tau2).toBeNull();
          if (method === 'DL') check(errors, 'DL tau2 (statsmodels, clipped at 0)', r.tau2, ref.DL_tau2, CLOSED);
          if (method === 'PM') {
            check(errors, 'PM tau2', r.tau2, ref.PM_tau2, ITER);
            check(errors, 'PM tau2 (brentq root)', r.tau2, ref.PM_tau2_brentq, ITER);
          }
          if (method !== 'FE') {
            check(errors, `${tag} tau2_ci_lower`, r.tau2_ci_lower, ref.tau2_ci[0], ITER);
            check(errors, `${tag} tau2_ci_upper`, r.tau2_ci_upper, ref.tau2_ci[1], ITER);
            if (ref.prediction_t === null) expect(r.pi_lower).toBeNull();
            else {
              const half = ref.prediction_t * Math.sqrt(r.tau2! + s.se * s.se);
              check(errors, `${tag} pi_lower`, r.pi_lower, s.estimate - half, ITER, s.se);
              check(errors, `${tag} pi_upper`, r.pi_upper, s.estimate + half, ITER, s.se);
            }
          }
          const wsum = r.weights.reduce((a, b) => a + b, 0);
          if (Math.abs(wsum - 100) > 1e-9) errors.push(`${tag} weights sum to ${wsum}`);
        }
      }
      // REML: global maximum of the restricted likelihood found by scipy brentq on the score over a grid
      const reml = pool({ effects: set.effects, variances: set.variances, method: 'REML' });
      check(errors, 'REML tau2 (scipy)', reml.tau2, ref.REML_tau2, ITER);
      expect(errors).toEqual([]);
    });
  }

  it('DL tau² is never negative where statsmodels reports a negative value', () => {
    const clipped = reference.results.map((r, i) => ({ r, i })).filter(({ r }) => r.dl_tau2_unclipped < 0);
    expect(clipped.length).toBeGreaterThan(0);
    for (const { i } of clipped) {
      const r = pool({ effects: sets[i].effects, variances: sets[i].variances, method: 'DL' });
      expect(r.tau2).toBe(0);
      expect(r.I2).toBe(0);
    }
  });

  it('PM where statsmodels collapsed to 0 matches the exact brentq root, which is positive', () => {
    const collapsed = reference.results.map((r, i) => ({ r, i })).filter(({ r }) => r.pm_collapsed);
    expect(collapsed.length).toBeGreaterThan(0);
    for (const { r, i } of collapsed) {
      expect(r.pm_statsmodels_tau2).toBe(0);
      expect(r.PM_tau2_brentq).toBeGreaterThan(0);
      const ours = pool({ effects: sets[i].effects, variances: sets[i].variances, method: 'PM' });
      expect(relErr(ours.tau2!, r.PM_tau2_brentq)).toBeLessThanOrEqual(ITER);
    }
  });
});

describe("Egger's and Begg's tests against statsmodels OLS and scipy's Kendall tau", () => {
  it("Egger's intercept, SE, t (closed form) and p (t tail) agree on every data set", () => {
    const errors: string[] = [];
    let compared = 0;
    for (const [i, set] of sets.entries()) {
      const ref = reference.results[i].egger;
      const ours = egger(set);
      if (ref === null) {
        if (ours !== null) errors.push(`${set.name}: expected null`);
        continue;
      }
      compared++;
      check(errors, `${set.name} intercept`, ours?.intercept ?? null, ref.intercept, CLOSED, ref.se);
      check(errors, `${set.name} se`, ours?.se ?? null, ref.se, CLOSED);
      check(errors, `${set.name} t`, ours?.t ?? null, ref.t, CLOSED, 1);
      check(errors, `${set.name} p`, ours?.p ?? null, ref.p, ITER);
      // pool() reports the same figure
      expect(pool(set).egger).toEqual(ours);
    }
    expect(compared).toBeGreaterThan(20);
    expect(errors).toEqual([]);
  });

  it("Begg's tau-b and p agree with scipy.stats.kendalltau (exact p for k ≤ 50 without ties, asymptotic above)", () => {
    const errors: string[] = [];
    let exact = 0;
    for (const [i, set] of sets.entries()) {
      const ref = reference.results[i].begg;
      if (!ref) continue;
      const ours = begg(set)!;
      check(errors, `${set.name} tau`, ours.tau, ref.tau, CLOSED, 1);
      check(errors, `${set.name} z-based p`, normalTwoTailed(ours.z), ref.p, CLOSED);
      if (set.effects.length <= 50 && ref.p_exact !== null) {
        exact++;
        if (ours.p_method !== 'exact') errors.push(`${set.name}: expected the exact p`);
        check(errors, `${set.name} exact p`, ours.p, ref.p_exact, CLOSED);
      } else {
        if (ours.p_method !== 'normal') errors.push(`${set.name}: expected the normal p`);
        check(errors, `${set.name} p`, ours.p, ref.p, CLOSED);
      }
    }
    expect(exact).toBeGreaterThan(10);
    expect(errors).toEqual([]);
  });
});
