/**
 * Eigen-decomposition of small real symmetric matrices (3×3 inertia tensors, the 4×4 quaternion
 * matrix of Horn's method) by the cyclic Jacobi method (Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §8.5). Written here rather than taken from ml-matrix because it runs in the inner loop
 * of perception (thousands of calls per structure) and must not allocate; the unit tests compare
 * it with ml-matrix's EigenvalueDecomposition.
 */

/** Eigenvalues in ascending order and the matching unit eigenvectors (`vectors[k]` is the k-th). */
export interface SymmetricEigen {
  values: number[];
  vectors: number[][];
}

const M = new Float64Array(64);
const V = new Float64Array(64);

/**
 * Diagonalises the symmetric n×n matrix held in the module scratch `M` (n ≤ 8), accumulating the
 * rotations in `V`. Sweeps stop when the off-diagonal sum of squares is below 1e-30 of the
 * diagonal's (or after 30 sweeps; convergence is quadratic, 4–6 sweeps in practice).
 */
function jacobi(n: number): void {
  V.fill(0, 0, n * n);
  for (let i = 0; i < n; i++) V[i * n + i] = 1;
  for (let sweep = 0; sweep < 30; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += M[i * n + i] * M[i * n + i];
      for (let j = i + 1; j < n; j++) off += M[i * n + j] * M[i * n + j];
    }
    if (off <= 1e-30 * diag || off < 1e-300) return;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = M[p * n + q];
        if (apq === 0) continue;
        const theta = (M[q * n + q] - M[p * n + p]) / (2 * apq);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const mkp = M[k * n + p];
          const mkq = M[k * n + q];
          M[k * n + p] = c * mkp - s * mkq;
          M[k * n + q] = s * mkp + c * mkq;
        }
        for (let k = 0; k < n; k++) {
          const mpk = M[p * n + k];
          const mqk = M[q * n + k];
          M[p * n + k] = c * mpk - s * mqk;
          M[q * n + k] = s * mpk + c * mqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = V[k * n + p];
          const vkq = V[k * n + q];
          V[k * n + p] = c * vkp - s * vkq;
          V[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
}

function load(a: ArrayLike<number>, n: number): void {
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      M[i * n + j] = a[i * n + j];
      M[j * n + i] = a[i * n + j];
    }
  }
}

/**
 * Eigenvalues and eigenvectors of the symmetric n×n matrix `a` (row-major, n ≤ 8; only the
 * upper triangle is read), eigenvalues ascending.
 */
export function symmetricEigen(a: ArrayLike<number>, n: number): SymmetricEigen {
  load(a, n);
  jacobi(n);
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => M[i * n + i] - M[j * n + j]);
  return {
    values: order.map((i) => M[i * n + i]),
    vectors: order.map((i) => Array.from({ length: n }, (_, k) => V[k * n + i])),
  };
}

/** The unit eigenvector of the largest eigenvalue of the symmetric n×n matrix `a`, written into `out`. */
export function topEigenvector(a: ArrayLike<number>, n: number, out: number[] | Float64Array): void {
  load(a, n);
  jacobi(n);
  let best = 0;
  for (let i = 1; i < n; i++) if (M[i * n + i] > M[best * n + best]) best = i;
  for (let k = 0; k < n; k++) out[k] = V[k * n + best];
}
