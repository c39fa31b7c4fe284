import { logBeta } from './log-gamma.js';

const EPS = 2.5e-16; // one ulp of 1: |del − 1| below this means del rounds to 1
const TINY = 1e-300;

/**
 * Both tails of the regularized incomplete beta function, I_x(a, b) and 1 − I_x(a, b), for a, b > 0.
 * x and y = 1 − x are passed separately (with their logs) so that callers such as the t distribution
 * can supply both without cancellation. The smaller tail is evaluated directly with the continued
 * fraction (modified Lentz; Press et al., Numerical Recipes §6.4), the prefactor xᵃ yᵇ / (a B(a, b))
 * in log form with an accurate ln B (logBeta). Example: regularizedBeta(0.5, 0.5, 1, 1) → { lower: 0.5, upper: 0.5 }.
 */
export function regularizedBeta(
  x: number,
  y: number,
  a: number,
  b: number,
  logX = Math.log(x),
  logY = Math.log(y),
): { lower: number; upper: number } {
  if (x <= 0) return { lower: 0, upper: 1 };
  if (y <= 0) return { lower: 1, upper: 0 };
  const logFront = a * logX + b * logY - logBeta(a, b);
  if (x < (a + 1) / (a + b + 2)) {
    const lower = (Math.exp(logFront) * continuedFraction(a, b, x)) / a;
    return { lower, upper: 1 - lower };
  }
  const upper = (Math.exp(logFront) * continuedFraction(b, a, y)) / b;
  return { lower: 1 - upper, upper };
}

function continuedFraction(a: number, b: number, x: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  const maxIter = 100000 + Math.ceil(50 * Math.sqrt(Math.max(a, b)));
  for (let m = 1; m < maxIter; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h;
}
