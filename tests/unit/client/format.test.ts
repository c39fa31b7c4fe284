import { describe, expect, it } from 'vitest';
import { MISSING, digitsFor, fixed, interval, pEquals, pValue, percent } from '../../../src/lib/format';

describe('fixed digits', () => {
  it('rounds to the stated number of decimals and pads', () => {
    expect(fixed(1.23456, 3)).toBe('1.235');
    expect(fixed(2, 3)).toBe('2.000');
    expect(fixed(1234.5678, 1)).toBe('1234.6');
    expect(fixed(0.5, 0)).toBe('1');
  });

  it('keeps the sign of negative values', () => {
    expect(fixed(-0.123456, 3)).toBe('-0.123');
    expect(fixed(-12.25, 1)).toBe('-12.3');
    expect(fixed(-3, 2)).toBe('-3.00');
  });

  it('never writes a signed zero: a value that rounds to zero has no sign', () => {
    expect(fixed(-0.0004, 3)).toBe('0.000');
    expect(fixed(-0.04, 1)).toBe('0.0');
    expect(fixed(-0.4, 0)).toBe('0');
    expect(fixed(-0, 2)).toBe('0.00');
    expect(fixed(-0.0006, 3)).toBe('-0.001');
  });

  it('shows a dash for a missing or non-finite value', () => {
    expect(fixed(null, 3)).toBe(MISSING);
    expect(fixed(undefined, 3)).toBe(MISSING);
    expect(fixed(Number.NaN, 3)).toBe(MISSING);
    expect(fixed(Number.POSITIVE_INFINITY, 3)).toBe(MISSING);
    expect(fixed(Number.NEGATIVE_INFINITY, 3)).toBe(MISSING);
    expect(MISSING).toBe('—');
  });
});

describe('p-values', () => {
  it('three decimals, or "< 0.001" below a thousandth', () => {
    expect(pValue(0.04234)).toBe('0.042');
    expect(pValue(0.001)).toBe('0.001');
    expect(pValue(0.00099)).toBe('< 0.001');
    expect(pValue(1)).toBe('1.000');
    expect(pValue(null)).toBe(MISSING);
    expect(pValue(Number.NaN)).toBe(MISSING);
  });

  it('as a phrase', () => {
    expect(pEquals(0.0001)).toBe('p < 0.001');
    expect(pEquals(0.5)).toBe('p = 0.500');
    expect(pEquals(undefined)).toBe(`p = ${MISSING}`);
  });
});

describe('percentages, intervals and precision by metric', () => {
  it('a proportion as a percentage to one decimal by default', () => {
    expect(percent(0.8765)).toBe('87.7%');
    expect(percent(1)).toBe('100.0%');
    expect(percent(0.5, 0)).toBe('50%');
    expect(percent(-0.0001)).toBe('0.0%');
    expect(percent(null)).toBe(MISSING);
  });

  it('an interval with both ends at the same precision, or a dash when either is missing', () => {
    expect(interval(-0.2, 0.4, 2)).toBe('[-0.20, 0.40]');
    expect(interval(-0.00001, 1.5, 3)).toBe('[0.000, 1.500]');
    expect(interval(null, 1, 2)).toBe(MISSING);
    expect(interval(0, Number.NaN, 2)).toBe(MISSING);
  });

  it('milliseconds to 1 decimal, standardized metrics to 3', () => {
    expect(digitsFor('raw_mean')).toBe(1);
    expect(digitsFor('mean_diff')).toBe(1);
    for (const m of ['g_s', 'log_ratio', 'fisher_z']) expect(digitsFor(m)).toBe(3);
  });
});
