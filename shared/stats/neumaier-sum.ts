/**
 * Neumaier's compensated summation (Neumaier 1974, an improvement of Kahan 1965): the rounding error
 * of each addition is carried separately, so sums of terms of mixed sign keep full precision.
 * Input: any finite numbers. Example: neumaierSum([1, 1e100, 1, -1e100]) === 2 (naive summation gives 0).
 */
export function neumaierSum(values: ArrayLike<number>): number {
  let sum = 0;
  let c = 0;
  for (let i = 0; i < values.length; i++) {
    const x = values[i];
    const t = sum + x;
    if (Math.abs(sum) >= Math.abs(x)) c += sum - t + x;
    else c += x - t + sum;
    sum = t;
  }
  return sum + c;
}
