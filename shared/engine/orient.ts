import { covalentRadius } from '../elements';
import { f64, i32 } from './arena';
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
 * 4. Frames giving the same points (related by a rotation of the group): the atom order decides —
 *    atom 1 as high as possible in (z, x, y), then atom 2, and so on. Snapping a structure
 *    already in the standard frame therefore moves no atom.
 * `rotations` are the group's proper rotations in the canonical frame (for rule 4).
 */
export function standardOrientation(
  name: string,
  W: Float64Array,
  mol: PreparedMolecule,
  orbitOf: Int32Array,
  rotations: readonly Mat3[],
): Mat3 {
  let pool = candidateRotations(name, W, mol, orbitOf);
  if (pool.length > 1 && (name === 'C2v' || name === 'D2h' || name === 'D2')) pool = mullikenFilter(name, pool, W, mol);
  if (pool.length > 1) pool = pickByKey(pool, W, mol);
  return pickByAtomOrder(pool, rotations, W);
}

/**
 * Rule 4: frames that give the same points (they differ by a rotation of the group) are told
 * apart by the atom order — the one putting atom 1 highest in (z, x, y), then atom 2, … wins.
 * So snapping an output that is already in the standard frame leaves every atom where it is.
 */
function pickByAtomOrder(pool: readonly Mat3[], rotations: readonly Mat3[], W: Float64Array): Mat3 {
  const n = W.length / 3;
  let best: Mat3 | null = null;
  for (const S of pool) {
    for (const g of rotations) {
      const T = mul3(S, g);
      if (!best) {
        best = T;
        continue;
      }
      let verdict = 0;
      for (let i = 0; i < n && verdict === 0; i++) {
        const p = W[3 * i];
        const q = W[3 * i + 1];
        const r = W[3 * i + 2];
        for (const row of [2, 0, 1]) {
          const diff =
            T[3 * row] * p + T[3 * row + 1] * q + T[3 * row + 2] * r - (best[3 * row] * p + best[3 * row + 1] * q + best[3 * row + 2] * r);
          if (Math.abs(diff) > EPS) {
            verdict = diff > 0 ? 1 : -1;
            break;
          }
        }
      }
      if (verdict > 0) best = T;
    }
  }
  return best ?? identity3();
}

function rz(angle: number): Mat3 {
  return rotation3([0, 0, 1], angle);
}

/**
 * Candidate rotations, one per class of frames that are not related by a proper operation of
 * the group (those give the same points, so trying them would only cost time).
 */
function candidateRotations(name: string, W: Float64Array, mol: PreparedMolecule, orbitOf: Int32Array): Mat3[] {
  if (name === 'Kh' || name === 'D∞h') return [identity3()];
  if (name === 'C∞v') return [identity3(), C2X];
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
      return withFlip(referenceAtomRotations(W, mol, orbitOf));
    case 'Cnv':
      // Rz(2πk/n) belong to the group; Rz(π/n) swaps the two mirror classes (even n); C2x flips z.
      return withFlip([identity3(), rz(Math.PI / n)]);
    case 'Dn':
    case 'Dnh':
    case 'Dnd':
      if (name === 'D2' || name === 'D2h') return axisPermutations();
      // C2x and Rz(2πk/n) are in the group; Rz(π/n) maps the C2′ set onto itself.
      return [identity3(), rz(Math.PI / n)];
    case 'T':
    case 'Td':
    case 'Th':
      return [identity3(), rz(Math.PI / 2)];
    default:
      return [identity3()];
  }
}

/** The 6 proper rotations taking the coordinate axes to each ordering of themselves (one per coset of D2). */
function axisPermutations(): Mat3[] {
  return [
    [1, 0, 0, 0, 1, 0, 0, 0, 1],
    [0, 1, 0, 0, 0, 1, 1, 0, 0],
    [0, 0, 1, 1, 0, 0, 0, 1, 0],
    [-1, 0, 0, 0, 0, 1, 0, 1, 0],
    [0, 0, 1, 0, -1, 0, 1, 0, 0],
    [0, 1, 0, 1, 0, 0, 0, 0, -1],
  ];
}

/**
 * Rotations about z putting a reference atom on +x: the off-axis atoms of the heaviest element
 * at the largest distance from z, one per orbit of the group's rotations (atoms related by a
 * rotation give the same points; atoms related only by an improper operation do not).
 */
function referenceAtomRotations(W: Float64Array, mol: PreparedMolecule, orbitOf: Int32Array): Mat3[] {
  let bestMass = -1;
  let bestRho = -1;
  const n = mol.n;
  for (let i = 0; i < n; i++) {
    const rho = Math.sqrt(W[3 * i] ** 2 + W[3 * i + 1] ** 2);
    if (rho <= EPS) continue;
    const m = mol.masses[i];
    if (m > bestMass + 1e-9 || (Math.abs(m - bestMass) <= 1e-9 && rho > bestRho + EPS)) {
      bestMass = m;
      bestRho = rho;
    }
  }
  if (bestMass < 0) return [identity3()];
  const out: Mat3[] = [];
  const orbits = new Set<number>();
  for (let i = 0; i < n; i++) {
    const rho = Math.sqrt(W[3 * i] ** 2 + W[3 * i + 1] ** 2);
    if (Math.abs(mol.masses[i] - bestMass) <= 1e-9 && Math.abs(rho - bestRho) <= EPS && !orbits.has(orbitOf[i])) {
      orbits.add(orbitOf[i]);
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

/** The candidates with the largest canonical key (rule 3 of {@link standardOrientation}). */
function pickByKey(pool: Mat3[], W: Float64Array, mol: PreparedMolecule): Mat3[] {
  // Compare element by element, heaviest first: usually the heaviest element decides.
  const groups = new Map<number, number[]>();
  for (let i = 0; i < mol.n; i++) {
    const list = groups.get(mol.kinds[i]) ?? [];
    list.push(i);
    groups.set(mol.kinds[i], list);
  }
  const ordered = [...groups.entries()]
    .sort(([ka, a], [kb, b]) => mol.masses[b[0]] - mol.masses[a[0]] || (mol.kindSymbols[ka] < mol.kindSymbols[kb] ? -1 : 1))
    .map(([, atoms]) => atoms);
  let alive = pool;
  for (const atoms of ordered) {
    if (alive.length === 1) break;
    let bestKeys: Float64Array | null = null;
    let next: Mat3[] = [];
    for (const S of alive) {
      const keys = sortedTriples(S, atoms, W);
      const cmp = bestKeys ? compareKeys(keys, bestKeys) : 1;
      if (cmp > 0) {
        bestKeys = keys;
        next = [S];
      } else if (cmp === 0) next.push(S);
    }
    alive = next;
  }
  return alive;
}

/** (z, x, y) of the atoms after rotation S, sorted descending (values within EPS equal), flattened. */
function sortedTriples(S: Mat3, atoms: readonly number[], W: Float64Array): Float64Array {
  const k = atoms.length;
  const t = f64(3 * k);
  for (let a = 0; a < k; a++) {
    const i = atoms[a];
    const p = W[3 * i];
    const q = W[3 * i + 1];
    const r = W[3 * i + 2];
    t[3 * a] = S[6] * p + S[7] * q + S[8] * r;
    t[3 * a + 1] = S[0] * p + S[1] * q + S[2] * r;
    t[3 * a + 2] = S[3] * p + S[4] * q + S[5] * r;
  }
  const idx = i32(k);
  for (let a = 0; a < k; a++) idx[a] = a;
  if (k <= 64) {
    // Insertion sort (stable, like the library sort) without a comparator call per step.
    for (let a = 1; a < k; a++) {
      const v = idx[a];
      let p = a - 1;
      while (p >= 0 && tripleAfter(t, idx[p], v)) {
        idx[p + 1] = idx[p];
        p--;
      }
      idx[p + 1] = v;
    }
  } else idx.sort((a, b) => (tripleAfter(t, a, b) ? 1 : tripleAfter(t, b, a) ? -1 : 0));
  const out = f64(3 * k);
  for (let pos = 0; pos < k; pos++) {
    const a = idx[pos];
    out[3 * pos] = t[3 * a];
    out[3 * pos + 1] = t[3 * a + 1];
    out[3 * pos + 2] = t[3 * a + 2];
  }
  return out;
}

/** Whether triple a comes after triple b in descending (z, x, y) order (values within EPS equal). */
function tripleAfter(t: Float64Array, a: number, b: number): boolean {
  for (let d = 0; d < 3; d++) {
    const diff = t[3 * b + d] - t[3 * a + d];
    if (Math.abs(diff) > EPS) return diff > 0;
  }
  return false;
}

function compareKeys(a: Float64Array, b: Float64Array): number {
  for (let i = 0; i < a.length; i++) {
    const diff = a[i] - b[i];
    if (Math.abs(diff) > EPS) return diff > 0 ? 1 : -1;
  }
  return 0;
}
