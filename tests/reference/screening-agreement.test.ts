import { describe, expect, it } from 'vitest';
import { screeningAgreement } from '../../shared/agreement/screening-agreement.js';
import { relErr, runReference } from './python-reference.js';

type Ref = { kappa: number; se: number; percentAgreement: number };

// Invented screening pairs (two screeners over 40 records; categories as the counts route builds them), checked
// against statsmodels' cohens_kappa (statsmodels.stats.inter_rater, Debian's python3-statsmodels).
const repeat = (n: number, a: string, b: string) => Array.from({ length: n }, () => [a, b] as const);
const PAIRS = [
  ...repeat(18, 'included', 'included'),
  ...repeat(3, 'included', 'excluded'),
  ...repeat(2, 'excluded', 'included'),
  ...repeat(9, 'excluded', 'excluded'),
  ...repeat(4, 'excluded:review_article', 'excluded:review_article'),
  ...repeat(1, 'excluded:review_article', 'excluded'),
  ...repeat(2, 'included', 'excluded:wrong_population'),
  ...repeat(1, 'excluded:wrong_population', 'excluded:wrong_population'),
];

describe('screening agreement (% and Cohen’s κ over screening categories) against statsmodels', () => {
  it('matches statsmodels on a 4-category table of 40 records', () => {
    const ours = screeningAgreement(PAIRS);
    const ref = runReference<Ref>('screening_kappa_reference.py', { pairs: PAIRS });
    expect(ours.pairs).toBe(40);
    expect(ours.percentAgreement).toBeCloseTo(ref.percentAgreement, 12);
    expect(relErr(ours.kappa!, ref.kappa)).toBeLessThan(1e-10);
    expect(relErr(ours.se!, ref.se)).toBeLessThan(1e-10);
    expect(ours.caution).toBeNull();
  });

  it('matches statsmodels on the 3 pairs the API test settles, and says κ rests on few pairs', () => {
    const pairs = [['included', 'included'], ['excluded:wrong_population', 'included'], ['included', 'excluded']] as const;
    const ours = screeningAgreement(pairs);
    const ref = runReference<Ref>('screening_kappa_reference.py', { pairs });
    expect(relErr(ours.kappa!, ref.kappa, 1)).toBeLessThan(1e-10);
    expect(ours.caution).toMatch(/only 3 pairs/);
  });

  it('has no κ when both screeners used one category throughout, and nothing without pairs', () => {
    expect(screeningAgreement(repeat(5, 'included', 'included'))).toMatchObject({ percentAgreement: 1, kappa: null, se: null });
    expect(screeningAgreement([])).toMatchObject({ pairs: 0, percentAgreement: null, kappa: null });
  });
});
