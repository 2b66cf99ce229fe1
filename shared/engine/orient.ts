import { covalentRadius } from '../elements';
import { groupFamily } from './groups';
import { principalAxes } from './inertia';
import { identity3, mul3, rotation3, type Mat3 } from './mat3';
import type { PreparedMolecule } from './molecule';
import { buildNeighbourGrid, forEachClosePair } from './neighbour-grid';

/** Coordinates closer than this (Å) count as equal when ranking frames, and as "on an axis". */
const EPS = 1e-6;
/** Atoms bonded: distance ≤ BOND_FACTOR × (sum of covalent radii), common practice with no source. */
const BOND_FACTOR = 1.2;

const C2X: Mat3 = [1, 0, 0, 0, -1, 0, 0, 0, -1];

/**
 * The standard orientation of an exactly symmetric structure given in its group's canonical
 * frame (W): the proper rotation S such that S·W is the standard frame. Deterministic: the same
 * molecule, however rotated, shifted or atom-permuted, lands on the same points.
 *
 * The canonical frame already fixes what the rules fix (principal axis z; Dₙ, Dₙₕ, Dₙd a C₂ on x;
 * Cₙᵥ a mirror in xz; Cs mirror xy; cubic C₂/C₄ on x, y, z; icosahedral C₂ on x, y, z). What is
 * left is a finite choice among rotations that map the group onto itself (e.g. which of the
 * C₂′ axes lies on x, which way z points) and, for Cₙ, Cₙₕ, S₂ₙ and Cs, the angle about z, which
 * is fixed by putting an atom on the +x half-plane (candidates: each off-axis atom of the
 * heaviest element at the largest distance from z). The rules applied, in order:
 * 1. Mulliken, J. Chem. Phys. 23, 1997 (1955): planar C2v and planar D2h — x perpendicular to the
 *    molecular plane; D2 and D2h — z is the C₂ axis through the most atoms, then the one passing
 *    through the most bonds (bonds along the axis or crossing it; a bond is a pair within
 *    1.2 × the sum of Cordero covalent radii — common practice); non-planar D2/D2h then put on x the
 *    remaining axis through the most atoms, then bonds.
 * 2. C1 and Ci: principal axes of inertia (IUPAC masses): z = smallest moment, x = middle, y = largest
 *    (the Iʳ convention), signs chosen by rule 3.
 * 3. Tie-break among the remaining candidates: the largest canonical key. The key lists atoms
 *    sorted by mass (heaviest first; equal masses by symbol), then by z, x, y (larger first,
 *    values within 1e-6 Å equal), and compares the (z, x, y) triples in that order — so the
 *    heaviest atoms go to +z first, then to +x.
 */
export function standardOrientation(name: string, W: Float64Array, mol: PreparedMolecule): Mat3 {
  const candidates = candidateRotations(name, W, mol);
  if (candidates.length === 1) return candidates[0];
  let pool = candidates;
  const fam = name === 'C∞v' || name === 'D∞h' || name === 'Kh' ? null : groupFamily(name);
  if (fam && (name === 'C2v' || name === 'D2h' || name === 'D2')) pool = mullikenFilter(name, pool, W, mol);
  if (pool.length === 1) return pool[0];
  return pickByKey(pool, W, mol);
}

function rz(angle: number): Mat3 {
  return rotation3([0, 0, 1], angle);
}

function candidateRotations(name: string, W: Float64Array, mol: PreparedMolecule): Mat3[] {
  if (name === 'Kh') return [identity3()];
  if (name === 'C∞v' || name === 'D∞h') return [identity3(), C2X];
  const { family, n } = groupFamily(name);
  const withFlip = (list: Mat3[]) => list.flatMap((s) => [s, mul3(C2X, s)]);
  switch (family) {
    case 'C1':
    case 'Ci':
      return inertiaFrames(W, mol);
    case 'Cs':
    case 'Cn':
    case 'Cnh':
    case 'S2n':
      return withFlip(referenceAtomRotations(W, mol));
    case 'Cnv':
    case 'Dnh':
    case 'Dnd':
    case 'Dn':
      if (name === 'D2' || name === 'D2h') return cubeRotations();
      return withFlip(Array.from({ length: 2 * n }, (_, k) => rz((k * Math.PI) / n)));
    case 'T':
    case 'Td':
    case 'Th':
      return [identity3(), rz(Math.PI / 2)];
    default:
      return [identity3()];
  }
}

/** The 24 proper rotations permuting the coordinate axes (with signs). */
function cubeRotations(): Mat3[] {
  const out: Mat3[] = [];
  const perms = [
    [0, 1, 2],
    [1, 2, 0],
    [2, 0, 1],
    [0, 2, 1],
    [2, 1, 0],
    [1, 0, 2],
  ];
  for (const p of perms) {
    for (let s = 0; s < 8; s++) {
      const m = [0, 0, 0, 0, 0, 0, 0, 0, 0];
      for (let r = 0; r < 3; r++) m[3 * r + p[r]] = s & (1 << r) ? -1 : 1;
      const det =
        m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
      if (det > 0) out.push(m);
    }
  }
  return out;
}

/** Rotations about z putting each reference atom (heaviest off-axis, farthest from z) on +x. */
function referenceAtomRotations(W: Float64Array, mol: PreparedMolecule): Mat3[] {
  let bestMass = -1;
  let bestRho = -1;
  const n = mol.n;
  for (let i = 0; i < n; i++) {
    const rho = Math.hypot(W[3 * i], W[3 * i + 1]);
    if (rho <= EPS) continue;
    const m = mol.masses[i];
    if (m > bestMass + 1e-9 || (Math.abs(m - bestMass) <= 1e-9 && rho > bestRho + EPS)) {
      bestMass = m;
      bestRho = rho;
    }
  }
  if (bestMass < 0) return [identity3()];
  const out: Mat3[] = [];
  for (let i = 0; i < n; i++) {
    const rho = Math.hypot(W[3 * i], W[3 * i + 1]);
    if (Math.abs(mol.masses[i] - bestMass) <= 1e-9 && Math.abs(rho - bestRho) <= EPS) {
      out.push(rz(-Math.atan2(W[3 * i + 1], W[3 * i])));
    }
  }
  return out;
}

/** Principal-axis frames (z smallest moment, x middle, y largest) with the four proper sign choices. */
function inertiaFrames(W: Float64Array, mol: PreparedMolecule): Mat3[] {
  const { axes } = principalAxes(W, mol.masses);
  const [a, b, c] = axes; // ascending moments
  let rows = [b, c, a];
  const det =
    rows[0][0] * (rows[1][1] * rows[2][2] - rows[1][2] * rows[2][1]) -
    rows[0][1] * (rows[1][0] * rows[2][2] - rows[1][2] * rows[2][0]) +
    rows[0][2] * (rows[1][0] * rows[2][1] - rows[1][1] * rows[2][0]);
  if (det < 0) rows = [b, [-c[0], -c[1], -c[2]], a];
  const base: Mat3 = [...rows[0], ...rows[1], ...rows[2]];
  return [
    [1, 1, 1],
    [1, -1, -1],
    [-1, 1, -1],
    [-1, -1, 1],
  ].map(([p, q, r]) => [p * base[0], p * base[1], p * base[2], q * base[3], q * base[4], q * base[5], r * base[6], r * base[7], r * base[8]]);
}

function transform(S: Mat3, W: Float64Array): Float64Array {
  const n = W.length / 3;
  const X = new Float64Array(W.length);
  for (let i = 0; i < n; i++) {
    const a = W[3 * i];
    const b = W[3 * i + 1];
    const c = W[3 * i + 2];
    X[3 * i] = S[0] * a + S[1] * b + S[2] * c;
    X[3 * i + 1] = S[3] * a + S[4] * b + S[5] * c;
    X[3 * i + 2] = S[6] * a + S[7] * b + S[8] * c;
  }
  return X;
}

/** Bonds as atom pairs (distance ≤ 1.2 × sum of covalent radii). */
function bonds(W: Float64Array, mol: PreparedMolecule): [number, number][] {
  const radii = mol.kindSymbols.map((s) => covalentRadius(s));
  const maxR = Math.max(...radii);
  const reach = BOND_FACTOR * 2 * maxR;
  const out: [number, number][] = [];
  const grid = buildNeighbourGrid(W, mol.kinds, reach);
  forEachClosePair(grid, reach, (i, j, d) => {
    if (d <= BOND_FACTOR * (radii[mol.kinds[i]] + radii[mol.kinds[j]])) out.push([i, j]);
    return out.length < 20 * mol.n;
  });
  return out;
}

/** Mulliken's rules (see {@link standardOrientation}) as filters on the candidate rotations. */
function mullikenFilter(name: string, pool: Mat3[], W: Float64Array, mol: PreparedMolecule): Mat3[] {
  const n = mol.n;
  // Per canonical axis k: is the structure planar ⊥ k, atoms on k, bonds through k.
  const planar = [0, 1, 2].map((k) => {
    for (let i = 0; i < n; i++) if (Math.abs(W[3 * i + k]) > EPS) return false;
    return true;
  });
  const onAxis = [0, 1, 2].map((k) => {
    let c = 0;
    for (let i = 0; i < n; i++) {
      let off = 0;
      for (let d = 0; d < 3; d++) if (d !== k) off = Math.max(off, Math.abs(W[3 * i + d]));
      if (off <= EPS) c++;
    }
    return c;
  });
  const bondList = name === 'C2v' ? [] : bonds(W, mol);
  const throughAxis = [0, 1, 2].map((k) => {
    const [p, q] = [0, 1, 2].filter((d) => d !== k);
    let c = 0;
    for (const [i, j] of bondList) {
      const xi = W[3 * i + p];
      const yi = W[3 * i + q];
      const xj = W[3 * j + p];
      const yj = W[3 * j + q];
      const onI = Math.hypot(xi, yi) <= EPS;
      const onJ = Math.hypot(xj, yj) <= EPS;
      const len = Math.hypot(xi - xj, yi - yj);
      if (onI || onJ || (Math.abs(xi * yj - yi * xj) <= EPS * Math.max(len, 1) && xi * xj + yi * yj < 0)) c++;
    }
    return c;
  });
  // Which canonical axis a candidate puts on output x / z: row r of S is ±e_k.
  const axisOf = (S: Mat3, r: number) => [0, 1, 2].find((k) => Math.abs(S[3 * r + k]) > 0.5)!;
  const score = (S: Mat3): number[] => {
    const kx = axisOf(S, 0);
    const kz = axisOf(S, 2);
    if (name === 'C2v') return [planar[kx] ? 1 : 0];
    const isPlanar = planar.some(Boolean);
    return isPlanar
      ? [planar[kx] ? 1 : 0, onAxis[kz], throughAxis[kz]]
      : [onAxis[kz], throughAxis[kz], onAxis[kx], throughAxis[kx]];
  };
  let best: number[] | null = null;
  let out: Mat3[] = [];
  for (const S of pool) {
    const s = score(S);
    const cmp = best ? compareTuples(s, best) : 1;
    if (cmp > 0) {
      best = s;
      out = [S];
    } else if (cmp === 0) out.push(S);
  }
  return out;
}

function compareTuples(a: readonly number[], b: readonly number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] > b[i] ? 1 : -1;
  return 0;
}

/** The candidate with the largest canonical key (rule 3 of {@link standardOrientation}). */
function pickByKey(pool: Mat3[], W: Float64Array, mol: PreparedMolecule): Mat3 {
  const n = mol.n;
  const { masses, symbols } = mol;
  let bestS = pool[0];
  let bestX: Float64Array | null = null;
  let bestOrder: number[] = [];
  const cmpAtoms = (X: Float64Array) => (i: number, j: number) => {
    if (Math.abs(masses[i] - masses[j]) > 1e-9) return masses[j] - masses[i];
    if (symbols[i] !== symbols[j]) return symbols[i] < symbols[j] ? -1 : 1;
    for (const d of [2, 0, 1]) {
      const diff = X[3 * j + d] - X[3 * i + d];
      if (Math.abs(diff) > EPS) return diff;
    }
    return 0;
  };
  for (const S of pool) {
    const X = transform(S, W);
    const order = Array.from({ length: n }, (_, i) => i).sort(cmpAtoms(X));
    if (!bestX) {
      bestS = S;
      bestX = X;
      bestOrder = order;
      continue;
    }
    let verdict = 0;
    for (let p = 0; p < n && verdict === 0; p++) {
      const i = order[p];
      const j = bestOrder[p];
      for (const d of [2, 0, 1]) {
        const diff = X[3 * i + d] - bestX[3 * j + d];
        if (Math.abs(diff) > EPS) {
          verdict = diff > 0 ? 1 : -1;
          break;
        }
      }
    }
    if (verdict > 0) {
      bestS = S;
      bestX = X;
      bestOrder = order;
    }
  }
  return bestS;
}
