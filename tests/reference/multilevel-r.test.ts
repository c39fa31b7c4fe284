// poolMultilevel() and robustPool() against R: metafor's rma.mv(yi, vi, mods, random = ~ 1 | cluster/effect,
// method = "REML", test) with predict() for the prediction interval, and clubSandwich's coef_test / conf_int
// (vcov = "CR2", test = "Satterthwaite"). Data: metafor's dat.konstantopoulos2011 (Konstantopoulos 2011) and
// dat.assink2016 (Assink & Wibbelink 2016), exported by R in this run, plus seeded invented sets.
// I² is computed in R from the reference σ² by Cheung (2014, eq. 14) with Higgins & Thompson's (2002) typical
// within-study variance. See multilevel_reference.R for how the reference σ² is taken to the REML optimum.
import { describe, expect, it } from 'vitest';
import { poolMultilevel, robustPool, StatsInputError } from '../../shared/stats/index.js';
import { comparePool, compareRobust, dataCases, input, referenceFits } from './multilevel-cases.js';
import { relErr } from './python-reference.js';

const TOL = 1e-6;
const { cases, fits } = referenceFits(dataCases());

const POOL_KEYS = [
  'k', 'clusters', 'estimate', 'se', 'ci_lower', 'ci_upper', 'statistic', 'statistic_df', 'p', 'sigma2_between',
  'sigma2_within', 'Q', 'Q_df', 'Q_p', 'I2_between', 'I2_within', 'pi_lower', 'pi_upper', 'loglik',
];
const ROBUST_KEYS = ['estimate', 'se', 'df', 't', 'p', 'ci_lower', 'ci_upper'];

function failures(errors: Record<string, number>): string[] {
  return Object.entries(errors)
    .filter(([, e]) => !(e <= TOL))
    .map(([f, e]) => `${f}: relative error ${e}`);
}

describe('poolMultilevel and robustPool against metafor rma.mv and clubSandwich CR2', () => {
  it('covers both boundaries, singletons, all singletons, identical effects, moderators and both tests', () => {
    const names = new Set(cases.map((c) => c.name));
    expect(names.size).toBe(17);
    const at = (name: string) => cases.find((c) => c.name === name && c.test === 'z')!;
    const fit = (name: string) => poolMultilevel(input(at(name)));
    expect(fit('between-cluster variance at 0').sigma2_between).toBe(0);
    expect(fit('between-cluster variance at 0').sigma2_within).toBeGreaterThan(0);
    expect(fit('within-cluster variance at 0').sigma2_within).toBe(0);
    expect(fit('within-cluster variance at 0').sigma2_between).toBeGreaterThan(0);
    expect(fit('within-cluster variance at 0, with a moderator').sigma2_within).toBe(0);
    const none = fit('both variances at 0');
    expect([none.sigma2_between, none.sigma2_within]).toEqual([0, 0]);
    expect(fit('identical effects').Q).toBe(0);
    expect(cases.some((c) => c.cluster.some((id, i) => c.cluster.indexOf(id) === i && c.cluster.lastIndexOf(id) === i))).toBe(true);
    expect(cases.filter((c) => c.moderators).length).toBeGreaterThanOrEqual(14);
  });

  for (const c of cases) {
    const ref = fits[c.id];
    it(`${c.name}, test = "${c.test}": every poolMultilevel field within ${TOL}`, () => {
      const r = poolMultilevel({ ...input(c), test: c.test });
      expect(Object.keys(r)).toEqual(c.moderators ? [...POOL_KEYS, 'coefficients'] : POOL_KEYS);
      expect(r.coefficients?.length).toBe(c.moderators ? c.moderators.length + 1 : undefined);
      for (const co of r.coefficients ?? []) expect(co.df).toBe(c.test === 't' ? ref.ddf : undefined);
      expect(failures(comparePool(c, ref))).toEqual([]);
      // metafor's own optimum (before the reference's polish) is no higher than ours
      expect(r.loglik).toBeGreaterThanOrEqual(ref.loglik_free - 1e-10);
    });

    if (c.test === 'z') {
      if (c.name === 'identical effects') {
        it('identical effects: robustPool refuses (the robust variance is 0, as clubSandwich finds too)', () => {
          expect(ref.robust.se[0]).toBeLessThanOrEqual(1e-12 * ref.se[0]);
          expect(() => robustPool(input(c))).toThrow(StatsInputError);
          expect(() => robustPool(input(c))).toThrow(/robust variance of the estimate is 0/);
        });
      } else {
        it(`${c.name}: every robustPool field within ${TOL}`, () => {
          const r = robustPool(input(c));
          expect(Object.keys(r)).toEqual(c.moderators ? [...ROBUST_KEYS, 'coefficients'] : ROBUST_KEYS);
          expect(failures(compareRobust(c, ref))).toEqual([]);
        });
      }
    }
  }

  it('all singletons: σ² split half and half, as metafor does from its symmetric start', () => {
    const c = cases.find((x) => x.name === 'all singletons')!;
    const r = poolMultilevel(input(c));
    expect(r.sigma2_between).toBe(r.sigma2_within);
    expect(relErr(fits[c.id].sigma2_free[0], fits[c.id].sigma2_free[1])).toBeLessThan(1e-6);
  });
});
