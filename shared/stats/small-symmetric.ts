// Dense helpers for small symmetric matrices (row-major n×n Float64Arrays): the p×p regression blocks
// and the per-cluster blocks of the multilevel model. Textbook algorithms (Golub & Van Loan 2013, §4.2, §8.5).

/**
 * Lower Cholesky factor L (A = LLᵀ) of a symmetric positive-definite matrix, or null when a pivot falls
 * below `relTol` times the largest diagonal entry (singular or indefinite).
 */
export function cholesky(a: Float64Array, n: number, relTol = 1e-13, out?: Float64Array): Float64Array | null {
  // into `out` (at least n², only the lower triangle is written) when given
  const l = out ?? new Float64Array(n * n);
  let maxDiag = 0;
  for (let i = 0; i < n; i++) maxDiag = Math.max(maxDiag, Math.abs(a[i * n + i]));
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let m = 0; m < j; m++) d -= l[j * n + m] * l[j * n + m];
    if (!(d > relTol * maxDiag)) return null;
    const ljj = Math.sqrt(d);
    l[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let m = 0; m < j; m++) s -= l[i * n + m] * l[j * n + m];
      l[i * n + j] = s / ljj;
    }
  }
  return l;
}

/** log det A from its Cholesky factor. */
export function choleskyLogDet(l: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += Math.log(l[i * n + i]);
  return 2 * s;
}

/** A⁻¹ from the Cholesky factor of A. */
export function choleskyInverse(l: Float64Array, n: number): Float64Array {
  // L⁻¹ by forward substitution, then A⁻¹ = L⁻ᵀL⁻¹.
  const li = new Float64Array(n * n);
  for (let c = 0; c < n; c++) {
    li[c * n + c] = 1 / l[c * n + c];
    for (let i = c + 1; i < n; i++) {
      let s = 0;
      for (let m = c; m < i; m++) s -= l[i * n + m] * li[m * n + c];
      li[i * n + c] = s / l[i * n + i];
    }
  }
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let m = i; m < n; m++) s += li[m * n + i] * li[m * n + j];
      inv[i * n + j] = s;
      inv[j * n + i] = s;
    }
  }
  return inv;
}

/**
 * Eigen-decomposition of a symmetric matrix by cyclic Jacobi rotations (accurate to rounding for small
 * blocks). Returns the eigenvalues and the eigenvectors as the columns of a row-major matrix.
 */
export interface EigenWork {
  m: Float64Array;
  q: Float64Array;
  values: Float64Array;
  f: Float64Array;
}

/** Scratch space for symmetricEigen / symmetricPower on matrices up to n×n (reused across calls). */
export const eigenWork = (n: number): EigenWork => ({ m: new Float64Array(n * n), q: new Float64Array(n * n), values: new Float64Array(n), f: new Float64Array(n) });

/** Above this size the eigen-decomposition goes by Householder tridiagonalisation and QL (several times fewer operations). */
export const JACOBI_MAX_SIZE = 16;

export function symmetricEigen(a: Float64Array, n: number, work?: EigenWork): { values: Float64Array; vectors: Float64Array } {
  return n > JACOBI_MAX_SIZE ? tridiagonalEigen(a, n, work) : jacobiEigen(a, n, work);
}

/** Cyclic Jacobi rotations: accurate to rounding, about 50n³ operations. */
export function jacobiEigen(a: Float64Array, n: number, work?: EigenWork): { values: Float64Array; vectors: Float64Array } {
  const m = work ? work.m : new Float64Array(n * n);
  const q = work ? work.q : new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) {
    m[i] = a[i];
    q[i] = 0;
  }
  for (let i = 0; i < n; i++) q[i * n + i] = 1;
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += m[i * n + i] * m[i * n + i];
      for (let j = i + 1; j < n; j++) off += m[i * n + j] * m[i * n + j];
    }
    if (off === 0 || off <= 1e-34 * diag) break;
    for (let p = 0; p < n - 1; p++) {
      for (let r = p + 1; r < n; r++) {
        const apr = m[p * n + r];
        if (apr === 0) continue;
        const theta = (m[r * n + r] - m[p * n + p]) / (2 * apr);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let i = 0; i < n; i++) {
          const mip = m[i * n + p];
          const mir = m[i * n + r];
          m[i * n + p] = c * mip - s * mir;
          m[i * n + r] = s * mip + c * mir;
        }
        for (let i = 0; i < n; i++) {
          const mpi = m[p * n + i];
          const mri = m[r * n + i];
          m[p * n + i] = c * mpi - s * mri;
          m[r * n + i] = s * mpi + c * mri;
        }
        for (let i = 0; i < n; i++) {
          const qip = q[i * n + p];
          const qir = q[i * n + r];
          q[i * n + p] = c * qip - s * qir;
          q[i * n + r] = s * qip + c * qir;
        }
      }
    }
  }
  const values = work ? work.values : new Float64Array(n);
  for (let i = 0; i < n; i++) values[i] = m[i * n + i];
  return { values, vectors: q };
}

/**
 * Householder reduction to tridiagonal form and the implicit QL algorithm with the transformations accumulated
 * (tred2 and tql2 of EISPACK as in the public-domain JAMA library; Golub & Van Loan 2013, §8.3): about 6n³
 * operations. Same answer layout as jacobiEigen (eigenvectors as columns), eigenvalues in no particular order.
 */
export function tridiagonalEigen(a: Float64Array, n: number, work?: EigenWork): { values: Float64Array; vectors: Float64Array } {
  const V = work ? work.q : new Float64Array(n * n);
  const d = work ? work.values : new Float64Array(n);
  const e = work ? work.f : new Float64Array(n);
  for (let i = 0; i < n * n; i++) V[i] = a[i];
  if (n === 1) {
    d[0] = V[0];
    V[0] = 1;
    return { values: d, vectors: V };
  }
  // tred2: Householder tridiagonalisation, V holds the accumulated transformations afterwards
  for (let j = 0; j < n; j++) d[j] = V[(n - 1) * n + j];
  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(d[k]);
    if (scale === 0) {
      e[i] = d[i - 1];
      for (let j = 0; j < i; j++) {
        d[j] = V[(i - 1) * n + j];
        V[i * n + j] = 0;
        V[j * n + i] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        d[k] /= scale;
        h += d[k] * d[k];
      }
      let f = d[i - 1];
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h -= f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      for (let j = 0; j < i; j++) {
        f = d[j];
        V[j * n + i] = f;
        g = e[j] + V[j * n + j] * f;
        for (let k = j + 1; k <= i - 1; k++) {
          g += V[k * n + j] * d[k];
          e[k] += V[k * n + j] * f;
        }
        e[j] = g;
      }
      f = 0;
      for (let j = 0; j < i; j++) {
        e[j] /= h;
        f += e[j] * d[j];
      }
      const hh = f / (h + h);
      for (let j = 0; j < i; j++) e[j] -= hh * d[j];
      for (let j = 0; j < i; j++) {
        f = d[j];
        g = e[j];
        for (let k = j; k <= i - 1; k++) V[k * n + j] -= f * e[k] + g * d[k];
        d[j] = V[(i - 1) * n + j];
        V[i * n + j] = 0;
      }
    }
    d[i] = h;
  }
  for (let i = 0; i < n - 1; i++) {
    V[(n - 1) * n + i] = V[i * n + i];
    V[i * n + i] = 1;
    const h = d[i + 1];
    if (h !== 0) {
      for (let k = 0; k <= i; k++) d[k] = V[k * n + i + 1] / h;
      for (let j = 0; j <= i; j++) {
        let g = 0;
        for (let k = 0; k <= i; k++) g += V[k * n + i + 1] * V[k * n + j];
        for (let k = 0; k <= i; k++) V[k * n + j] -= g * d[k];
      }
    }
    for (let k = 0; k <= i; k++) V[k * n + i + 1] = 0;
  }
  for (let j = 0; j < n; j++) {
    d[j] = V[(n - 1) * n + j];
    V[(n - 1) * n + j] = 0;
  }
  V[(n - 1) * n + n - 1] = 1;
  e[0] = 0;

  // tql2: implicit QL on the tridiagonal (d, e), rotations applied to V
  for (let i = 1; i < n; i++) e[i - 1] = e[i];
  e[n - 1] = 0;
  let f = 0;
  let tst1 = 0;
  const eps = 2 ** -52;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]) + Math.abs(e[l]));
    let m = l;
    while (m < n && Math.abs(e[m]) > eps * tst1) m++;
    if (m > l) {
      for (let iter = 0; ; iter++) {
        if (iter > 60 * n) throw new Error('eigen-decomposition: the QL iteration did not converge');
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = Math.sqrt(p * p + 1);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const dl1 = d[l + 1];
        let h = g - d[l];
        for (let i = l + 2; i < n; i++) d[i] -= h;
        f += h;
        p = d[m];
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1];
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = Math.sqrt(p * p + e[i] * e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          for (let k = 0; k < n; k++) {
            const vk = k * n;
            h = V[vk + i + 1];
            V[vk + i + 1] = s * V[vk + i] + c * h;
            V[vk + i] = c * V[vk + i] - s * h;
          }
        }
        p = (-s * s2 * c3 * el1 * e[l]) / dl1;
        e[l] = s * p;
        d[l] = c * p;
        if (!(Math.abs(e[l]) > eps * tst1)) break;
      }
    }
    d[l] += f;
    e[l] = 0;
  }
  return { values: d, vectors: V };
}

/**
 * A^power for symmetric positive semi-definite A through its eigenvalues; eigenvalues at or below
 * `relFloor` times the largest count as zero (a pseudo-inverse for negative powers).
 */
export function symmetricPower(a: Float64Array, n: number, power: number, relFloor: number, into?: Float64Array, work?: EigenWork): Float64Array {
  const { values, vectors } = symmetricEigen(a, n, work);
  let top = 0;
  for (let i = 0; i < n; i++) top = Math.max(top, values[i]);
  const f = work ? work.f : new Float64Array(n);
  for (let i = 0; i < n; i++) f[i] = values[i] > relFloor * top ? Math.pow(values[i], power) : 0;
  const out = into ?? new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let m = 0; m < n; m++) s += vectors[i * n + m] * f[m] * vectors[j * n + m];
      out[i * n + j] = s;
      out[j * n + i] = s;
    }
  }
  return out;
}
