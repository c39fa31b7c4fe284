/** Decimal places of a number as typed (0.05 → 2, 250 → 0, 1e-7 → 7). */
export function decimalsOf(x: number): number {
  const s = String(Math.abs(x));
  const e = s.indexOf('e-');
  if (e >= 0) {
    const mantissa = s.slice(0, e);
    const dot = mantissa.indexOf('.');
    return Number(s.slice(e + 2)) + (dot >= 0 ? mantissa.length - dot - 1 : 0);
  }
  const dot = s.indexOf('.');
  return dot >= 0 ? s.length - dot - 1 : 0;
}

/**
 * How far an interval (lower, upper) is from being centred on `point` on the scale f: the gap between its two
 * halves, |f(upper) − 2f(point) + f(lower)|, as a share of what rounding and reporting allow, which is
 * max(5% of the width, 1.5 rounding units), a rounding unit being 10^(−decimals) of the most precise of the
 * three numbers carried through f′(point) (common practice). ≤ 1 means centred.
 */
export function offCentre(point: number, lower: number, upper: number, f: (x: number) => number, slope: number): number {
  const unit = 10 ** -Math.max(decimalsOf(point), decimalsOf(lower), decimalsOf(upper));
  const gap = Math.abs(f(upper) - 2 * f(point) + f(lower));
  const allowed = Math.max(0.05 * (f(upper) - f(lower)), 1.5 * unit * Math.abs(slope));
  return gap / allowed;
}
