import { orthogonalFromCorrelation, correlation } from './kabsch';
import {
  axisAngle3,
  canonicalDirection,
  dot3,
  identity3,
  improper3,
  inversion3,
  rotation3,
  type Mat3,
  type Vec3,
} from './mat3';
import { nearestOfKind, type NeighbourGrid } from './neighbour-grid';
import { u8 } from './arena';

/** What a point-group element does geometrically. */
export type OpKind = 'identity' | 'rotation' | 'reflection' | 'inversion' | 'improper';

/**
 * The exact geometric type of an element of a finite point group: its determinant, its order m
 * (g^m = E) and the rotation angle of its proper part as a fraction j/m of a full turn. Two
 * elements with the same type are conjugate in O(3) (they differ only by the axis).
 */
export interface OpType {
  det: 1 | -1;
  kind: OpKind;
  /** Element order m. */
  order: number;
  /** Proper rotation: angle = 2πj/m in [0, π]. Improper: the rotation part is by −2πj/m. */
  j: number;
  /** Unit axis (rotation axis, mirror normal, improper axis), sign-canonical; [0,0,0] for E and i. */
  axis: Vec3;
}

/** Signature string of an OpType, equal exactly for conjugate types: `+1/5`, `-0/2` (σ), `-1/2` (i). */
export function typeSignature(t: Pick<OpType, 'det' | 'j' | 'order'>): string {
  // One string per type, made once: every found operation carries one.
  if (t.j >= 1024 || t.j < 0) return `${t.det > 0 ? '+' : '-'}${t.j}/${t.order}`;
  const key = (t.order * 1024 + t.j) * 2 + (t.det > 0 ? 1 : 0);
  let sig = signatures.get(key);
  if (sig === undefined) {
    sig = `${t.det > 0 ? '+' : '-'}${t.j}/${t.order}`;
    signatures.set(key, sig);
  }
  return sig;
}

const signatures = new Map<number, string>();

/** Greatest common divisor of two non-negative integers. */
export function gcd(a: number, b: number): number {
  while (b) {
    const r = a % b;
    a = b;
    b = r;
  }
  return a;
}

/** Least common multiple. */
export function lcm(a: number, b: number): number {
  return (a / gcd(a, b)) * b;
}

/** Order of a permutation (lcm of its cycle lengths); 0 if it exceeds `cap`. */
export function permutationOrder(perm: Int32Array, cap = 1 << 20): number {
  const n = perm.length;
  const seen = u8(n);
  let order = 1;
  for (let i = 0; i < n; i++) {
    if (seen[i]) continue;
    let len = 0;
    for (let j = i; !seen[j]; j = perm[j]) {
      seen[j] = 1;
      len++;
    }
    order = lcm(order, len);
    if (order > cap) return 0;
  }
  return order;
}

/**
 * Largest angle error (rad) accepted when snapping to an element of order m: a quarter of the
 * spacing 2π/m between allowed angles, at most 0.5 rad — a pairing whose best-fit angle is
 * farther from every allowed one is not a point-group element of that order.
 */
function maxAngleError(order: number): number {
  return Math.min(0.5, Math.PI / (2 * order));
}

/**
 * Snaps an orthogonal matrix `r` (determinant `det`) whose element order is known to be `order`
 * onto the nearest exact point-group element of that order: the axis is kept, the angle rounded
 * to a multiple of 2π/order. Returns null when no element of that order is near `r` (e.g. the
 * permutation has order 3 but the matrix is a rotation by 180°; see maxAngleError).
 */
export function regularize(r: Mat3, det: 1 | -1, order: number): { matrix: Mat3; type: OpType } | null {
  if (det === 1) {
    if (order === 1) return { matrix: identity3(), type: { det, kind: 'identity', order: 1, j: 0, axis: [0, 0, 0] } };
    const { axis, angle } = axisAngle3(r);
    const j = Math.round((angle * order) / (2 * Math.PI));
    if (j === 0 || gcd(j, order) !== 1 || Math.abs(angle - (2 * Math.PI * j) / order) > maxAngleError(order)) return null;
    const a = canonicalDirection(axis);
    const sign = dot3(a, axis) > 0 ? 1 : -1;
    return {
      matrix: rotation3(a, (sign * 2 * Math.PI * j) / order),
      type: { det, kind: 'rotation', order, j, axis: a },
    };
  }
  if (order % 2 !== 0) return null;
  const { axis, angle: psi } = axisAngle3(r.map((v) => -v));
  // −R = Rot(a, φ + π) for R = Rot(a, φ)·σ_a, so |φ| = π − ψ.
  const j = Math.round(((Math.PI - psi) * order) / (2 * Math.PI));
  if (Math.abs(Math.PI - psi - (2 * Math.PI * j) / order) > maxAngleError(order)) return null;
  const rotOrder = order / gcd(j, order);
  if (lcm(rotOrder, 2) !== order) return null;
  if (2 * j === order) {
    if (order !== 2) return null;
    return { matrix: inversion3(), type: { det, kind: 'inversion', order: 2, j: 1, axis: [0, 0, 0] } };
  }
  const a = canonicalDirection(axis);
  const sign = dot3(a, axis) > 0 ? 1 : -1;
  return {
    matrix: improper3(a, (-sign * 2 * Math.PI * j) / order),
    type: { det, kind: j === 0 ? 'reflection' : 'improper', order, j, axis: a },
  };
}

/** Context for matching operations against a structure: centred coordinates and their grid. */
export interface MatchContext {
  readonly y: Float64Array;
  readonly kinds: Int32Array;
  readonly grid: NeighbourGrid;
  /** Scratch: one flag per atom, reused by {@link matchOperation}. */
  readonly used: Uint8Array;
}

const scratch = new Float64Array(1);
/** The query point and radius handed to nearestOfKind (see there why not as numbers). */
const query = new Float64Array(4);

/** The partner of atom i under m: nearest atom of i's element to m·yᵢ within tol (−1 if none); squared distance in `out`. */
function partnerOf(ctx: MatchContext, m: Mat3, i: number, tol: number, out?: Float64Array): number {
  const { y } = ctx;
  const x = y[3 * i];
  const yy = y[3 * i + 1];
  const z = y[3 * i + 2];
  query[0] = m[0] * x + m[1] * yy + m[2] * z;
  query[1] = m[3] * x + m[4] * yy + m[5] * z;
  query[2] = m[6] * x + m[7] * yy + m[8] * z;
  query[3] = tol;
  return nearestOfKind(ctx.grid, query, ctx.kinds[i], out);
}

/**
 * Applies `m` to every atom and pairs each image with the nearest atom of the same element
 * within `tol` Å. Writes the pairing into `perm` and returns the largest image–partner distance
 * (the operation's residual), or Infinity when some image has no partner or two images claim
 * the same atom. O(N).
 */
export function matchOperation(ctx: MatchContext, m: Mat3, tol: number, perm: Int32Array): number {
  const n = ctx.kinds.length;
  const used = ctx.used;
  used.fill(0);
  let worst = 0;
  for (let i = 0; i < n; i++) {
    const j = partnerOf(ctx, m, i, tol, scratch);
    if (j < 0 || used[j]) return Infinity;
    used[j] = 1;
    perm[i] = j;
    if (scratch[0] > worst) worst = scratch[0];
  }
  return Math.sqrt(worst);
}

/** Like {@link matchOperation} on the listed atoms only, without the one-to-one check; true if all have partners. */
export function probeOperation(ctx: MatchContext, m: Mat3, tol: number, atoms: readonly number[], images?: Int32Array): boolean {
  for (let k = 0; k < atoms.length; k++) {
    const j = partnerOf(ctx, m, atoms[k], tol);
    if (j < 0) return false;
    if (images) images[k] = j;
  }
  return true;
}

/** Largest |M yᵢ − y_π(i)| (Å) for a given pairing. */
export function residualWithPermutation(y: Float64Array, m: Mat3, perm: Int32Array): number {
  let worst = 0;
  const n = perm.length;
  for (let i = 0; i < n; i++) {
    const x = y[3 * i];
    const yy = y[3 * i + 1];
    const z = y[3 * i + 2];
    const j = perm[i];
    const dx = m[0] * x + m[1] * yy + m[2] * z - y[3 * j];
    const dy = m[3] * x + m[4] * yy + m[5] * z - y[3 * j + 1];
    const dz = m[6] * x + m[7] * yy + m[8] * z - y[3 * j + 2];
    const d2 = dx * dx + dy * dy + dz * dz;
    if (d2 > worst) worst = d2;
  }
  return Math.sqrt(worst);
}

/**
 * The exact point-group element best fitting a pairing: the orthogonal matrix of the given
 * determinant minimising Σ|M yᵢ − y_π(i)|² (Procrustes), snapped by {@link regularize} to the
 * element order of the pairing. Null if the pairing is not that of a point-group element.
 */
export function fitElement(y: Float64Array, perm: Int32Array, det: 1 | -1): { matrix: Mat3; type: OpType } | null {
  let order = permutationOrder(perm, 256);
  if (order === 0) return null;
  if (det === -1 && order % 2 === 1) order *= 2;
  if (order > 256) return null;
  return regularize(orthogonalFromCorrelation(correlation(y, y, perm), det), det, order);
}
