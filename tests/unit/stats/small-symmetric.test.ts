import { describe, expect, it } from 'vitest';
import { eigenWork, jacobiEigen, symmetricPower, tridiagonalEigen } from '../../../shared/stats/small-symmetric.js';
import { gaussian, mulberry32 } from '../../support/random.js';

/** A random symmetric positive-definite n×n matrix: BBᵀ + n·I. */
function spd(n: number, seed: number): Float64Array {
  const z = gaussian(mulberry32(seed));
  const b = Float64Array.from({ length: n * n }, () => z());
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let s = i === j ? n : 0;
      for (let k = 0; k < n; k++) s += b[i * n + k] * b[j * n + k];
      a[i * n + j] = s;
    }
  return a;
}

/** A cluster's covariance with equal diagonal parts, d·I + c·11ᵀ: n − 1 equal eigenvalues. */
function equalVariances(n: number, d: number, c: number): Float64Array {
  return Float64Array.from({ length: n * n }, (_, i) => c + (Math.floor(i / n) === i % n ? d : 0));
}

/** Largest |A − VΛVᵀ| and |VᵀV − I| relative to the largest |A|. */
function residuals(a: Float64Array, n: number, values: Float64Array, vectors: Float64Array) {
  let scale = 0;
  for (const x of a) scale = Math.max(scale, Math.abs(x));
  let rec = 0;
  let orth = 0;
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let s = 0;
      let o = 0;
      for (let m = 0; m < n; m++) {
        s += vectors[i * n + m] * values[m] * vectors[j * n + m];
        o += vectors[m * n + i] * vectors[m * n + j];
      }
      rec = Math.max(rec, Math.abs(s - a[i * n + j]) / scale);
      orth = Math.max(orth, Math.abs(o - (i === j ? 1 : 0)));
    }
  return { rec, orth };
}

describe('eigen-decomposition of small symmetric matrices', () => {
  const cases: Array<[string, number, Float64Array]> = [
    ['1×1', 1, Float64Array.of(2.5)],
    ['2×2', 2, spd(2, 1)],
    ['17×17', 17, spd(17, 2)],
    ['60×60', 60, spd(60, 3)],
    ['40×40 with 39 equal eigenvalues', 40, equalVariances(40, 0.05, 0.02)],
    ['30×30 diagonal', 30, Float64Array.from({ length: 900 }, (_, i) => (Math.floor(i / 30) === i % 30 ? 1 + (i % 7) : 0))],
  ];
  for (const [name, n, a] of cases) {
    it(`${name}: Householder + QL reconstructs the matrix, has orthonormal vectors and Jacobi's eigenvalues`, () => {
      const ql = tridiagonalEigen(a, n);
      const { rec, orth } = residuals(a, n, ql.values, ql.vectors);
      expect(rec).toBeLessThan(1e-13);
      expect(orth).toBeLessThan(1e-13);
      const jac = jacobiEigen(a, n);
      const sorted = (v: Float64Array) => Array.from(v).sort((x, y) => x - y);
      const [q, j] = [sorted(ql.values), sorted(jac.values)];
      const top = Math.max(...j.map(Math.abs));
      for (let i = 0; i < n; i++) expect(Math.abs(q[i] - j[i]) / top).toBeLessThan(1e-13);
    });
  }

  it('A^(−½) from either routine agrees to rounding (the CR2 adjustment), and squares back to A⁻¹', () => {
    const n = 45;
    const a = spd(n, 9);
    const viaQl = symmetricPower(a, n, -0.5, 1e-12, undefined, eigenWork(n));
    const { values, vectors } = jacobiEigen(a, n);
    let worst = 0;
    let scale = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let m = 0; m < n; m++) s += vectors[i * n + m] * vectors[j * n + m] / Math.sqrt(values[m]);
        worst = Math.max(worst, Math.abs(s - viaQl[i * n + j]));
        scale = Math.max(scale, Math.abs(s));
      }
    expect(worst / scale).toBeLessThan(1e-12);
    // (A^(−½))² A = I
    let off = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let m = 0; m < n; m++) {
          let t = 0;
          for (let r = 0; r < n; r++) t += viaQl[m * n + r] * a[r * n + j];
          s += viaQl[i * n + m] * t;
        }
        off = Math.max(off, Math.abs(s - (i === j ? 1 : 0)));
      }
    expect(off).toBeLessThan(1e-11);
  });
});
