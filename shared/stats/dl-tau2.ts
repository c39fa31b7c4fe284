/**
 * DerSimonian–Laird (1986) moment estimator τ² = max(0, (Q − (k − 1)) / (Σw − Σw²/Σw)), w = 1/v,
 * with the fixed-effect sums it is built from. Q uses a two-pass centred form, and Σwy Neumaier
 * summation, so large offsets do not cancel.
 */
export function dlTau2(
  y: Float64Array,
  v: Float64Array,
): { tau2: number; Q: number; sumW: number; sumW2: number; feMean: number } {
  const k = y.length;
  let sumW = 0;
  let sumW2 = 0;
  let sumWY = 0;
  let comp = 0;
  let allEqual = true;
  const y0 = y[0];
  for (let i = 0; i < k; i++) {
    if (y[i] !== y0) allEqual = false;
    const w = 1 / v[i];
    sumW += w;
    sumW2 += w * w;
    const x = w * y[i];
    const t = sumWY + x;
    comp += Math.abs(sumWY) >= Math.abs(x) ? sumWY - t + x : x - t + sumWY;
    sumWY = t;
  }
  // identical effects: the mean is exactly that value and Q exactly 0 (no rounding residue)
  const feMean = allEqual ? y0 : (sumWY + comp) / sumW;
  let Q = 0;
  for (let i = 0; i < k; i++) {
    const d = y[i] - feMean;
    Q += (d * d) / v[i];
  }
  const c = sumW - sumW2 / sumW;
  const tau2 = k > 1 && c > 0 ? Math.max(0, (Q - (k - 1)) / c) : 0;
  return { tau2, Q, sumW, sumW2, feMean };
}
