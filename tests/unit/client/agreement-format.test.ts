import { describe, expect, it } from 'vitest';
import { ICC_MIN_PAIRS, iccWithheldReason } from '../../../shared/agreement/reporting';
import { cohensKappaFromPairs } from '../../../shared/agreement/cohens-kappa';
import { kappaCells } from '../../../src/features/agreement/format';

describe('agreement display', () => {
  it('shows perfect agreement in words, without the SE of 0', () => {
    const k = cohensKappaFromPairs([['a', 'a'], ['b', 'b'], ['a', 'a'], ['c', 'c']]);
    expect(k.kappa).toBe(1);
    expect(k.se).toBe(0);
    expect(kappaCells(k.kappa, k.se)).toEqual({ kappa: 'perfect agreement', se: '—' });
  });
  it('shows an ordinary kappa and SE to 2 dp', () => {
    expect(kappaCells(0.6765, 0.0812)).toEqual({ kappa: '0.68', se: '0.08' });
  });
  it('withholds the ICC below 5 pairs of values and says why', () => {
    expect(ICC_MIN_PAIRS).toBe(5);
    expect(iccWithheldReason(4)).toMatch(/4 pairs of values; an ICC needs at least 5/);
    expect(iccWithheldReason(1)).toMatch(/1 pair of values/);
    expect(iccWithheldReason(5)).toBeNull();
  });
});
