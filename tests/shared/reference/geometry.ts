/**
 * Small, self-contained geometry helpers for the outside-reference tests. Deliberately independent
 * of `shared/engine`: the tests build and check geometries with this code, so an engine bug cannot
 * hide behind a shared helper. Lengths in Å, angles in degrees unless a name says radians.
 * Matrices are row-major 3×3 `number[]` of 9 acting on column vectors (x' = M x), as in
 * shared/contracts/structure.ts.
 */
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { mulberry32 } from '../../support/random';

export type Vec3 = [number, number, number];
export type Mat3 = number[];

/** An atom as the engine contract spells it (AtomJson). */
export interface Atom {
  element: string;
  x: number;
  y: number;
  z: number;
}

export const DEG = Math.PI / 180;
/** Golden ratio φ = (1 + √5)/2. */
export const PHI = (1 + Math.sqrt(5)) / 2;

export const add = (a: Vec3, b: Vec3): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
export const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
export const scale = (a: Vec3, s: number): Vec3 => [a[0] * s, a[1] * s, a[2] * s];
export const dot = (a: Vec3, b: Vec3): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const cross = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];
export const norm = (a: Vec3): number => Math.sqrt(dot(a, a));
export const unit = (a: Vec3): Vec3 => scale(a, 1 / norm(a));
export const dist = (a: Vec3, b: Vec3): number => norm(sub(a, b));
export const pos = (a: Atom): Vec3 => [a.x, a.y, a.z];
export const atom = (element: string, p: Vec3): Atom => ({ element, x: p[0], y: p[1], z: p[2] });

/** Angle a–b–c at b, degrees. */
export function angle(a: Vec3, b: Vec3, c: Vec3): number {
  // atan2 form: accurate near 0° and 180°, where acos loses half the digits.
  const u = sub(a, b);
  const v = sub(c, b);
  return Math.atan2(norm(cross(u, v)), dot(u, v)) / DEG;
}

/** Dihedral a–b–c–d, degrees in (−180, 180] (IUPAC sign convention). */
export function dihedral(a: Vec3, b: Vec3, c: Vec3, d: Vec3): number {
  const b0 = sub(a, b);
  const b1 = unit(sub(c, b));
  const b2 = sub(d, c);
  const v = sub(b0, scale(b1, dot(b0, b1)));
  const w = sub(b2, scale(b1, dot(b2, b1)));
  const x = dot(v, w);
  const y = dot(cross(b1, v), w);
  return Math.atan2(y, x) / DEG;
}

export const matVec = (m: Mat3, v: Vec3): Vec3 => [
  m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
  m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
  m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
];

export function matMul(a: Mat3, b: Mat3): Mat3 {
  const out = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++)
      for (let k = 0; k < 3; k++) out[3 * i + j] += a[3 * i + k] * b[3 * k + j];
  return out;
}

export const transpose = (m: Mat3): Mat3 => [m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]];

export const det = (m: Mat3): number =>
  m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);

export const IDENTITY: Mat3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];
export const INVERSION: Mat3 = [-1, 0, 0, 0, -1, 0, 0, 0, -1];

/** Proper rotation by `angleRad` about the (not necessarily unit) axis, right-handed (Rodrigues). */
export function rotation(axis: Vec3, angleRad: number): Mat3 {
  const [x, y, z] = unit(axis);
  const c = Math.cos(angleRad);
  const s = Math.sin(angleRad);
  const t = 1 - c;
  return [
    t * x * x + c, t * x * y - s * z, t * x * z + s * y,
    t * x * y + s * z, t * y * y + c, t * y * z - s * x,
    t * x * z - s * y, t * y * z + s * x, t * z * z + c,
  ];
}

/** Reflection through the plane through the origin with the given normal: I − 2nnᵀ. */
export function reflection(normal: Vec3): Mat3 {
  const [x, y, z] = unit(normal);
  return [1 - 2 * x * x, -2 * x * y, -2 * x * z, -2 * x * y, 1 - 2 * y * y, -2 * y * z, -2 * x * z, -2 * y * z, 1 - 2 * z * z];
}

/** Improper rotation S_n^k about the axis: reflection ⟂ axis after rotation by 2πk/n. */
export function improper(axis: Vec3, n: number, k = 1): Mat3 {
  return matMul(reflection(axis), rotation(axis, (2 * Math.PI * k) / n));
}

export const Z: Vec3 = [0, 0, 1];
export const X: Vec3 = [1, 0, 0];
export const Y: Vec3 = [0, 1, 0];
export const rotZ = (deg: number): Mat3 => rotation(Z, deg * DEG);

/** The four tetrahedral unit directions ±(1,1,1)-type with an even number of minus signs. */
export const TETRAHEDRAL: Vec3[] = [
  unit([1, 1, 1]),
  unit([1, -1, -1]),
  unit([-1, 1, -1]),
  unit([-1, -1, 1]),
];

/**
 * Closes a set of generator matrices into a finite group by repeated multiplication. Two
 * matrices are the same element when they agree to 1e-9 in every entry. Throws if the group
 * grows beyond `maxOrder` (a wrong generator would otherwise loop for ever).
 */
export function closeGroup(generators: readonly Mat3[], maxOrder = 240): Mat3[] {
  const same = (a: Mat3, b: Mat3) => a.every((v, i) => Math.abs(v - b[i]) < 1e-9);
  const group: Mat3[] = [IDENTITY];
  for (let i = 0; i < group.length; i++) {
    for (const g of generators) {
      const p = matMul(group[i], g);
      if (!group.some((h) => same(h, p))) {
        group.push(p);
        if (group.length > maxOrder) throw new Error(`group exceeds order ${maxOrder}`);
      }
    }
  }
  return group;
}

/** The distinct images of `seed` under every matrix of `group` (duplicates within 1e-6 Å dropped). */
export function orbit(group: readonly Mat3[], seed: Vec3): Vec3[] {
  const out: Vec3[] = [];
  for (const g of group) {
    const p = matVec(g, seed);
    if (!out.some((q) => dist(p, q) < 1e-6)) out.push(p);
  }
  return out;
}

/** Seeded PRNG shared by all tests (tests/support/random.ts). */
export { mulberry32 };

/**
 * Uniformly distributed random rotation from three uniforms in [0,1) (Shoemake's quaternion
 * method, Graphics Gems III, 1992 — from memory).
 */
export function randomRotation(u1: number, u2: number, u3: number): Mat3 {
  const a = Math.sqrt(1 - u1);
  const b = Math.sqrt(u1);
  const [w, x, y, z] = [a * Math.sin(2 * Math.PI * u2), a * Math.cos(2 * Math.PI * u2), b * Math.sin(2 * Math.PI * u3), b * Math.cos(2 * Math.PI * u3)];
  return [
    1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w),
    2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w),
    2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y),
  ];
}

/** A random permutation of 0…n−1 (Fisher–Yates), `perm[i]` = original index placed at i. */
export function randomPermutation(n: number, rand: () => number): number[] {
  const p = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [p[i], p[j]] = [p[j], p[i]];
  }
  return p;
}

/** A rigid motion + relabelling + noise of a structure, with what was done kept for checking. */
export interface Perturbed {
  atoms: Atom[];
  /** atoms[i] came from ideal[perm[i]]. */
  perm: number[];
  rotation: Mat3;
  shift: Vec3;
  noise: number;
}

/**
 * Rotates by a random rotation, shifts by up to ±5 Å, permutes the atoms and adds uniform noise
 * in [−noise, +noise] Å to every coordinate. Deterministic for a given seed.
 */
export function perturb(ideal: readonly Atom[], seed: number, noise: number): Perturbed {
  const rand = mulberry32(seed);
  const rot = randomRotation(rand(), rand(), rand());
  const shift: Vec3 = [10 * rand() - 5, 10 * rand() - 5, 10 * rand() - 5];
  const perm = randomPermutation(ideal.length, rand);
  const atoms = perm.map((k) => {
    const p = add(matVec(rot, pos(ideal[k])), shift);
    const n: Vec3 = [noise * (2 * rand() - 1), noise * (2 * rand() - 1), noise * (2 * rand() - 1)];
    return atom(ideal[k].element, add(p, n));
  });
  return { atoms, perm, rotation: rot, shift, noise };
}

/**
 * RMSD (Å) of two equally ordered point sets after optimal proper superposition (translation +
 * rotation, unweighted): Kabsch, Acta Cryst. A32, 922 (1976); A34, 827 (1978), with the
 * det-sign correction of steps 1–3 in shared/reference/methods.md (d). SVD from ml-matrix.
 */
export function kabschRmsd(p: readonly Vec3[], q: readonly Vec3[]): number {
  if (p.length !== q.length) throw new Error('kabschRmsd: point sets differ in size');
  const n = p.length;
  const cp = centroid(p);
  const cq = centroid(q);
  const P = p.map((v) => sub(v, cp));
  const Q = q.map((v) => sub(v, cq));
  const H = new Matrix(3, 3);
  for (let i = 0; i < n; i++)
    for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) H.set(a, b, H.get(a, b) + P[i][a] * Q[i][b]);
  const svd = new SingularValueDecomposition(H);
  const U = svd.leftSingularVectors;
  const V = svd.rightSingularVectors;
  const d = Math.sign(det(V.mmul(U.transpose()).to1DArray())) || 1;
  // R = V·diag(1, 1, d)·Uᵀ, then the residual summed explicitly: the closed form
  // Σ|p|² + Σ|q|² − 2(s1 + s2 + d·s3) cancels catastrophically near RMSD 0 (error ~1e-8 Å).
  const R = V.mmul(Matrix.diag([1, 1, d])).mmul(U.transpose()).to1DArray();
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const r = sub(matVec(R, P[i]), Q[i]);
    sum += dot(r, r);
  }
  return Math.sqrt(sum / n);
}

export function centroid(ps: readonly Vec3[], weights?: readonly number[]): Vec3 {
  let c: Vec3 = [0, 0, 0];
  let w = 0;
  ps.forEach((p, i) => {
    const wi = weights ? weights[i] : 1;
    c = add(c, scale(p, wi));
    w += wi;
  });
  return scale(c, 1 / w);
}

/**
 * Does `m` (about the origin) carry the structure onto itself, every atom onto an atom of the
 * same element within `tol` Å, as a permutation? Returns the largest mismatch (Infinity if no
 * bijective same-element matching exists within `tol`).
 */
export function operationResidual(atoms: readonly Atom[], m: Mat3, tol: number): number {
  const used = new Array<boolean>(atoms.length).fill(false);
  let worst = 0;
  for (const a of atoms) {
    const img = matVec(m, pos(a));
    let best = -1;
    let bestD = Infinity;
    atoms.forEach((b, j) => {
      if (b.element !== a.element || used[j]) return;
      const d = dist(img, pos(b));
      if (d < bestD) {
        bestD = d;
        best = j;
      }
    });
    if (best < 0 || bestD > tol) return Infinity;
    used[best] = true;
    worst = Math.max(worst, bestD);
  }
  return worst;
}

/**
 * Largest distance between matched atoms when two structures are the same up to atom order
 * (greedy nearest same-element matching; Infinity if some atom has no partner within `tol`).
 */
export function setDistance(a: readonly Atom[], b: readonly Atom[], tol: number): number {
  if (a.length !== b.length) return Infinity;
  const used = new Array<boolean>(b.length).fill(false);
  let worst = 0;
  for (const p of a) {
    let best = -1;
    let bestD = Infinity;
    b.forEach((q, j) => {
      if (q.element !== p.element || used[j]) return;
      const d = dist(pos(p), pos(q));
      if (d < bestD) {
        bestD = d;
        best = j;
      }
    });
    if (best < 0 || bestD > tol) return Infinity;
    used[best] = true;
    worst = Math.max(worst, bestD);
  }
  return worst;
}

/** Hill-order formula (C first, then H, then the rest alphabetically; without C, all alphabetical). */
export function hillFormula(atoms: readonly Atom[]): string {
  const counts = new Map<string, number>();
  for (const a of atoms) counts.set(a.element, (counts.get(a.element) ?? 0) + 1);
  const keys = [...counts.keys()].sort();
  const order = counts.has('C') ? ['C', ...(counts.has('H') ? ['H'] : []), ...keys.filter((k) => k !== 'C' && k !== 'H')] : keys;
  return order.map((k) => `${k}${counts.get(k) === 1 ? '' : counts.get(k)}`).join('');
}

/** All interatomic distances between atoms of the given elements, sorted ascending. */
export function distances(atoms: readonly Atom[], e1: string, e2: string): number[] {
  const out: number[] = [];
  for (let i = 0; i < atoms.length; i++)
    for (let j = i + 1; j < atoms.length; j++) {
      const a = atoms[i];
      const b = atoms[j];
      if ((a.element === e1 && b.element === e2) || (a.element === e2 && b.element === e1)) out.push(dist(pos(a), pos(b)));
    }
  return out.sort((u, v) => u - v);
}

/** Wraps atoms as the engine's MoleculeInput (shared/formats/types.ts); copies the atoms. */
export function asInput(name: string, atoms: readonly Atom[], charge = 0) {
  return { name, sourceFile: 'reference-molecules.md', frameIndex: 0, atoms: atoms.map((a) => ({ ...a })), charge, multiplicity: null };
}
