/**
 * 3-vectors and 3×3 matrices as plain number arrays. Matrices are row-major arrays of 9 numbers
 * acting on column vectors (x′ = M·x), the convention of shared/contracts/structure.ts.
 * Right-handed axes; angles in radians, counter-clockwise looking down the axis towards the origin.
 */

/** A 3-vector. */
export type Vec3 = [number, number, number];
/** A row-major 3×3 matrix: [m00, m01, m02, m10, …, m22]. */
export type Mat3 = number[];

/** The identity matrix. */
export function identity3(): Mat3 {
  return [1, 0, 0, 0, 1, 0, 0, 0, 1];
}

/** −I, the inversion through the origin. */
export function inversion3(): Mat3 {
  return [-1, 0, 0, 0, -1, 0, 0, 0, -1];
}

/** a·b (matrix product). */
export function mul3(a: readonly number[], b: readonly number[]): Mat3 {
  // A literal, not new Array(9) filled in: a holey array is slower everywhere it is read,
  // JSON.stringify included.
  return [
    a[0] * b[0] + a[1] * b[3] + a[2] * b[6],
    a[0] * b[1] + a[1] * b[4] + a[2] * b[7],
    a[0] * b[2] + a[1] * b[5] + a[2] * b[8],
    a[3] * b[0] + a[4] * b[3] + a[5] * b[6],
    a[3] * b[1] + a[4] * b[4] + a[5] * b[7],
    a[3] * b[2] + a[4] * b[5] + a[5] * b[8],
    a[6] * b[0] + a[7] * b[3] + a[8] * b[6],
    a[6] * b[1] + a[7] * b[4] + a[8] * b[7],
    a[6] * b[2] + a[7] * b[5] + a[8] * b[8],
  ];
}

/**
 * (a·b)·c as one new matrix, bit for bit what mul3(mul3(a, b), c) gives (the same products and
 * sums in the same order), without the intermediate array: conjugating every element of a group
 * (Q·D·Qᵀ) was about 5 % of the engine's allocation.
 */
export function mul33(a: readonly number[], b: readonly number[], c: readonly number[]): Mat3 {
  const p0 = a[0] * b[0] + a[1] * b[3] + a[2] * b[6];
  const p1 = a[0] * b[1] + a[1] * b[4] + a[2] * b[7];
  const p2 = a[0] * b[2] + a[1] * b[5] + a[2] * b[8];
  const p3 = a[3] * b[0] + a[4] * b[3] + a[5] * b[6];
  const p4 = a[3] * b[1] + a[4] * b[4] + a[5] * b[7];
  const p5 = a[3] * b[2] + a[4] * b[5] + a[5] * b[8];
  const p6 = a[6] * b[0] + a[7] * b[3] + a[8] * b[6];
  const p7 = a[6] * b[1] + a[7] * b[4] + a[8] * b[7];
  const p8 = a[6] * b[2] + a[7] * b[5] + a[8] * b[8];
  return [
    p0 * c[0] + p1 * c[3] + p2 * c[6],
    p0 * c[1] + p1 * c[4] + p2 * c[7],
    p0 * c[2] + p1 * c[5] + p2 * c[8],
    p3 * c[0] + p4 * c[3] + p5 * c[6],
    p3 * c[1] + p4 * c[4] + p5 * c[7],
    p3 * c[2] + p4 * c[5] + p5 * c[8],
    p6 * c[0] + p7 * c[3] + p8 * c[6],
    p6 * c[1] + p7 * c[4] + p8 * c[7],
    p6 * c[2] + p7 * c[5] + p8 * c[8],
  ];
}

/** Transpose (= inverse for orthogonal matrices). */
export function transpose3(a: readonly number[]): Mat3 {
  return [a[0], a[3], a[6], a[1], a[4], a[7], a[2], a[5], a[8]];
}

/** Determinant. */
export function det3(a: readonly number[]): number {
  return (
    a[0] * (a[4] * a[8] - a[5] * a[7]) - a[1] * (a[3] * a[8] - a[5] * a[6]) + a[2] * (a[3] * a[7] - a[4] * a[6])
  );
}

/** M·v. */
export function apply3(m: readonly number[], v: readonly number[]): Vec3 {
  return [
    m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
    m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
    m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
  ];
}

/** Frobenius norm of a − b. */
export function frobeniusDistance3(a: readonly number[], b: readonly number[]): number {
  let s = 0;
  for (let i = 0; i < 9; i++) s += (a[i] - b[i]) ** 2;
  return Math.sqrt(s);
}

/** a·b. */
export function dot3(a: readonly number[], b: readonly number[]): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

/** a × b (right-handed). */
export function cross3(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/** |a|. */
export function norm3(a: readonly number[]): number {
  // Not Math.hypot: it is a variadic builtin that allocates on every call (a measured hotspot).
  return Math.sqrt(a[0] * a[0] + a[1] * a[1] + a[2] * a[2]);
}

/** s·a. */
export function scale3(a: readonly number[], s: number): Vec3 {
  return [a[0] * s, a[1] * s, a[2] * s];
}

/** a + b. */
export function add3(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}

/** a − b. */
export function sub3(a: readonly number[], b: readonly number[]): Vec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}

/** a/|a|, or null when |a| ≤ `eps` (no direction). */
export function normalize3(a: readonly number[], eps = 1e-12): Vec3 | null {
  const n = norm3(a);
  return n > eps ? [a[0] / n, a[1] / n, a[2] / n] : null;
}

/**
 * The sign-canonical form of a direction: the first component with |c| > 1e-9 is positive.
 * Used where an axis and its opposite describe the same element.
 */
export function canonicalDirection(a: readonly number[]): Vec3 {
  for (let i = 0; i < 3; i++) {
    if (Math.abs(a[i]) > 1e-9) return a[i] > 0 ? [a[0], a[1], a[2]] : [-a[0], -a[1], -a[2]];
  }
  return [a[0], a[1], a[2]];
}

/** Rotation by `angle` about the unit `axis` (Rodrigues' formula). */
export function rotation3(axis: readonly number[], angle: number): Mat3 {
  const x = axis[0];
  const y = axis[1];
  const z = axis[2];
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const t = 1 - c;
  return [
    c + t * x * x, t * x * y - s * z, t * x * z + s * y,
    t * x * y + s * z, c + t * y * y, t * y * z - s * x,
    t * x * z - s * y, t * y * z + s * x, c + t * z * z,
  ];
}

/** Reflection through the plane through the origin with unit normal `n`: I − 2nnᵀ. */
export function reflection3(n: readonly number[]): Mat3 {
  const x = n[0];
  const y = n[1];
  const z = n[2];
  return [1 - 2 * x * x, -2 * x * y, -2 * x * z, -2 * x * y, 1 - 2 * y * y, -2 * y * z, -2 * x * z, -2 * y * z, 1 - 2 * z * z];
}

/** Improper rotation Sₙ-type: rotation by `angle` about unit `axis` followed by the reflection through the plane ⊥ axis. */
export function improper3(axis: readonly number[], angle: number): Mat3 {
  return mul3(rotation3(axis, angle), reflection3(axis));
}

/**
 * Axis and angle of a proper rotation matrix: the unit axis with the angle in [0, π] about it
 * (counter-clockwise). For angles below ~1e-9 the axis is meaningless and returned as z.
 * The axis comes from the symmetric part (stable near π), its sign from the antisymmetric part.
 */
export function axisAngle3(r: readonly number[]): { axis: Vec3; angle: number } {
  const tr = r[0] + r[4] + r[8];
  const cosA = Math.max(-1, Math.min(1, (tr - 1) / 2));
  const v: Vec3 = [(r[7] - r[5]) / 2, (r[2] - r[6]) / 2, (r[3] - r[1]) / 2]; // sin θ · axis
  const sinA = norm3(v);
  const angle = Math.atan2(sinA, cosA);
  if (angle < 1e-9) return { axis: [0, 0, 1], angle: 0 };
  // Symmetric part: (R + Rᵀ)/2 = cos θ I + (1 − cos θ) a aᵀ.
  const t = 1 - cosA;
  const d = [(r[0] - cosA) / t, (r[4] - cosA) / t, (r[8] - cosA) / t];
  let k = 0;
  if (d[1] > d[k]) k = 1;
  if (d[2] > d[k]) k = 2;
  const col: Vec3 = [0, 0, 0];
  for (let i = 0; i < 3; i++) {
    col[i] = i === k ? d[k] : (r[3 * i + k] + r[3 * k + i]) / 2 / t;
  }
  let axis = normalize3(col) ?? [0, 0, 1];
  if (sinA > 1e-12 && dot3(axis, v) < 0) axis = scale3(axis, -1);
  return { axis, angle };
}

/** An orthonormal right-handed basis (as matrix columns x, y, z) whose third column is the unit vector `z`. */
export function basisWithZ(z: readonly number[]): Mat3 {
  const helper = Math.abs(z[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const x = normalize3(sub3(helper, scale3(z, dot3(helper, z))))!;
  const y = cross3(z, x);
  return [x[0], y[0], z[0], x[1], y[1], z[1], x[2], y[2], z[2]];
}

/** The matrix with the given columns. */
export function fromColumns3(x: readonly number[], y: readonly number[], z: readonly number[]): Mat3 {
  return [x[0], y[0], z[0], x[1], y[1], z[1], x[2], y[2], z[2]];
}

/** Column `j` of `m`. */
export function column3(m: readonly number[], j: number): Vec3 {
  return [m[j], m[3 + j], m[6 + j]];
}
