/**
 * Eigen-decomposition of small real symmetric matrices (3×3 inertia tensors, the 4×4 quaternion
 * matrix of Horn's method) by the cyclic Jacobi method (Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §8.5), and the largest eigenvector of a 4×4 from its characteristic polynomial (see
 * topEigenvector4), about 15× faster than Jacobi. Written here rather than taken from ml-matrix
 * because it runs in the inner loop of perception (dozens of calls per structure) and must not
 * allocate; the unit tests compare both with ml-matrix's EigenvalueDecomposition.
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
  // Indices by ascending eigenvalue (insertion sort: n ≤ 8; ties keep index order).
  const order: number[] = [];
  for (let i = 0; i < n; i++) {
    let p = order.length;
    while (p > 0 && M[order[p - 1] * n + order[p - 1]] > M[i * n + i]) p--;
    order.splice(p, 0, i);
  }
  const values: number[] = [];
  const vectors: number[][] = [];
  for (const i of order) {
    values.push(M[i * n + i]);
    const v: number[] = [];
    for (let k = 0; k < n; k++) v.push(V[k * n + i]);
    vectors.push(v);
  }
  return { values, vectors };
}

/** The unit eigenvector of the largest eigenvalue of the symmetric n×n matrix `a`, written into `out`. */
export function topEigenvector(a: ArrayLike<number>, n: number, out: number[] | Float64Array): void {
  if (n === 4 && topEigenvector4(a, out)) return;
  load(a, n);
  jacobi(n);
  let best = 0;
  for (let i = 1; i < n; i++) if (M[i * n + i] > M[best * n + best]) best = i;
  for (let k = 0; k < n; k++) out[k] = V[k * n + best];
}

/**
 * Largest eigenpair of a symmetric 4×4 matrix without iteration over the matrix (the 4×4 of
 * Horn's method is solved this way in the quaternion characteristic polynomial method:
 * Theobald, Acta Cryst. A61, 478 (2005); Liu, Agrafiotis & Theobald, J. Comput. Chem. 31, 1561
 * (2010)): the largest root λ of det(λI − A) = λ⁴ + c₃λ³ + c₂λ² + c₁λ + c₀ by Newton's method
 * from an upper bound (monotone, as all roots are real), then the eigenvector as the largest
 * column of adj(A − λI), which is (Π of the other three gaps)·v·vᵀ. Returns false — and the
 * caller uses Jacobi — when the largest eigenvalue is (nearly) degenerate, where that column
 * is too small to trust.
 */
function topEigenvector4(a: ArrayLike<number>, out: number[] | Float64Array): boolean {
  const a00 = a[0], a01 = a[1], a02 = a[2], a03 = a[3];
  const a11 = a[5], a12 = a[6], a13 = a[7];
  const a22 = a[10], a23 = a[11];
  const a33 = a[15];
  // Coefficients from the traces (Newton's identities) and the determinant.
  const p1 = a00 + a11 + a22 + a33;
  const p2 =
    a00 * a00 + a11 * a11 + a22 * a22 + a33 * a33 +
    2 * (a01 * a01 + a02 * a02 + a03 * a03 + a12 * a12 + a13 * a13 + a23 * a23);
  if (!(p2 > 0) || !Number.isFinite(p2)) return false;
  // Shift to trace zero: B = A − (p1/4)·I has the same eigenvectors.
  const m = p1 / 4;
  const b00 = a00 - m, b11 = a11 - m, b22 = a22 - m, b33 = a33 - m;
  const q2 = b00 * b00 + b11 * b11 + b22 * b22 + b33 * b33 + 2 * (a01 * a01 + a02 * a02 + a03 * a03 + a12 * a12 + a13 * a13 + a23 * a23);
  if (!(q2 > 0)) return false;
  // tr(B³) = Σᵢⱼₖ Bᵢⱼ Bⱼₖ Bₖᵢ via B² rows.
  const r00 = b00 * b00 + a01 * a01 + a02 * a02 + a03 * a03;
  const r11 = a01 * a01 + b11 * b11 + a12 * a12 + a13 * a13;
  const r22 = a02 * a02 + a12 * a12 + b22 * b22 + a23 * a23;
  const r33 = a03 * a03 + a13 * a13 + a23 * a23 + b33 * b33;
  const r01 = b00 * a01 + a01 * b11 + a02 * a12 + a03 * a13;
  const r02 = b00 * a02 + a01 * a12 + a02 * b22 + a03 * a23;
  const r03 = b00 * a03 + a01 * a13 + a02 * a23 + a03 * b33;
  const r12 = a01 * a02 + b11 * a12 + a12 * b22 + a13 * a23;
  const r13 = a01 * a03 + b11 * a13 + a12 * a23 + a13 * b33;
  const r23 = a02 * a03 + a12 * a13 + b22 * a23 + a23 * b33;
  const q3 =
    r00 * b00 + r11 * b11 + r22 * b22 + r33 * b33 +
    2 * (r01 * a01 + r02 * a02 + r03 * a03 + r12 * a12 + r13 * a13 + r23 * a23);
  const det = det4(b00, a01, a02, a03, b11, a12, a13, b22, a23, b33);
  // det(λI − B) = λ⁴ − (q2/2)λ² − (q3/3)λ + det B
  const k2 = -q2 / 2;
  const k1 = -q3 / 3;
  const k0 = det;
  // λmax² ≤ (3/4)·tr(B²) for a trace-free symmetric 4×4; start just above it.
  let x = Math.sqrt(0.75 * q2) * (1 + 1e-9) + 1e-300;
  const scale = Math.sqrt(q2);
  for (let it = 0; it < 60; it++) {
    const x2 = x * x;
    const f = (x2 + k2) * x2 + k1 * x + k0;
    const df = 4 * x2 * x + 2 * k2 * x + k1;
    if (!(df > 0)) break;
    const step = f / df;
    x -= step;
    if (Math.abs(step) <= 1e-15 * scale) break;
  }
  // adj(B − xI) = (Π other gaps)·v·vᵀ: its largest diagonal entry marks the best row (= column).
  const d00 = b00 - x, d11 = b11 - x, d22 = b22 - x, d33 = b33 - x;
  // 2×2 minors of rows 0–1 (s) and rows 2–3 (c) of the symmetric matrix D.
  const s0 = d00 * d11 - a01 * a01;
  const s1 = d00 * a12 - a01 * a02;
  const s2 = d00 * a13 - a01 * a03;
  const s3 = a01 * a12 - d11 * a02;
  const s4 = a01 * a13 - d11 * a03;
  const s5 = a02 * a13 - a12 * a03;
  const c5 = d22 * d33 - a23 * a23;
  const c4 = a12 * d33 - a13 * a23;
  const c3 = a12 * a23 - a13 * d22;
  const c2 = a02 * d33 - a03 * a23;
  const c1 = a02 * a23 - a03 * d22;
  const c0 = a02 * a13 - a03 * a12;
  const diag0 = d11 * c5 - a12 * c4 + a13 * c3;
  const diag1 = d00 * c5 - a02 * c2 + a03 * c1;
  const diag2 = a03 * s4 - a13 * s2 + d33 * s0;
  const diag3 = a02 * s3 - a12 * s1 + d22 * s0;
  const m0 = Math.abs(diag0), m1 = Math.abs(diag1), m2 = Math.abs(diag2), m3 = Math.abs(diag3);
  let v0: number, v1: number, v2: number, v3: number;
  if (m0 >= m1 && m0 >= m2 && m0 >= m3) {
    v0 = diag0;
    v1 = -a01 * c5 + a02 * c4 - a03 * c3;
    v2 = a13 * s5 - a23 * s4 + d33 * s3;
    v3 = -a12 * s5 + d22 * s4 - a23 * s3;
  } else if (m1 >= m2 && m1 >= m3) {
    v0 = -a01 * c5 + a12 * c2 - a13 * c1;
    v1 = diag1;
    v2 = -a03 * s5 + a23 * s2 - d33 * s1;
    v3 = a02 * s5 - d22 * s2 + a23 * s1;
  } else if (m2 >= m3) {
    v0 = a01 * c4 - d11 * c2 + a13 * c0;
    v1 = -d00 * c4 + a01 * c2 - a03 * c0;
    v2 = diag2;
    v3 = -a02 * s4 + a12 * s2 - a23 * s0;
  } else {
    v0 = -a01 * c3 + d11 * c1 - a12 * c0;
    v1 = d00 * c3 - a01 * c1 + a02 * c0;
    v2 = -a03 * s3 + a13 * s1 - a23 * s0;
    v3 = diag3;
  }
  const norm = Math.sqrt(v0 * v0 + v1 * v1 + v2 * v2 + v3 * v3);
  // ‖row‖ ≥ (product of the three gaps)/2: demand gaps that are not tiny against the scale.
  if (!(norm > 1e-6 * scale * scale * scale)) return false;
  out[0] = v0 / norm;
  out[1] = v1 / norm;
  out[2] = v2 / norm;
  out[3] = v3 / norm;
  return true;
}

/** Determinant of the symmetric 4×4 with upper triangle (m00 m01 m02 m03; m11 m12 m13; m22 m23; m33). */
function det4(
  m00: number, m01: number, m02: number, m03: number,
  m11: number, m12: number, m13: number,
  m22: number, m23: number,
  m33: number,
): number {
  // 2×2 minors of the lower two rows.
  const s0 = m22 * m33 - m23 * m23; // cols 2,3
  const s1 = m12 * m33 - m13 * m23; // cols 1,3 (rows 2,3: [m12 m22 m23], [m13 m23 m33])
  const s2 = m12 * m23 - m13 * m22; // cols 1,2
  const s3 = m02 * m33 - m03 * m23; // cols 0,3
  const s4 = m02 * m23 - m03 * m22; // cols 0,2
  const s5 = m02 * m13 - m03 * m12; // cols 0,1
  return (
    m00 * (m11 * s0 - m12 * s1 + m13 * s2) -
    m01 * (m01 * s0 - m12 * s3 + m13 * s4) +
    m02 * (m01 * s1 - m11 * s3 + m13 * s5) -
    m03 * (m01 * s2 - m11 * s4 + m12 * s5)
  );
}
