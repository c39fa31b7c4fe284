// Published worked examples. Each value names its source beside the check; values quoted from memory say so.
import { describe, expect, it } from 'vitest';
import { relErr, runReference } from './python-reference.js';
import { pool, metaRegression, computeEffect, smdIndependent, smdPaired, hedgesCorrection } from '../../shared/stats/index.js';

/** BCG vaccine trials (Colditz et al. 1994, JAMA 271:698–702), 13 trials: [tpos, tneg, cpos, cneg] and absolute
 * latitude, as distributed with the metafor R package (dat.bcg) — values from memory. */
const BCG: [number, number, number, number][] = [
  [4, 119, 11, 128], [6, 300, 29, 274], [3, 228, 11, 209], [62, 13536, 248, 12619], [33, 5036, 47, 5761],
  [180, 1361, 372, 1079], [8, 2537, 10, 619], [505, 87886, 499, 87892], [29, 7470, 45, 7232],
  [17, 1699, 65, 1600], [186, 50448, 141, 27197], [5, 2493, 3, 2338], [27, 16886, 29, 17825],
];
const ABLAT = [44, 55, 42, 52, 13, 44, 19, 13, 27, 42, 18, 33, 33];
// log relative risk and its variance from the 2×2 counts
const effects = BCG.map(([a, b, c, d]) => Math.log(a / (a + b) / (c / (c + d))));
const variances = BCG.map(([a, b, c, d]) => 1 / a - 1 / (a + b) + 1 / c - 1 / (c + d));

/** Published figures are rounded to 4 decimals (2 for Q and I²): agreement to half a unit in the last place. */
const rounded = (x: number | null, value: number, decimals: number) => {
  expect(x).not.toBeNull();
  expect(Math.abs((x as number) - value)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12);
};

describe('BCG vaccine trials (Colditz et al. 1994)', () => {
  it('DerSimonian–Laird: −0.7141 [−1.0644, −0.3638], tau² 0.3088, Q 152.23 on 12 df, I² 92.12% (values given in issue 3)', () => {
    const r = pool({ effects, variances, method: 'DL' });
    rounded(r.estimate, -0.7141, 4);
    rounded(r.ci_lower, -1.0644, 4);
    rounded(r.ci_upper, -0.3638, 4);
    rounded(r.tau2, 0.3088, 4);
    rounded(r.Q, 152.23, 2);
    expect(r.Q_df).toBe(12);
    rounded(r.I2, 92.12, 2);
  });

  it("REML: tau² 0.3132, estimate −0.7145 (from memory of metafor's documentation)", () => {
    const r = pool({ effects, variances, method: 'REML' });
    rounded(r.tau2, 0.3132, 4);
    rounded(r.estimate, -0.7145, 4);
  });

  it("REML Q-profile 95% interval for tau² [0.1197, 1.1115] (from memory of metafor's confint() example)", () => {
    const r = pool({ effects, variances, method: 'REML' });
    rounded(r.tau2_ci_lower, 0.1197, 4);
    rounded(r.tau2_ci_upper, 1.1115, 4);
    // the Q-profile interval does not depend on the point estimator
    const dl = pool({ effects, variances, method: 'DL' });
    expect(dl.tau2_ci_lower).toBeCloseTo(r.tau2_ci_lower!, 12);
    expect(dl.tau2_ci_upper).toBeCloseTo(r.tau2_ci_upper!, 12);
  });

  it("REML meta-regression on absolute latitude: slope −0.0291 (SE 0.0072), intercept 0.2515, QM 16.3582, QE 30.7331 on 11 df (from memory of metafor's documentation)", () => {
    const r = metaRegression({ effects, variances, moderator: ABLAT, method: 'REML' });
    rounded(r.slope, -0.0291, 4);
    rounded(r.slope_se, 0.0072, 4);
    rounded(r.coefficients[0].estimate, 0.2515, 4);
    rounded(r.QM, 16.3582, 4);
    rounded(r.QE, 30.7331, 4);
    expect(r.QE_df).toBe(11);
  });

  it('REML meta-regression residual tau², coefficients and R² against a direct scipy maximization of the restricted likelihood', () => {
    // metafor prints a residual tau² of 0.0764 and R² 75.62% (from memory); its scoring stops at a 1e-5 change,
    // so the exact maximum is taken from scipy (reml_regression_reference.py) instead of that print.
    const ref = runReference<{ tau2: number; beta: number[]; se: number[]; tau2_total: number }>('reml_regression_reference.py', {
      effects, variances, moderator: ABLAT,
    });
    const r = metaRegression({ effects, variances, moderator: ABLAT, method: 'REML' });
    expect(relErr(r.tau2, ref.tau2)).toBeLessThan(1e-7);
    expect(relErr(r.tau2_total, ref.tau2_total)).toBeLessThan(1e-7);
    expect(relErr(r.coefficients[0].estimate, ref.beta[0])).toBeLessThan(1e-7);
    expect(relErr(r.slope!, ref.beta[1])).toBeLessThan(1e-7);
    expect(relErr(r.slope_se!, ref.se[1])).toBeLessThan(1e-7);
    expect(relErr(r.R2!, (ref.tau2_total - ref.tau2) / ref.tau2_total)).toBeLessThan(1e-6);
  });
});

describe('Borenstein, Hedges, Higgins & Rothstein (2009), Introduction to Meta-Analysis, ch. 4 (values from memory of the textbook)', () => {
  // The book's V_g = J²·V_d (eq. 4.23) and its paired V_d (eq. 4.28) are not the engine's variances: g_s uses the
  // large-sample variance at g (Hedges & Olkin 1985), g_rm Becker's (1988). The book's d, J and g still hold.
  it('independent groups: means 103 vs 100, SDs 5.5 and 4.5, n 50 and 50 → d 0.5970, Vd 0.0418, J 0.9923, g 0.5924 (book Vg 0.0411 = J²·Vd)', () => {
    const g = smdIndependent(103, 5.5, 50, 100, 4.5, 50);
    const J = hedgesCorrection(98);
    rounded(J, 0.9923, 4);
    const d = g.effect / J;
    rounded(d, 0.597, 4);
    const vd = 2 / 50 + (d * d) / 200;
    rounded(vd, 0.0418, 4);
    rounded(J * J * vd, 0.0411, 4); // the book's V_g
    rounded(g.effect, 0.5924, 4);
    expect(g.variance).toBeCloseTo(2 / 50 + g.effect ** 2 / 200, 15); // Hedges & Olkin at g: 0.04176
    expect(g.formula).toBe('smd.ind.means');
    expect(g.metric).toBe('g_s');
  });

  it('paired: mean difference 5, SD of differences 10, n 50, r 0.5 → d 0.5, g 0.4923 (book Vd 0.0225, Vg 0.0218 by eq. 4.28)', () => {
    const g = smdPaired(5, 10, 50, 0.5);
    const J = hedgesCorrection(49);
    rounded(g.effect / J, 0.5, 4);
    rounded(g.effect, 0.4923, 4);
    rounded((1 / 50 + 0.25 / 100) * 2 * 0.5, 0.0225, 4); // the book's V_d
    expect(g.variance).toBeCloseTo((2 * 0.5) / 50 + g.effect ** 2 / 100, 15); // Becker (1988): 0.02242
    const viaCli = computeEffect({ measure: 'smd_paired', mean_diff: 5, sd_diff: 10, n: 50, r: 0.5 });
    expect(viaCli).toMatchObject({ measure: 'smd_paired', metric: 'g_rm', effect: g.effect, variance: g.variance, formula: 'smd.paired.sd_diff' });
  });
});
