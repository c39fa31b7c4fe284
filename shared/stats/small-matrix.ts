/** Inverse of a small symmetric positive-definite matrix (row-major p×p) by Gauss–Jordan elimination with partial pivoting; null if singular. */
export function invertMatrix(a: Float64Array, p: number): Float64Array | null {
  const m = Float64Array.from(a);
  const inv = new Float64Array(p * p);
  for (let i = 0; i < p; i++) inv[i * p + i] = 1;
  let scale = 0;
  for (let i = 0; i < p * p; i++) scale = Math.max(scale, Math.abs(a[i]));
  for (let col = 0; col < p; col++) {
    let piv = col;
    for (let r = col + 1; r < p; r++) if (Math.abs(m[r * p + col]) > Math.abs(m[piv * p + col])) piv = r;
    if (!(Math.abs(m[piv * p + col]) > 1e-13 * scale)) return null;
    if (piv !== col) {
      for (let c = 0; c < p; c++) {
        [m[col * p + c], m[piv * p + c]] = [m[piv * p + c], m[col * p + c]];
        [inv[col * p + c], inv[piv * p + c]] = [inv[piv * p + c], inv[col * p + c]];
      }
    }
    const d = m[col * p + col];
    for (let c = 0; c < p; c++) {
      m[col * p + c] /= d;
      inv[col * p + c] /= d;
    }
    for (let r = 0; r < p; r++) {
      if (r === col) continue;
      const f = m[r * p + col];
      if (f === 0) continue;
      for (let c = 0; c < p; c++) {
        m[r * p + c] -= f * m[col * p + c];
        inv[r * p + c] -= f * inv[col * p + c];
      }
    }
  }
  return inv;
}
