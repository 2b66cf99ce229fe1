/**
 * Eigen-decomposition of small real symmetric matrices (3×3 inertia tensors, the 4×4 quaternion
 * matrix of Horn's method) by the cyclic Jacobi method (Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §8.5). Written here rather than taken from ml-matrix because it runs in the inner loop
 * of perception (thousands of calls per structure) and must not allocate objects; the unit tests
 * compare it with ml-matrix's EigenvalueDecomposition.
 */

/** Eigenvalues in ascending order and the matching unit eigenvectors (`vectors[k]` is the k-th). */
export interface SymmetricEigen {
  values: number[];
  vectors: number[][];
}

/**
 * Eigenvalues and eigenvectors of the symmetric n×n matrix `a` (row-major, n ≤ 8). Converges to
 * machine precision: sweeps stop when the off-diagonal sum of squares is below 1e-30 of the
 * total (or after 50 sweeps). Only the upper triangle is read.
 */
export function symmetricEigen(a: readonly number[], n: number): SymmetricEigen {
  const m = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      m[i * n + j] = a[i * n + j];
      m[j * n + i] = a[i * n + j];
    }
  }
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  let total = 0;
  for (let i = 0; i < n * n; i++) total += m[i] * m[i];
  for (let sweep = 0; sweep < 50; sweep++) {
    let off = 0;
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) off += m[i * n + j] * m[i * n + j];
    if (off <= 1e-30 * total || off === 0) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = m[p * n + q];
        if (apq === 0) continue;
        const app = m[p * n + p];
        const aqq = m[q * n + q];
        const theta = (aqq - app) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const mkp = m[k * n + p];
          const mkq = m[k * n + q];
          m[k * n + p] = c * mkp - s * mkq;
          m[k * n + q] = s * mkp + c * mkq;
        }
        for (let k = 0; k < n; k++) {
          const mpk = m[p * n + k];
          const mqk = m[q * n + k];
          m[p * n + k] = c * mpk - s * mqk;
          m[q * n + k] = s * mpk + c * mqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p];
          const vkq = v[k * n + q];
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => m[i * n + i] - m[j * n + j]);
  return {
    values: order.map((i) => m[i * n + i]),
    vectors: order.map((i) => Array.from({ length: n }, (_, k) => v[k * n + i])),
  };
}
