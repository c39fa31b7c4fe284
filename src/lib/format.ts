import { metricDigits } from '../../shared/vocabulary/labels.js';
/** Numbers as the tables show them: a fixed, stated precision, and a dash for a missing value. */
export const MISSING = '—';

const isNumber = (x: number | null | undefined): x is number => typeof x === 'number' && Number.isFinite(x);

/** `x` to `digits` decimals; never "-0.000" (a value that rounds to zero carries no sign). */
export function fixed(x: number | null | undefined, digits: number): string {
  if (!isNumber(x)) return MISSING;
  const s = x.toFixed(digits);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** A p-value to 3 decimals, or "< 0.001". */
export function pValue(p: number | null | undefined): string {
  if (!isNumber(p)) return MISSING;
  return p < 0.001 ? '< 0.001' : fixed(p, 3);
}

/** "p = 0.042" or "p < 0.001". */
export const pEquals = (p: number | null | undefined) => (isNumber(p) && p < 0.001 ? 'p < 0.001' : `p = ${pValue(p)}`);

/** A proportion (0–1) as a percentage: 0.8765 → "87.7%" (the ×100 is rounded to 15 digits first: 0.8765 × 100 is 87.64999… in binary). */
export const percent = (fraction: number | null | undefined, digits = 1) => (isNumber(fraction) ? `${fixed(Number((fraction * 100).toPrecision(15)), digits)}%` : MISSING);

/** "[lower, upper]", or a dash when either end is missing. */
export const interval = (lower: number | null | undefined, upper: number | null | undefined, digits: number) =>
  isNumber(lower) && isNumber(upper) ? `[${fixed(lower, digits)}, ${fixed(upper, digits)}]` : MISSING;

/** Precision by metric in tables (the one digits rule, shared/vocabulary/labels.ts). */
export const digitsFor = (metric: string) => metricDigits(metric, 'table');
