import type { Analysis, FoundGroup } from './analysis';
import { EngineError } from './errors';
import { idealGroup, type IdealGroup } from './groups';
import { correlation, rotationFromCorrelation } from './kabsch';
import { basisWithZ, dot3, identity3, mul33, transpose3, type Mat3, type Vec3 } from './mat3';
import { productKey, type SymOp } from './op-store';
import { residualWithPermutation, type OpKind } from './operations';
import { projectOntoGroup } from './project';
import { f64, copyF64 } from './arena';

/**
 * A group fitted to a structure: the canonical frame located in the input (y ≈ Q·z), each
 * canonical element paired with the atom permutation it induces, and the projected (exactly
 * symmetric) coordinates in the canonical frame.
 */
export interface FrameFit {
  /** The fitted group's name (C∞v, D∞h, Kh included). */
  readonly name: string;
  /** Columns = canonical x, y, z axes in the centred input frame. */
  readonly Q: Mat3;
  /** The finite group whose matrices are used (for C∞v/D∞h: C2v/D2h stand-ins; Kh: C1). */
  readonly ideal: IdealGroup;
  /** Permutation of each ideal element (same order as ideal.elements). */
  readonly perms: readonly Int32Array[];
  /** The found element paired with each ideal element (empty for the linear groups and Kh). */
  readonly images: readonly FitElement[];
  /** Exactly symmetric coordinates in the canonical frame (centred). */
  readonly W: Float64Array;
  /** Coordinates of the input in the canonical frame, Qᵀy. */
  readonly Z: Float64Array;
}

/**
 * Fits the group found at some tolerance. Finite groups: an isomorphism from the canonical group
 * is found by mapping the canonical generators onto found operations of the same type and
 * extending along the canonical group's spanning tree; it must be a homomorphism (checked on
 * every element × generator — methods.md (a) requires π_{gh} = π_g∘π_h) and must map every
 * element onto one of the same type. The first such map whose frame (Procrustes fit of the
 * generator axes) reproduces all found matrices within a Frobenius distance of 0.5 is kept
 * (otherwise the best one). The frame is then refined by alternating projection and Procrustes
 * rotation, which minimises ‖Y − P_Q Y‖ (no step can increase it).
 * @throws EngineError('internal') if the found operations cannot be arranged as the group.
 * Linear groups: the best line through the centre; D∞h pairs atoms through the centre.
 */
export function fitGroup(a: Analysis, found: FoundGroup): FrameFit {
  if (found.name === 'Kh') return fitAtom(a);
  if (found.name === 'C∞v' || found.name === 'D∞h') return fitLinear(a, found.name);
  const store = a.store;
  return fitFinite(a.mol.y, found.name, found.elements, (g, h) => productKey(store, g as SymOp, h as SymOp), store.identity);
}

/**
 * What the fit needs of a found element: its identity, type signature, matrix (input frame),
 * permutation and axis. Found operations (SymOp) qualify; so do the elements of an already
 * fitted group, when a subgroup of it is fitted.
 */
export interface FitElement {
  readonly key: number;
  readonly sig: string;
  readonly matrix: Mat3;
  readonly perm: Int32Array;
  readonly kind: OpKind;
  readonly axis: Vec3;
}

/**
 * Fits the finite group `name` to a closed list of elements (input frame, centred coordinates
 * `y`); `compose(g, h)` is the key of g∘h, `identity` the identity element.
 */
export function fitFinite(
  y: Float64Array,
  name: string,
  elements: readonly FitElement[],
  compose: (g: FitElement, h: FitElement) => number,
  identity: FitElement,
): FrameFit {
  const ideal = idealGroup(name);
  const order = ideal.elements.length;
  if (elements.length !== order) {
    throw new EngineError('internal', `fitting ${name}: ${elements.length} operations for a group of order ${order}`);
  }
  const byKey = new Map<number, FitElement>();
  const bySig = new Map<string, FitElement[]>();
  for (const e of elements) {
    byKey.set(e.key, e);
    const list = bySig.get(e.sig);
    if (list) list.push(e);
    else bySig.set(e.sig, [e]);
  }
  const gens = ideal.generators;
  const choices = gens.map((g) => bySig.get(ideal.elements[g].sig) ?? []);
  let best: { images: FitElement[]; Q: Mat3; error: number } | null = null;
  const pick: FitElement[] = new Array(gens.length);
  const search = (k: number): boolean => {
    if (k === gens.length) {
      const images = extend(ideal, pick, byKey, compose, identity);
      if (!images || images.some((e, i) => e.sig !== ideal.elements[i].sig)) return false;
      const { Q, error } = frameFromImages(ideal, images);
      if (!best || error < best.error - 1e-12) best = { images, Q, error };
      // Type-preserving isomorphisms differ by rotations of the frame; the first whose matrices
      // agree with the found ones (Frobenius distance < 0.5 each) is as good as any.
      return best.error < 0.5;
    }
    for (const c of choices[k]) {
      pick[k] = c;
      if (search(k + 1)) return true;
    }
    return false;
  };
  search(0);
  if (!best) throw new EngineError('internal', `fitting ${name}: the found operations are not arranged like ${name}`);
  const { images } = best as { images: FitElement[]; Q: Mat3 };
  let Q = (best as { Q: Mat3 }).Q;
  const perms = images.map((e) => e.perm);
  const mats = ideal.elements.map((e) => e.matrix);
  let Z = toFrame(y, Q);
  let W = projectOntoGroup(Z, mats, perms);
  if (hasAxes(ideal)) {
    // Alternating minimisation converges linearly; stop once a step gains < 1e-8 of the cost.
    let cost = sqDist(Z, W);
    for (let it = 0; it < 25 && cost > 0; it++) {
      const R = rotationFromCorrelation(correlation(y, W));
      const Qn = transpose3(R);
      const Zn = toFrame(y, Qn);
      const Wn = projectOntoGroup(Zn, mats, perms);
      const cn = sqDist(Zn, Wn);
      if (!(cn < cost)) break;
      const gain = cost - cn;
      Q = Qn;
      Z = Zn;
      W = Wn;
      cost = cn;
      if (gain <= 1e-8 * cost + 1e-28) break;
    }
  }
  return { name, Q, ideal, perms, images, W, Z };
}

/**
 * Residual (Å) of each element of a fit: the largest |Q·D·Qᵀ yᵢ − y_π(i)| over atoms, computed
 * in the canonical frame as |D zᵢ − z_π(i)| (z = Qᵀy). Only reports need it, so it is not part
 * of every fit (the ladder fits many groups).
 */
export function elementResiduals(fit: FrameFit): number[] {
  return fit.ideal.elements.map((e, k) => residualWithPermutation(fit.Z, e.matrix, fit.perms[k]));
}

/**
 * Fits `subName`, the subgroup of an already fitted group made of the ideal elements `members`
 * (indices into parent.ideal.elements), with the parent's permutations.
 */
export function fitSubgroup(y: Float64Array, parent: FrameFit, members: readonly number[], subName: string): FrameFit {
  const order = parent.ideal.elements.length;
  const Qt = transpose3(parent.Q);
  const elements: FitElement[] = members.map((k) => {
    const e = parent.ideal.elements[k];
    const a = e.axis;
    const q = parent.Q;
    return {
      key: k,
      sig: e.sig,
      matrix: mul33(q, e.matrix, Qt),
      perm: parent.perms[k],
      kind: e.kind,
      axis: [q[0] * a[0] + q[1] * a[1] + q[2] * a[2], q[3] * a[0] + q[4] * a[1] + q[5] * a[2], q[6] * a[0] + q[7] * a[1] + q[8] * a[2]],
    };
  });
  const identity = elements.find((e) => e.key === 0)!;
  return fitFinite(y, subName, elements, (g, h) => parent.ideal.mul[g.key * order + h.key], identity);
}

function hasAxes(g: IdealGroup): boolean {
  return g.elements.some((e) => e.kind !== 'identity' && e.kind !== 'inversion');
}

function sqDist(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += (a[i] - b[i]) ** 2;
  return s;
}

/** Coordinates in the frame whose axes are the columns of Q: z = Qᵀy. */
export function toFrame(y: ArrayLike<number>, Q: Mat3): Float64Array {
  const n = y.length / 3;
  const z = f64(3 * n);
  for (let i = 0; i < n; i++) {
    const a = y[3 * i];
    const b = y[3 * i + 1];
    const c = y[3 * i + 2];
    z[3 * i] = Q[0] * a + Q[3] * b + Q[6] * c;
    z[3 * i + 1] = Q[1] * a + Q[4] * b + Q[7] * c;
    z[3 * i + 2] = Q[2] * a + Q[5] * b + Q[8] * c;
  }
  return z;
}

/** Maps canonical generators to `pick` and extends along the spanning tree; null unless a bijective homomorphism. */
function extend(
  ideal: IdealGroup,
  pick: readonly FitElement[],
  byKey: Map<number, FitElement>,
  compose: (g: FitElement, h: FitElement) => number,
  identity: FitElement,
): FitElement[] | null {
  const order = ideal.elements.length;
  const images: FitElement[] = new Array(order);
  images[0] = identity;
  const seen = new Set<number>([identity.key]);
  for (let k = 1; k < order; k++) {
    const img = byKey.get(compose(images[ideal.parent[k]], pick[ideal.via[k]]));
    if (!img || seen.has(img.key)) return null;
    seen.add(img.key);
    images[k] = img;
  }
  for (let e = 0; e < order; e++) {
    for (let gi = 0; gi < ideal.generators.length; gi++) {
      const target = images[ideal.mul[e * order + ideal.generators[gi]]];
      if (compose(images[e], pick[gi]) !== target.key) return null;
    }
  }
  return images;
}

/** Axis of an element with its sense when the element has one (angle ≠ π); `signed` false otherwise. */
function orientedAxis(m: Mat3, kind: OpKind, axis: Vec3): { axis: Vec3; signed: boolean } | null {
  if (kind === 'identity' || kind === 'inversion') return null;
  const r = kind === 'rotation' ? m : m.map((v) => -v);
  const v: Vec3 = [(r[7] - r[5]) / 2, (r[2] - r[6]) / 2, (r[3] - r[1]) / 2];
  const s = dot3(v, axis);
  if (Math.abs(s) < 1e-6) return { axis, signed: false };
  return { axis: s > 0 ? axis : [-axis[0], -axis[1], -axis[2]], signed: true };
}

/**
 * Frame Q (canonical → input) from the generators' axes: a Procrustes fit of the canonical
 * axes onto the found ones, trying both senses of the axes that have none (C₂, σ), scored by
 * the largest Frobenius distance between Q·D·Qᵀ and the found matrix over all elements.
 */
function frameFromImages(ideal: IdealGroup, images: readonly FitElement[]): { Q: Mat3; error: number } {
  const pairs: { a0: Vec3; b: Vec3; signed: boolean }[] = [];
  for (const g of ideal.generators) {
    const e = ideal.elements[g];
    const p = images[g];
    const ia = orientedAxis(e.matrix, e.kind, e.axis);
    const pa = orientedAxis(p.matrix, p.kind, p.axis);
    if (!ia || !pa) continue;
    pairs.push({ a0: ia.axis, b: pa.axis, signed: ia.signed && pa.signed });
  }
  const unsigned = pairs.map((p, i) => (p.signed ? -1 : i)).filter((i) => i >= 0);
  let best: { Q: Mat3; error: number } | null = null;
  // One direction only: the frame below does not depend on the senses, so one try suffices.
  const parallel = pairs.length > 0 && pairs.every((p) => Math.abs(dot3(p.a0, pairs[0].a0)) > 1 - 1e-9);
  const combos = pairs.length === 0 || parallel ? 1 : 1 << unsigned.length;
  for (let mask = 0; mask < combos; mask++) {
    let Q: Mat3;
    if (pairs.length === 0) Q = identity3();
    else if (parallel) {
      // one direction only: any rotation taking it onto the found axis will do
      const b = pairs[0].b;
      const t = dot3(pairs[0].a0, [0, 0, 1]) > 0 ? b : ([-b[0], -b[1], -b[2]] as Vec3);
      Q = basisWithZ(t);
    } else {
      const s = [0, 0, 0, 0, 0, 0, 0, 0, 0];
      pairs.forEach((p, i) => {
        const k = unsigned.indexOf(i);
        const sign = k >= 0 && mask & (1 << k) ? -1 : 1;
        for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) s[3 * r + c] += p.a0[r] * p.b[c] * sign;
      });
      Q = rotationFromCorrelation(s);
    }
    let error = 0;
    const stopAt = best ? best.error : Infinity;
    for (let k = 0; k < ideal.elements.length && error < stopAt; k++) {
      error = Math.max(error, conjugateDistance(Q, ideal.elements[k].matrix, images[k].matrix));
    }
    if (!best || error < best.error) best = { Q, error };
  }
  return best!;
}

/** ‖Q·D·Qᵀ − M‖_F without intermediate matrices. */
function conjugateDistance(Q: Mat3, D: Mat3, M: Mat3): number {
  let sum = 0;
  for (let r = 0; r < 3; r++) {
    // row r of Q·D
    const a0 = Q[3 * r] * D[0] + Q[3 * r + 1] * D[3] + Q[3 * r + 2] * D[6];
    const a1 = Q[3 * r] * D[1] + Q[3 * r + 1] * D[4] + Q[3 * r + 2] * D[7];
    const a2 = Q[3 * r] * D[2] + Q[3 * r + 1] * D[5] + Q[3 * r + 2] * D[8];
    for (let c = 0; c < 3; c++) {
      const v = a0 * Q[3 * c] + a1 * Q[3 * c + 1] + a2 * Q[3 * c + 2] - M[3 * r + c];
      sum += v * v;
    }
  }
  return Math.sqrt(sum);
}

function fitAtom(a: Analysis): FrameFit {
  const ideal = idealGroup('C1');
  return {
    name: 'Kh',
    Q: identity3(),
    ideal,
    perms: [a.store.identity.perm],
    images: [],
    W: f64(3),
    Z: copyF64(a.mol.y),
  };
}

function fitLinear(a: Analysis, name: 'C∞v' | 'D∞h'): FrameFit {
  const { y, n } = a.mol;
  const u = a.lineDirection;
  const Q = basisWithZ(u);
  const Z = toFrame(y, Q);
  const W = f64(3 * n);
  const inv = a.inversionPerm;
  const centro = name === 'D∞h' && inv;
  for (let i = 0; i < n; i++) {
    W[3 * i + 2] = centro ? (Z[3 * i + 2] - Z[3 * inv[i] + 2]) / 2 : Z[3 * i + 2];
  }
  // Stand-in finite group for reporting and the computational subgroup: C2v or D2h about z.
  const ideal = idealGroup(centro ? 'D2h' : 'C2v');
  const identity = a.store.identity.perm;
  const perms = ideal.elements.map((e) => (e.matrix[8] > 0 || !inv ? identity : inv));
  return { name, Q, ideal, perms, images: [], W, Z };
}
