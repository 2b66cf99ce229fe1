import { principalAxes } from './inertia';
import {
  cross3,
  dot3,
  improper3,
  inversion3,
  norm3,
  normalize3,
  reflection3,
  rotation3,
  type Mat3,
  type Vec3,
} from './mat3';
import { gcd, matchOperation, probeOperation } from './operations';
import { addOperation, closeUnder, exactOperation, findOp, nextStamp, refineOperation, type OpStore, type SymOp } from './op-store';
import { f64, i32, copyI32 } from './arena';

/**
 * Candidate symmetry operations of a structure, found once at a loose tolerance (the store's
 * `tol`) and refined to their own best fit, so that each operation's residual no longer depends
 * on the tolerance asked for later. The generation follows the usual published outline
 * (Cotton 1990 ch. 3; Largent, Polik & Schmidt, J. Comput. Chem. 33, 1637 (2012); Beruski &
 * Vidal, J. Comput. Chem. 35, 290 (2014)), adapted to be O(N) per tested operation:
 *
 * - atoms are grouped into shells (same element, same distance from the centre within `tol`);
 *   every operation maps a shell onto itself;
 * - axes that can carry Cₙ (n ≥ 3) or Sₙ: the molecular principal axes of inertia, the principal
 *   axes of small shells, and directions of reference atoms; the possible orders n come from
 *   the ring sizes around the axis (n divides every ring of off-axis atoms);
 * - C₂ axes and mirror planes from the smallest non-axial shell with reference atoms r₀, r₁: a C₂
 *   sending r₀ to r_j has its axis along r₀ + r_j (or ⊥ r₀ when r_j = −r₀, then found from r₁
 *   or along r₀ × r₁); a mirror sending r₀ to r_j ≠ r₀ has normal r₀ − r_j (or contains r₀, then
 *   found from r₁ or along r₀ × r₁);
 * - for cubic and icosahedral structures, C₃/C₄/C₅ axes placed relative to each triple of
 *   mutually perpendicular C₂ axes (body diagonals, coordinate axes, (0, ±1, ±φ)).
 * Each operation found is closed with those found before it at once (op-store `closeUnder`), so
 * a candidate that is a product of known operations is recognised after the cheap probe.
 * Each candidate is first probed on a few atoms, then matched on all N atoms with the
 * neighbour grid, then refined (Procrustes fit to its pairing, angle snapped to 2π/n).
 */
export function generateCandidates(store: OpStore): void {
  const { mol, tol } = store;
  const { y, n } = mol;
  if (n < 2) return;
  const probe = probeAtoms(store);
  const exact = EXACT_RESIDUAL * Math.max(1, mol.radius);
  triedDirections.clear();
  const perm = i32(n);
  const images = i32(probe.length);

  const tryMatrix = (m: Mat3, det: 1 | -1): boolean => {
    if (!probeOperation(store.ctx, m, tol, probe, images)) return false;
    // probe[0], probe[1] are the anchors: the key is known before the O(N) match.
    const key = (images[0] * n + images[1]) * 2 + (det < 0 ? 1 : 0);
    if (findOp(store, key)) return true;
    const residual = matchOperation(store.ctx, m, tol, perm);
    if (!Number.isFinite(residual)) return false;
    // Exactly symmetric input (re-snaps, written files read back): the candidate built from
    // exact directions is already the best fit; only its type needs recording.
    const op = residual <= exact ? exactOperation(store, m, copyI32(perm), det) : refineOperation(store, copyI32(perm), det);
    if (!op) return false;
    if (addOperation(store, op) === op) {
      // Close what is known under the new operation at once: the candidates that are products
      // of found operations are then recognised after the cheap probe, not matched again.
      matched.push(op);
      closeUnder(store, matched, tol, 256);
    }
    return true;
  };
  const matched: SymOp[] = [];
  // Each (operation type, direction) is tried once; directions within ~5e-4 rad count as equal.
  const once = (tag: number, d: Vec3): boolean => {
    // sign-canonical without allocating: flip so that the first clearly non-zero component is positive
    const s = Math.abs(d[0]) > 1e-9 ? Math.sign(d[0]) : Math.abs(d[1]) > 1e-9 ? Math.sign(d[1]) : Math.sign(d[2]) || 1;
    const q0 = Math.round(d[0] * s * 2000) + 2000;
    const q1 = Math.round(d[1] * s * 2000) + 2000;
    const q2 = Math.round(d[2] * s * 2000) + 2000;
    return triedDirections.add(tag * 4001 + q0, q1 * 4001 + q2);
  };
  const testAxis = (d: Vec3 | null, orders: readonly number[]) => {
    if (!d) return;
    for (const order of orders) {
      if (!once(order, d)) continue;
      if (tryMatrix(rotation3(d, (2 * Math.PI) / order), 1) && once(100 + order, d)) {
        tryMatrix(improper3(d, Math.PI / order), -1);
      }
    }
  };
  const testMirror = (d: Vec3 | null) => {
    if (d && once(0, d)) tryMatrix(reflection3(d), -1);
  };

  tryMatrix(inversion3(), -1);

  const shells = buildShells(store);
  const inertia = principalAxes(y, mol.masses);
  const highOrderAxes: Vec3[] = [...inertia.axes];
  const pairShells: number[][] = [];
  // Shells from the smallest: axial ones only add directions; the first non-axial shell (and a
  // second one when the first has at most 3 atoms) supplies the pair-derived candidates.
  for (const shell of shells.list) {
    const r0 = atomVector(y, shell[0]);
    if (normalize3(r0, tol) === null) continue; // atom at the centre
    highOrderAxes.push(r0);
    if (shell.length >= 3) highOrderAxes.push(...principalAxes(y, null, shell).axes);
    if (referenceAtoms(y, shell, tol).length >= 2) pairShells.push(shell);
    if ((pairShells.length >= 1 && pairShells[0].length > 3) || pairShells.length >= 2 || highOrderAxes.length > 40) break;
  }

  // Rings are read from all atoms, or in large structures from the 8 smallest shells only.
  const ringShells = n <= 4000 ? Infinity : 8;
  for (const a of highOrderAxes) {
    const d = normalize3(a);
    if (!d || !once(99, d)) continue;
    testAxis(d, possibleOrders(store, d, shells, ringShells));
    testMirror(d);
  }
  for (const shell of pairShells) {
    const refs = referenceAtoms(y, shell, tol);
    const r0 = atomVector(y, refs[0]);
    for (const j of shell) {
      const rj = atomVector(y, j);
      testAxis(normalize3([r0[0] + rj[0], r0[1] + rj[1], r0[2] + rj[2]], tol), [2]);
      if (j !== refs[0]) testMirror(normalize3([r0[0] - rj[0], r0[1] - rj[1], r0[2] - rj[2]], tol));
    }
    if (refs.length < 2) continue;
    // Operations that send r₀ to −r₀ (C₂ ⊥ r₀) or keep it (mirror containing r₀) are found from
    // r₁, among directions ⊥ r₀ only; those that also do so to r₁ lie along r₀ × r₁.
    const r1 = atomVector(y, refs[1]);
    const perpendicular = (d: Vec3 | null) => (d && Math.abs(dot3(d, r0)) <= 2 * tol ? d : null);
    for (const j of shell) {
      const rj = atomVector(y, j);
      testAxis(perpendicular(normalize3([r1[0] + rj[0], r1[1] + rj[1], r1[2] + rj[2]], tol)), [2]);
      if (j !== refs[1]) testMirror(perpendicular(normalize3([r1[0] - rj[0], r1[1] - rj[1], r1[2] - rj[2]], tol)));
    }
    const c = normalize3(cross3(r0, r1));
    testAxis(c, [2]);
    testMirror(c);
  }
  // Cubic and icosahedral groups force an isotropic inertia tensor; skip the extra axes unless
  // the moments agree within 20 % (loose enough for structures 0.3 Å from such symmetry).
  const { moments } = inertia;
  if (moments[2] - moments[0] <= 0.2 * moments[2]) augmentCubic(store, testAxis);
}

/**
 * The (operation type, direction) pairs tried in the current structure, as pairs of 32-bit
 * integers (tag·4001 + q₀, q₁·4001 + q₂) in an open-addressing table on typed arrays. A Set of
 * the combined number was slower: the combined key exceeds the small-integer range, so every
 * key was a heap number (the profile put about 7 % of candidate generation there).
 */
export class PairSet {
  private hi = new Int32Array(256);
  private lo = new Int32Array(256);
  /** A slot is used when its stamp equals `generation`; clear() starts a new generation. */
  private stamp = new Int32Array(256);
  private generation = 1;
  private size = 0;

  clear(): void {
    this.size = 0;
    this.generation = nextStamp(this.stamp, this.generation);
  }

  /** Adds (a, b); false when it was there already. */
  add(a: number, b: number): boolean {
    const mask = this.stamp.length - 1;
    let h = (Math.imul(a, 0x9e3779b1) ^ Math.imul(b, 0x85ebca6b)) & mask;
    while (this.stamp[h] === this.generation) {
      if (this.hi[h] === a && this.lo[h] === b) return false;
      h = (h + 1) & mask;
    }
    this.stamp[h] = this.generation;
    this.hi[h] = a;
    this.lo[h] = b;
    if (++this.size * 2 > this.stamp.length) this.grow();
    return true;
  }

  private grow(): void {
    const { hi, lo, stamp, generation } = this;
    this.hi = new Int32Array(2 * hi.length);
    this.lo = new Int32Array(2 * hi.length);
    this.stamp = new Int32Array(2 * hi.length);
    this.generation = 1;
    this.size = 0;
    for (let i = 0; i < stamp.length; i++) if (stamp[i] === generation) this.add(hi[i], lo[i]);
  }
}

/** The directions tried by {@link generateCandidates} (synchronous: one table serves every structure). */
const triedDirections = new PairSet();

/** Residual (Å per Å of radius) below which a candidate is taken as exact and not re-fitted. */
const EXACT_RESIDUAL = 1e-9;

/** Atoms probed before a full match: the two anchors, then atoms spread over the structure. */
function probeAtoms(store: OpStore): number[] {
  const { n, y } = store.mol;
  const out = [store.a1, store.a2];
  // the atom farthest from the anchors' plane, then a few spread by index
  const u = atomVector(y, store.a1);
  const v = atomVector(y, store.a2);
  const w = normalize3(cross3(u, v));
  if (w) {
    let best = -1;
    let a3 = -1;
    for (let i = 0; i < n; i++) {
      const d = Math.abs(dot3(w, atomVector(y, i)));
      if (d > best) {
        best = d;
        a3 = i;
      }
    }
    if (a3 >= 0 && !out.includes(a3)) out.push(a3);
  }
  const step = Math.max(1, Math.floor(n / 6));
  for (let i = 0; i < n && out.length < 9; i += step) if (!out.includes(i)) out.push(i);
  return out;
}

function atomVector(y: Float64Array, i: number): Vec3 {
  return [y[3 * i], y[3 * i + 1], y[3 * i + 2]];
}

/** Shells of a structure (see {@link buildShells}) and each atom's shell index. */
interface Shells {
  /** Atom indices of each shell, smallest shell first. */
  readonly list: number[][];
  /** Index into `list` of each atom's shell. */
  readonly shellOf: Int32Array;
}

/**
 * Shells: atoms of one element whose distances from the centre chain together within `tol`,
 * ordered by size (smallest first), then by radius (largest first), then by first atom index.
 * Every operation matched at `tol` maps each shell onto itself (an atom's partner lies within
 * `tol` of its image, whose distance from the centre is the atom's own).
 */
function buildShells(store: OpStore): Shells {
  const { y, n, kinds } = store.mol;
  const r = f64(n);
  for (let i = 0; i < n; i++) r[i] = Math.sqrt(y[3 * i] ** 2 + y[3 * i + 1] ** 2 + y[3 * i + 2] ** 2);
  // Atoms by element, then distance, then index (insertion sort for small structures: a sort
  // with a comparator costs more than the whole shell pass there).
  const order = i32(n);
  for (let i = 0; i < n; i++) order[i] = i;
  if (n <= 128) {
    for (let i = 1; i < n; i++) {
      const v = order[i];
      const kv = kinds[v];
      const rv = r[v];
      let p = i - 1;
      while (p >= 0 && (kinds[order[p]] > kv || (kinds[order[p]] === kv && r[order[p]] > rv))) {
        order[p + 1] = order[p];
        p--;
      }
      order[p + 1] = v;
    }
  } else order.sort((a, b) => kinds[a] - kinds[b] || r[a] - r[b] || a - b);
  const shells: number[][] = [];
  let cur: number[] = [];
  for (let k = 0; k < n; k++) {
    const i = order[k];
    const prev = cur.length ? cur[cur.length - 1] : -1;
    if (prev >= 0 && (kinds[prev] !== kinds[i] || r[i] - r[prev] > store.tol)) {
      shells.push(cur);
      cur = [];
    }
    cur.push(i);
  }
  if (cur.length) shells.push(cur);
  const rad = (s: number[]) => r[s[0]];
  shells.sort((a, b) => a.length - b.length || rad(b) - rad(a) || a[0] - b[0]);
  const shellOf = i32(n);
  for (let k = 0; k < shells.length; k++) for (const i of shells[k]) shellOf[i] = k;
  return { list: shells, shellOf };
}

/**
 * Two atoms of a shell not on one line through the centre: the first, and the one farthest from
 * its line (just the first when the shell is axial). Two suffice: a C₂ (mirror) that sends both
 * to their antipodes (keeps both) has its axis (normal) along r₀ × r₁, which is tried.
 */
function referenceAtoms(y: Float64Array, shell: readonly number[], tol: number): number[] {
  const r0 = atomVector(y, shell[0]);
  const u = normalize3(r0);
  if (!u) return [];
  let i1 = -1;
  let best = 2 * tol;
  for (const j of shell) {
    const d = norm3(cross3(u, atomVector(y, j)));
    if (d > best) {
      best = d;
      i1 = j;
    }
  }
  return i1 < 0 ? [shell[0]] : [shell[0], i1];
}

/** Largest rotation order tested about one axis. */
export const MAX_AXIS_ORDER = 32;

/**
 * Orders n ≥ 2 a rotation about unit axis `d` could have: n must divide the number of off-axis
 * atoms of each element in each ring (atoms at the same height along `d`, chained within tol).
 * With no off-axis atom at all (a linear arrangement) only 2 is proposed. The rings are found
 * by sorting heights; first, the same divisibility is required of each shell's off-axis atoms
 * (O(N), no sort), which already rules out most directions of low-symmetry structures.
 */
function possibleOrders(store: OpStore, d: Vec3, shells: Shells, ringShells: number): number[] {
  const { y, kinds, n } = store.mol;
  const tol = store.tol;
  // Off-axis atoms per shell: every orbit of an off-axis atom under Cₙ has n atoms of one shell.
  const shellCount = shells.list.length;
  if (offAxisCounts.length < shellCount) offAxisCounts = new Int32Array(Math.max(shellCount, 2 * offAxisCounts.length));
  if (firstHeights.length < shellCount) firstHeights = new Float64Array(Math.max(shellCount, 2 * firstHeights.length));
  // One sortable number per off-axis ring atom (an atom of the first `ringShells` shells):
  // element id · 1e7 + height (|height| < 1e6 Å).
  if (orderKeys.length < n) orderKeys = new Float64Array(Math.max(n, 2 * orderKeys.length));
  const keys = orderKeys;
  let m = 0;
  const perShell = offAxisCounts;
  perShell.fill(0, 0, shellCount);
  let offAxis = 0;
  for (let i = 0; i < n; i++) {
    const x = y[3 * i];
    const v = y[3 * i + 1];
    const z = y[3 * i + 2];
    const h = x * d[0] + v * d[1] + z * d[2];
    if (x * x + v * v + z * z - h * h > tol * tol) {
      const s = shells.shellOf[i];
      // A shell of two off-axis atoms: a rotation about d must swap them, and rotations keep
      // the height along d, so their heights must agree within tol (inversion pairs seldom do).
      if (shells.list[s].length === 2) {
        if (perShell[s] === 0) firstHeights[s] = h;
        else if (Math.abs(h - firstHeights[s]) > tol) return [];
      }
      perShell[s]++;
      offAxis++;
      if (s < ringShells) keys[m++] = kinds[i] * 1e7 + h;
    }
  }
  if (offAxis === 0) return [2];
  let shellGcd = 0;
  for (let k = 0; k < shellCount && shellGcd !== 1; k++) if (perShell[k] > 0) shellGcd = gcd(shellGcd, perShell[k]);
  if (shellGcd === 1) return [];
  if (m === 0) return [2];
  const sorted = sortPrefix(keys, m);
  let g = 0;
  let run = 1;
  for (let k = 1; k <= m; k++) {
    if (k < m && sorted[k] - sorted[k - 1] <= tol) run++;
    else {
      g = gcd(g, run);
      run = 1;
    }
  }
  const out: number[] = [];
  for (let n = 2; n <= Math.min(g, MAX_AXIS_ORDER); n++) if (g % n === 0) out.push(n);
  return out;
}

/** Scratch for the per-shell counts and first heights of {@link possibleOrders}. */
let offAxisCounts = new Int32Array(64);
let firstHeights = new Float64Array(64);

/** Scratch for {@link possibleOrders} (the engine is synchronous, so one buffer suffices). */
let orderKeys = new Float64Array(256);

/** The first m entries of `a` sorted ascending, in place (insertion sort when short). */
function sortPrefix(a: Float64Array, m: number): Float64Array {
  if (m > 48) return a.subarray(0, m).sort();
  for (let i = 1; i < m; i++) {
    const v = a[i];
    let k = i - 1;
    while (k >= 0 && a[k] > v) {
      a[k + 1] = a[k];
      k--;
    }
    a[k + 1] = v;
  }
  return a;
}

/** Axes of order 3, 4 and 5 placed relative to triples of mutually perpendicular C₂ axes. */
function augmentCubic(store: OpStore, testAxis: (d: Vec3 | null, orders: readonly number[]) => void): void {
  const c2: Vec3[] = [];
  for (const op of store.byKey.values()) {
    if (op.det === 1 && op.order === 2 && op.residual <= store.tol) c2.push(op.axis);
  }
  if (c2.length < 3) return;
  const phi = (1 + Math.sqrt(5)) / 2;
  let triples = 0;
  for (let a = 0; a < c2.length && triples < 2; a++) {
    for (let b = a + 1; b < c2.length && triples < 2; b++) {
      if (Math.abs(dot3(c2[a], c2[b])) > 0.1) continue;
      for (let c = b + 1; c < c2.length && triples < 2; c++) {
        if (Math.abs(dot3(c2[a], c2[c])) > 0.1 || Math.abs(dot3(c2[b], c2[c])) > 0.1) continue;
        triples++;
        const ex = c2[a];
        const ez = normalize3(cross3(ex, c2[b]))!;
        const ey = cross3(ez, ex);
        const at = (p: number, q: number, r: number): Vec3 | null =>
          normalize3([p * ex[0] + q * ey[0] + r * ez[0], p * ex[1] + q * ey[1] + r * ez[1], p * ex[2] + q * ey[2] + r * ez[2]]);
        for (const s of [
          [1, 1, 1],
          [1, 1, -1],
          [1, -1, 1],
          [-1, 1, 1],
        ]) {
          testAxis(at(s[0], s[1], s[2]), [3]);
        }
        testAxis(ex, [4]);
        testAxis(ey, [4]);
        testAxis(ez, [4]);
        for (const s of [1, -1]) {
          for (const [p, q] of [
            [1, phi],
            [phi, 1],
          ]) {
            testAxis(at(0, p, s * q), [5]);
            testAxis(at(p, s * q, 0), [5]);
            testAxis(at(s * q, 0, p), [5]);
          }
        }
      }
    }
  }
}
