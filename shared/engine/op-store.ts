import { CLOSE_CONTACT_DISTANCE, type PreparedMolecule } from './molecule';
import { buildNeighbourGrid } from './neighbour-grid';
import {
  fitElement,
  matchOperation,
  permutationOrder,
  regularize,
  residualWithPermutation,
  typeSignature,
  type MatchContext,
  type OpType,
} from './operations';
import { identity3, mul3, type Mat3 } from './mat3';
import { i32, u8 } from './arena';

/**
 * One symmetry operation found in a structure: an exact point-group element (matrix in the
 * centred input frame, fitted to the data), the atom permutation it induces and its residual.
 */
export interface SymOp extends OpType {
  /** Identity of the operation within one structure (see {@link OpStore}). */
  readonly key: number;
  readonly perm: Int32Array;
  readonly matrix: Mat3;
  /** Largest |M yᵢ − y_π(i)| over atoms, Å: the smallest tolerance at which it is accepted. */
  readonly residual: number;
  /** {@link typeSignature} of the element. */
  readonly sig: string;
}

/**
 * All operations known for one structure, keyed by their action on two anchor atoms.
 *
 * Why two anchors suffice: an element of a point group acting on a structure that is not
 * linear is fixed by its determinant and the images of two atoms a₁, a₂ whose position vectors
 * are not parallel — if g and h agree there, g⁻¹h is a rotation fixing two independent vectors,
 * i.e. the identity (or, for det −1 vs +1, differs in determinant). So key(g) =
 * (π(a₁)·N + π(a₂))·2 + [det < 0] identifies g, and key(g∘h) is computed in O(1) from h's
 * anchor images and g's permutation. Closure checks are then O(|G|·|generators|), not O(|G|²·N).
 */
export interface OpStore {
  readonly mol: PreparedMolecule;
  readonly ctx: MatchContext;
  /** Loose tolerance (Å) at which candidates were matched. */
  readonly tol: number;
  readonly a1: number;
  readonly a2: number;
  readonly byKey: Map<number, SymOp>;
  readonly identity: SymOp;
  /**
   * For small structures (2N² keys ≤ {@link DENSE_KEYS}) the operations are also held in tables
   * indexed by key, shared by all stores and tagged with this store's id, so the innermost loops
   * need no hashing (see findOp); 0 when the store is too large for them.
   */
  readonly denseId: number;
}

/** Largest key space held in the shared tables (see OpStore.denseId). */
export const DENSE_KEYS = 1 << 16;
/** The operation last stored under each key, and the id of the store it belongs to. */
const denseOps: (SymOp | undefined)[] = new Array<SymOp | undefined>(DENSE_KEYS);
const denseOwner = new Int32Array(DENSE_KEYS);
/** Closure-walk marks: a key is in the current walk when its stamp equals the walk's generation. */
const walkStamp = new Int32Array(DENSE_KEYS);
let lastStoreId = 0;
let lastGeneration = 0;

/**
 * The stamp after `last` for an array of stamps (a slot counts as set when it holds the current
 * stamp, so a new stamp clears every slot at once): past 2³⁰ the array is zeroed and counting
 * starts again at 1.
 */
export function nextStamp(stamps: Int32Array, last: number): number {
  if (last + 1 < 1 << 30) return last + 1;
  stamps.fill(0);
  return 1;
}

/**
 * Keys written to the shared tables by the current store. The next store clears them: the
 * tables are long-lived, and an operation left in them would stay reachable after its structure
 * is done (the garbage collector would copy it and promote it to the old generation, where it
 * waits for a full collection). The owner is cleared too, so that a store still in use finds
 * its operations in its map.
 */
let denseKeys: number[] = [];

function nextStoreId(): number {
  for (const key of denseKeys) {
    denseOps[key] = undefined;
    denseOwner[key] = 0;
  }
  denseKeys = [];
  return (lastStoreId = nextStamp(denseOwner, lastStoreId));
}

function nextGeneration(): number {
  return (lastGeneration = nextStamp(walkStamp, lastGeneration));
}

/** Creates the store with the identity and the anchors (farthest atom; farthest from its line). */
export function createOpStore(mol: PreparedMolecule, tol: number): OpStore {
  const { y, n } = mol;
  let a1 = 0;
  let best = -1;
  for (let i = 0; i < n; i++) {
    const r2 = y[3 * i] ** 2 + y[3 * i + 1] ** 2 + y[3 * i + 2] ** 2;
    if (r2 > best + 1e-12) {
      best = r2;
      a1 = i;
    }
  }
  const u = [y[3 * a1], y[3 * a1 + 1], y[3 * a1 + 2]];
  const un = Math.sqrt(u[0] * u[0] + u[1] * u[1] + u[2] * u[2]) || 1;
  let a2 = a1;
  let bestD = -1;
  for (let i = 0; i < n; i++) {
    const cx = (y[3 * i + 1] * u[2] - y[3 * i + 2] * u[1]) / un;
    const cy = (y[3 * i + 2] * u[0] - y[3 * i] * u[2]) / un;
    const cz = (y[3 * i] * u[1] - y[3 * i + 1] * u[0]) / un;
    const d = cx * cx + cy * cy + cz * cz;
    if (d > bestD + 1e-12) {
      bestD = d;
      a2 = i;
    }
  }
  const grid = buildNeighbourGrid(y, mol.kinds, 2 * tol);
  const perm = i32(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  const store: OpStore = {
    mol,
    ctx: { y, kinds: mol.kinds, grid, used: u8(n) },
    tol,
    a1,
    a2,
    byKey: new Map(),
    identity: undefined as unknown as SymOp,
    denseId: 2 * n * n <= DENSE_KEYS ? nextStoreId() : 0,
  };
  const identity = makeOp(keyOf(store, perm, 1), perm, identity3(), 0, { det: 1, kind: 'identity', order: 1, j: 0, axis: [0, 0, 0] });
  (store as { identity: SymOp }).identity = identity;
  storeOp(store, identity);
  return store;
}

/**
 * A SymOp with its fields always in the same order (one object shape for every operation keeps
 * the engine's hot loops monomorphic; object spread here was a measured hotspot).
 */
function makeOp(key: number, perm: Int32Array, matrix: Mat3, residual: number, type: OpType, sig = typeSignature(type)): SymOp {
  return { det: type.det, kind: type.kind, order: type.order, j: type.j, axis: type.axis, key, perm, matrix, residual, sig };
}

/** Key of an operation from its permutation and determinant. */
export function keyOf(store: Pick<OpStore, 'a1' | 'a2' | 'mol'>, perm: Int32Array, det: number): number {
  return (perm[store.a1] * store.mol.n + perm[store.a2]) * 2 + (det < 0 ? 1 : 0);
}

/** Key of g∘h (first h, then g) in O(1). */
export function productKey(store: OpStore, g: SymOp, h: SymOp): number {
  return (g.perm[h.perm[store.a1]] * store.mol.n + g.perm[h.perm[store.a2]]) * 2 + (g.det * h.det < 0 ? 1 : 0);
}

/**
 * Fits an exact element to a permutation, re-pairs atoms by nearest neighbour under the fitted
 * matrix and repeats until the pairing is stable (≤ 4 rounds). Returns null if the pairing
 * does not belong to a point-group element or does not survive at the store's tolerance.
 */
export function refineOperation(store: OpStore, perm: Int32Array, det: 1 | -1): SymOp | null {
  const { y, closeContact } = store.mol;
  // Below half the shortest same-element distance no other atom can be nearer than the partner,
  // so the pairing is stable without a new search (no pair is closer than 0.5 Å unless flagged).
  const stable = (closeContact ? closeContact.distance : CLOSE_CONTACT_DISTANCE) / 2;
  let p = perm;
  for (let round = 0; round < 4; round++) {
    const fit = fitElement(y, p, det);
    if (!fit) return null;
    const r = residualWithPermutation(y, fit.matrix, p);
    if (r < stable) {
      return makeOp(keyOf(store, p, det), p, fit.matrix, r, fit.type);
    }
    const next = i32(p.length);
    const residual = matchOperation(store.ctx, fit.matrix, store.tol, next);
    if (!Number.isFinite(residual)) return null;
    let same = true;
    for (let i = 0; i < p.length; i++) {
      if (next[i] !== p[i]) {
        same = false;
        break;
      }
    }
    if (same) {
      return makeOp(keyOf(store, p, det), p, fit.matrix, residual, fit.type);
    }
    p = next;
  }
  return null;
}

/**
 * An operation taken as it is (its matrix already matches the pairing to rounding error): the
 * matrix is snapped to the exact element of the pairing's order and the residual re-measured.
 */
export function exactOperation(store: OpStore, matrix: Mat3, perm: Int32Array, det: 1 | -1): SymOp | null {
  let order = permutationOrder(perm, 256);
  if (det === -1 && order % 2 === 1) order *= 2;
  const reg = order > 0 && order <= 256 ? regularize(matrix, det, order) : null;
  if (!reg) return null;
  const residual = residualWithPermutation(store.mol.y, reg.matrix, perm);
  return makeOp(keyOf(store, perm, det), perm, reg.matrix, residual, reg.type);
}

/** Adds a refined operation unless one with the same key is already known; returns the stored one. */
export function addOperation(store: OpStore, op: SymOp): SymOp {
  const old = findOp(store, op.key);
  if (old) return old;
  storeOp(store, op);
  return op;
}

/**
 * g∘h as a stored operation. When it is not yet known its permutation is composed (so the found
 * operations always multiply like their permutations) and the exact element of the
 * permutation's order is fitted to that pairing, as for a matched operation (fitElement): an
 * operation's matrix and residual do not depend on whether it was met as a product or matched
 * directly. An impossible product is stored with residual Infinity so that it is computed once.
 */
export function product(store: OpStore, g: SymOp, h: SymOp): SymOp {
  const key = productKey(store, g, h);
  const known = findOp(store, key);
  if (known) return known;
  const n = store.mol.n;
  const perm = i32(n);
  for (let i = 0; i < n; i++) perm[i] = g.perm[h.perm[i]];
  const det = (g.det * h.det) as 1 | -1;
  // Fitted to its own pairing like every matched operation, so that an operation's residual
  // does not depend on whether it was met as a product or matched directly.
  const fit = fitElement(store.mol.y, perm, det);
  const op: SymOp = fit
    ? makeOp(key, perm, fit.matrix, residualWithPermutation(store.mol.y, fit.matrix, perm), fit.type)
    : makeOp(key, perm, mul3(g.matrix, h.matrix), Infinity, IMPOSSIBLE[det > 0 ? 0 : 1], '?');
  storeOp(store, op);
  return op;
}

/** The stored operation with this key, if any. */
export function findOp(store: OpStore, key: number): SymOp | undefined {
  // The shared table holds this store's operation unless another store has written there since
  // (then the map, which always holds everything, answers).
  if (store.denseId !== 0 && denseOwner[key] === store.denseId) return denseOps[key];
  return store.byKey.get(key);
}

function storeOp(store: OpStore, op: SymOp): void {
  store.byKey.set(op.key, op);
  if (store.denseId !== 0) {
    denseKeys.push(op.key);
    denseOps[op.key] = op;
    denseOwner[op.key] = store.denseId;
  }
}

/** Types given to impossible products (stored with residual ∞): proper, improper. */
const IMPOSSIBLE: readonly OpType[] = [
  { det: 1, kind: 'rotation', order: 0, j: 0, axis: [0, 0, 0] },
  { det: -1, kind: 'improper', order: 0, j: 0, axis: [0, 0, 0] },
];

/**
 * The closure of `generators` under composition, as long as every element has residual ≤ `tol`
 * and the group stays within `maxOrder` elements. Returns the elements (identity first) or
 * null when some product exceeds the tolerance (the operations do not close at `tol`); then
 * `failure.residual` is that product's residual (Infinity when the order limit was passed).
 */
export function closeUnder(
  store: OpStore,
  generators: readonly SymOp[],
  tol: number,
  maxOrder = 256,
  failure?: { residual: number },
): SymOp[] | null {
  const elements: SymOp[] = [store.identity];
  // Membership: a stamp per key when the store uses the shared tables, else a set.
  const dense = store.denseId !== 0;
  const generation = nextGeneration();
  const seen = dense ? null : new Set<number>();
  if (dense) walkStamp[store.identity.key] = generation;
  else seen!.add(store.identity.key);
  for (let k = 0; k < elements.length; k++) {
    const e = elements[k];
    for (let gi = 0; gi < generators.length; gi++) {
      const p = product(store, e, generators[gi]);
      if (dense ? walkStamp[p.key] === generation : seen!.has(p.key)) continue;
      if (!(p.residual <= tol)) {
        if (failure) failure.residual = p.residual;
        return null;
      }
      if (dense) walkStamp[p.key] = generation;
      else seen!.add(p.key);
      elements.push(p);
      if (elements.length > maxOrder) {
        if (failure) failure.residual = Infinity;
        return null;
      }
    }
  }
  return elements;
}
