import { generateCandidates } from './candidates';
import { identifyGroup } from './identify';
import { bestLine } from './inertia';
import type { Vec3 } from './mat3';
import type { PreparedMolecule } from './molecule';
import { matchOperation } from './operations';
import { DENSE_KEYS, closeUnder, createOpStore, nextStamp, type OpStore, type SymOp } from './op-store';
import { i32 } from './arena';

/** Tolerance (Å) at which candidate operations are searched: the top of the ladder. */
export const CANDIDATE_TOLERANCE = 0.3;

/**
 * Everything perception learns about one structure, once: the candidate operations with their
 * residuals (tolerance-independent), the best line and the inversion pairing for the linear
 * groups. The group at any tolerance is then read off without touching the atoms again
 * (except to form products not met yet).
 */
export interface Analysis {
  readonly mol: PreparedMolecule;
  readonly store: OpStore;
  /** Direction of the best line through the centre of mass. */
  readonly lineDirection: Vec3;
  /** 2 × the largest distance of an atom from that line (Å): the residual of C∞ (its C₂). */
  readonly lineResidual: number;
  /** Inversion pairing and its residual (Å), if every atom has a partner within the loose tolerance. */
  readonly inversionPerm: Int32Array | null;
  readonly inversionResidual: number;
  /** Groups found so far by (prefix count, linear flags) — valid while the store has `cacheSize` operations. */
  readonly cache: Map<number, FoundGroup>;
  cacheSize: number;
  /** Closures of generator sets already formed (see {@link closeAt}), by their generators' keys. */
  readonly closures: ClosureNode;
  /** The store's operations by residual (see sortedOperations). */
  sorted: SymOp[];
  /** Where the last greedy walk of computeGroupAt stopped, to resume at a higher tolerance. */
  walk: {
    ops: readonly SymOp[];
    index: number;
    t: number;
    group: ClosureOutcome | null;
    gens: SymOp[];
    /** The closure trie's node for `gens`. */
    node: ClosureNode;
    notClosed: boolean;
    flipAbove: number;
  } | null;
}

/** Node of the trie of generator lists closed so far (children made when first needed). */
interface ClosureNode {
  outcome: ClosureOutcome | null;
  children: Map<number, ClosureNode> | null;
}

/**
 * What closing one set of generators showed, valid for every tolerance: the closure succeeds at
 * t exactly when t ≥ `worst` (its largest element residual), and is known to fail for t below
 * `failsBelow` (a product with that residual was met) or always (`elements` null, failsBelow ∞).
 */
interface ClosureOutcome {
  elements: SymOp[] | null;
  name: string | null;
  worst: number;
  failsBelow: number;
  /** Keys of the elements, for stores without the shared tables (made when first asked; see contains). */
  keys: Set<number> | null;
  /** The token its elements were last marked with in {@link memberMark} (0: never). */
  mark: number;
  /** FoundGroup.id, once asked for. */
  id: string | null;
}

/** The group perceived at one tolerance. */
export interface FoundGroup {
  readonly name: string;
  /** |G|, 0 for C∞v, D∞h and Kh. */
  readonly order: number;
  /** A tolerance at which this group is perceived (the first one it was computed for). */
  readonly tolerance: number;
  /** Elements (identity first) for finite groups; empty for the infinite ones. */
  readonly elements: readonly SymOp[];
  /** Some operation within the tolerance could not be added without breaking closure. */
  readonly notClosed: boolean;
  /** Identity of the element set (for memoising snaps). */
  readonly id: string;
}

/** Structures this close to a line (Å) are treated as exactly linear: no finite search. */
const EXACTLY_LINEAR = 1e-7;

/** Runs the tolerance-independent part of perception. `maxTolerance` ≥ the largest tolerance asked later. */
export function analyse(mol: PreparedMolecule, maxTolerance = CANDIDATE_TOLERANCE): Analysis {
  const tol = Math.max(CANDIDATE_TOLERANCE, maxTolerance);
  const store = createOpStore(mol, tol);
  const line = bestLine(mol.y);
  const lineResidual = mol.n <= 2 ? 0 : 2 * line.maxDistance;
  // The inversion is matched directly (not taken from the candidates): near a line, a fitted
  // improper operation with the inversion's pairing may come out as the mirror ⊥ the line.
  const inv = i32(mol.n);
  const inversionResidual = matchOperation(store.ctx, [-1, 0, 0, 0, -1, 0, 0, 0, -1], tol, inv);
  const inversionPerm = Number.isFinite(inversionResidual) ? inv : null;
  if (mol.n > 2 && lineResidual > EXACTLY_LINEAR * Math.max(1, mol.radius)) generateCandidates(store);
  return {
    mol,
    store,
    lineDirection: line.direction,
    lineResidual,
    inversionPerm,
    inversionResidual,
    cache: new Map(),
    cacheSize: 0,
    closures: { outcome: null, children: null },
    sorted: [],
    walk: null,
  };
}

/**
 * The group at tolerance `t` (Å): Kh for one atom; C∞v/D∞h when the structure is within `t` of
 * a line (D∞h if also of the inversion); otherwise the largest closed set of found operations
 * with residual ≤ t, built greedily in order of increasing residual — an operation whose
 * closure with the group so far would need a product beyond `t` (or cannot be named) is left
 * out and `notClosed` is set.
 */
export function groupAt(a: Analysis, t: number): FoundGroup {
  // The result depends on t only through the set of stored operations with residual ≤ t (a
  // prefix of them by residual, so its size identifies it) and the two linear tests; while the
  // store does not grow, equal keys give equal groups.
  const ops = sortedOperations(a);
  let lo = 0;
  let hi = ops.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (ops[mid].residual <= t) lo = mid + 1;
    else hi = mid;
  }
  const count = lo;
  if (a.cacheSize !== ops.length) {
    a.cache.clear();
    a.cacheSize = ops.length;
  }
  const key = 4 * count + (a.lineResidual <= t ? 2 : 0) + (a.inversionResidual <= t ? 1 : 0);
  const hit = a.cache.get(key);
  if (hit) return hit;
  const found = computeGroupAt(a, t);
  a.cache.set(key, found);
  return found;
}

function computeGroupAt(a: Analysis, t: number): FoundGroup {
  const { mol, store } = a;
  if (mol.n === 1) return { name: 'Kh', order: 0, tolerance: t, elements: [], notClosed: false, id: 'Kh' };
  if (a.lineResidual <= t) {
    const name = a.inversionResidual <= t ? 'D∞h' : 'C∞v';
    return { name, order: 0, tolerance: t, elements: [], notClosed: false, id: name };
  }
  const ops = sortedOperations(a);
  // The greedy walk at t is a prefix of the walk at any t′ > t as long as no operation it left
  // out could have been taken at t′ (each refusal records the tolerance above which it might
  // not hold): then the walk resumes where the last one stopped (the ladder asks in rising t).
  const last = a.walk;
  const resume = last !== null && last.ops === ops && last.t <= t && t < last.flipAbove;
  let group: ClosureOutcome | null = resume ? last.group : null;
  const gens: SymOp[] = resume ? [...last.gens] : [];
  // The trie node of the accepted generators: each step looks up one child, not the whole path.
  let node = resume ? last.node : a.closures;
  let notClosed = resume ? last.notClosed : false;
  const flip = { above: resume ? last.flipAbove : Infinity };
  let k = resume ? last.index : 0;
  for (; k < ops.length; k++) {
    const op = ops[k];
    if (!(op.residual <= t)) break;
    if (op === store.identity || (group && contains(store, group, op.key))) continue;
    gens.push(op);
    node.children ??= new Map();
    let child = node.children.get(op.key);
    if (!child) {
      child = { outcome: null, children: null };
      node.children.set(op.key, child);
    }
    const closed = closeAt(a, child, gens, t, flip);
    if (closed) {
      group = closed;
      node = child;
    } else {
      gens.pop();
      notClosed = true;
    }
  }
  // Products formed above may have grown the store; the next call then starts afresh.
  a.walk = { ops, index: k, t, group, gens, node, notClosed, flipAbove: flip.above };
  if (!group) return { name: 'C1', order: 1, tolerance: t, elements: [store.identity], notClosed, id: `C1:${store.identity.key}` };
  return new ClosedGroup(group, t, notClosed);
}

/**
 * Membership marks for the group a walk holds: key k is in the group whose `mark` equals
 * `memberMark[k]` and the last token handed out (a new group is marked when first asked about;
 * an array lookup instead of a hash set per group).
 */
const memberMark = new Int32Array(DENSE_KEYS);
let lastToken = 0;

/** Whether the operation with this key is an element of `group` (a successful closure). */
function contains(store: OpStore, group: ClosureOutcome, key: number): boolean {
  if (store.denseId === 0) return (group.keys ??= new Set(group.elements!.map((e) => e.key))).has(key);
  if (group.mark !== lastToken || lastToken === 0) {
    lastToken = nextStamp(memberMark, lastToken);
    group.mark = lastToken;
    for (const e of group.elements!) memberMark[e.key] = lastToken;
  }
  return memberMark[key] === lastToken;
}

/** A finite group found by the walk; its id is built only when asked for (fits are memoised by it, and most groups met are never fitted). */
class ClosedGroup implements FoundGroup {
  readonly name: string;
  readonly order: number;
  readonly elements: readonly SymOp[];

  constructor(
    private readonly outcome: ClosureOutcome,
    readonly tolerance: number,
    readonly notClosed: boolean,
  ) {
    this.name = outcome.name!;
    this.order = outcome.elements!.length;
    this.elements = outcome.elements!;
  }

  get id(): string {
    const o = this.outcome;
    if (o.id === null) {
      const keys = new Int32Array(o.elements!.length);
      for (let i = 0; i < keys.length; i++) keys[i] = o.elements![i].key;
      o.id = `${o.name}:${keys.sort().join(',')}`;
    }
    return o.id;
  }
}

/** The stored operations sorted by residual (then key), re-sorted only when the store has grown. */
function sortedOperations(a: Analysis): readonly SymOp[] {
  const byKey = a.store.byKey;
  if (a.sorted.length !== byKey.size) {
    a.sorted = [...byKey.values()].sort((p, q) => p.residual - q.residual || p.key - q.key);
  }
  return a.sorted;
}

/**
 * closeUnder(store, gens, t) and its group name, memoised across tolerances in `node`, the trie
 * node of `gens`: the ladder asks for the same generator sets at many tolerances. Gives exactly
 * what closeUnder would: the closure visits products in the same order whatever t is, so a
 * success with largest residual w decides every t (success iff t ≥ w), and a failure at a
 * product of residual r decides every t < r.
 */
function closeAt(a: Analysis, node: ClosureNode, gens: readonly SymOp[], t: number, flip: { above: number }): ClosureOutcome | null {
  // `node` is the generator list's node in a trie keyed by operation keys (no string building).
  const known = node.outcome;
  if (known) {
    if (known.elements) {
      if (known.name && t >= known.worst) return known;
      if (known.name) flip.above = Math.min(flip.above, known.worst);
      return null;
    }
    if (t < known.failsBelow) {
      flip.above = Math.min(flip.above, known.failsBelow);
      return null;
    }
  }
  const failure = { residual: Infinity };
  const elements = closeUnder(a.store, gens, t, undefined, failure);
  let outcome: ClosureOutcome;
  if (elements) {
    let worst = 0;
    for (const e of elements) if (e.residual > worst) worst = e.residual;
    outcome = { elements, name: identifyGroup(elements), worst, failsBelow: worst, keys: null, mark: 0, id: null };
  } else {
    outcome = { elements: null, name: null, worst: Infinity, failsBelow: failure.residual, keys: null, mark: 0, id: null };
  }
  node.outcome = outcome;
  if (outcome.elements && outcome.name) return outcome;
  if (!outcome.elements) flip.above = Math.min(flip.above, outcome.failsBelow);
  return null;
}
