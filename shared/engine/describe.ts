import type { OperationJson, StructureResult } from '../contracts/structure';
import type { Analysis } from './analysis';
import { elementResiduals, type FrameFit } from './fit-frame';
import { labelElements, type ElementLabel } from './labels';
import { apply3, canonicalDirection, identity3, inversion3, mul33, transpose3, type Mat3, type Vec3 } from './mat3';
import { standardOrientation } from './orient';
import { i32 } from './arena';

/** A fitted group put in its standard frame: what every report is built from. */
export interface OrientedFit {
  readonly fit: FrameFit;
  /** Canonical → standard frame rotation. */
  readonly S: Mat3;
  readonly labels: readonly ElementLabel[];
}

/** Fits a found group and orients it (see fit-frame.ts and orient.ts). */
export function orientFit(a: Analysis, fit: FrameFit): OrientedFit {
  // Orbits under the proper rotations only: atoms related by a rotation give the same frame.
  const orbitOf = i32(a.mol.n);
  const properPerms = fit.perms.filter((_, k) => fit.ideal.elements[k].det > 0);
  equivalenceClasses(a.mol.n, properPerms).forEach((c, k) => c.forEach((i) => (orbitOf[i] = k)));
  const rotations = fit.ideal.elements.filter((e) => e.det > 0).map((e) => e.matrix);
  const S = standardOrientation(fit.name, fit.W, a.mol, orbitOf, rotations);
  const labels = labelElements(fit.ideal.name, fit.ideal, S);
  return { fit, S, labels };
}

/**
 * Orbits of atoms under a group, given the permutations of all its elements (a closed set, as
 * fits hold), each orbit sorted, ordered by first atom.
 */
export function equivalenceClasses(n: number, perms: readonly Int32Array[]): number[][] {
  // The orbit of atom i is {π(i) : π in the group}: every permutation of the group is listed, so
  // one pass from each not yet classified atom (in index order) finds its whole orbit.
  const classOf = i32(n).fill(-1);
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (classOf[i] >= 0) continue;
    const k = count++;
    classOf[i] = k;
    for (const p of perms) if (classOf[p[i]] < 0) classOf[p[i]] = k;
  }
  // Members in index order, so each orbit comes out sorted without a sort.
  const classes: number[][] = [];
  for (let k = 0; k < count; k++) classes.push([]);
  for (let i = 0; i < n; i++) classes[classOf[i]].push(i);
  return classes;
}

/**
 * Operations and symmetry elements of an oriented fit, expressed in the frame whose axes, seen
 * from the standard frame, are the rows of `toOut` (identity: standard frame; Sᵀ·Qᵀ: the
 * centred input frame). For C∞v and D∞h the operations are the C2v / D2h subset with the
 * infinite axis on z, and that axis is reported with order 0 (∞).
 */
export function describe(
  o: OrientedFit,
  toOut: Mat3,
): { operations: OperationJson[]; elements: StructureResult['elements'] } {
  const { fit, S, labels } = o;
  const residuals = elementResiduals(fit);
  const St = transpose3(S);
  const outT = transpose3(toOut);
  const linear = fit.name === 'C∞v' || fit.name === 'D∞h';
  const identityOut = toOut.every((v, i) => v === (i % 4 === 0 ? 1 : 0));
  const unsorted: OperationJson[] = fit.ideal.elements.map((e, k) => {
    // E and i are ±I in every frame: written exactly, not as Q·I·Qᵀ with rounding.
    const exact = e.kind === 'identity' ? identity3() : e.kind === 'inversion' ? inversion3() : null;
    const std = exact ?? mul33(S, e.matrix, St);
    const m = exact ?? (identityOut ? std : mul33(toOut, std, outT));
    const perm = fit.perms[k];
    const permutation = plainCopy(perm);
    const l = labels[k];
    const axis = l.kind === 'identity' || l.kind === 'inversion' ? ([0, 0, 0] as Vec3) : canonicalDirection(apply3(toOut, l.axis));
    return {
      symbol: l.symbol,
      kind: l.kind,
      order: l.order,
      power: l.power,
      axis: cleanZeros(axis) as [number, number, number],
      matrix: cleanZeros(m),
      permutation,
      residual: residuals[k],
    };
  });
  // Equal ranks (e.g. the three C₂ of D2h) are ordered by axis, z then x then y, larger first, so
  // the listing does not depend on which equivalent frame the fit happened to find.
  const operations = unsorted
    .map((op, k) => ({ op, rank: operationRank(labels[k]) }))
    .sort((a, b) => compareTuples(a.rank, b.rank) || compareAxes(b.op.axis, a.op.axis))
    .map((x) => x.op);
  const axes: StructureResult['elements']['axes'] = [];
  const planes: StructureResult['elements']['planes'] = [];
  const axisIndex = new Map<string, number>();
  const keyOf = (v: Vec3) => `${Math.round(v[0] * 1e6)},${Math.round(v[1] * 1e6)},${Math.round(v[2] * 1e6)}`;
  // Each label's axis key once (the loops below ask for most of them twice or three times).
  const keys = labels.map((l) => (l.kind === 'rotation' || l.kind === 'improper' ? keyOf(l.axis) : ''));
  let maxOrder = 0;
  for (const l of labels) if (l.kind === 'rotation' && l.order > maxOrder) maxOrder = l.order;
  const maxAxes = new Set<string>();
  labels.forEach((l, k) => {
    if (l.kind === 'rotation' && l.order === maxOrder) maxAxes.add(keys[k]);
  });
  const zKey = keyOf([0, 0, 1]);
  const principalKey = linear || (maxAxes.size > 1 && maxAxes.has(zKey) && maxOrder === 2) ? zKey : maxAxes.size === 1 ? [...maxAxes][0] : null;
  for (let k = 0; k < labels.length; k++) {
    const l = labels[k];
    if (l.kind === 'rotation') {
      const key = keys[k];
      let idx = axisIndex.get(key);
      if (idx === undefined) {
        idx = axes.length;
        axisIndex.set(key, idx);
        axes.push({ order: 0, direction: [0, 0, 0], improperOrder: null, principal: key === principalKey });
        axes[idx].direction = cleanZeros(canonicalDirection(apply3(toOut, l.axis))) as [number, number, number];
      }
      axes[idx].order = Math.max(axes[idx].order, l.order);
    }
  }
  for (let k = 0; k < labels.length; k++) {
    const l = labels[k];
    if (l.kind === 'improper') {
      const idx = axisIndex.get(keys[k]);
      if (idx !== undefined) axes[idx].improperOrder = Math.max(axes[idx].improperOrder ?? 0, l.order);
    } else if (l.kind === 'reflection') {
      planes.push({ normal: cleanZeros(canonicalDirection(apply3(toOut, l.axis))) as [number, number, number], kind: l.planeKind ?? 'σ' });
    }
  }
  if (linear) {
    const idx = axisIndex.get(zKey);
    if (idx !== undefined) {
      axes[idx].order = 0;
      axes[idx].improperOrder = fit.name === 'D∞h' ? 0 : null;
    }
  }
  // A fixed order for equivalent elements too: principal axis first, then by order and direction;
  // planes by class (σh, σv, σv′, σd, σ), then normal.
  axes.sort(
    (a, b) =>
      Number(b.principal) - Number(a.principal) ||
      (b.order === 0 ? Infinity : b.order) - (a.order === 0 ? Infinity : a.order) ||
      compareAxes(b.direction, a.direction),
  );
  planes.sort((a, b) => (PLANE_RANK[a.kind] ?? 5) - (PLANE_RANK[b.kind] ?? 5) || compareAxes(b.normal, a.normal));
  return { operations, elements: { axes, planes, inversionCentre: labels.some((l) => l.kind === 'inversion') } };
}

const PLANE_RANK: Record<string, number> = { σh: 0, σv: 1, 'σv′': 2, σd: 3, σ: 4 };

/**
 * Sort key giving the customary order of a character table's header: E, proper rotations
 * (highest order first; C2′ then C2″ after the other C2), i, improper rotations (highest order
 * first), mirrors (σh, σv, σv′, σd, σ); powers ascending.
 */
function operationRank(l: ElementLabel): number[] {
  const primes = l.symbol.includes('″') ? 2 : l.symbol.includes('′') ? 1 : 0;
  switch (l.kind) {
    case 'identity':
      return [0, 0, 0, 0];
    case 'rotation':
      return [1, -l.order, primes, l.power];
    case 'inversion':
      return [2, 0, 0, 0];
    case 'improper':
      return [3, -l.order, 0, l.power];
    default:
      return [4, PLANE_RANK[l.symbol] ?? 5, 0, 0];
  }
}

/**
 * A plain-array copy of a permutation. Short ones are pushed, so the array is packed:
 * JSON.stringify writes a holey array (new Array(n) filled by index) about 2× slower. Long ones
 * are preallocated: growing a 10⁵-entry array by push costs 3× the fill.
 */
function plainCopy(perm: Int32Array): number[] {
  const n = perm.length;
  if (n > 4096) {
    const out = new Array<number>(n);
    for (let i = 0; i < n; i++) out[i] = perm[i];
    return out;
  }
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(perm[i]);
  return out;
}

/** Entries below 1e-14 in magnitude (rounding noise of exact zeros) set to 0. */
export function cleanZeros(v: readonly number[]): number[] {
  return v.map((c) => (Math.abs(c) < 1e-14 ? 0 : c));
}


function compareTuples(a: readonly number[], b: readonly number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] - b[i];
  return 0;
}

function compareAxes(a: readonly number[], b: readonly number[]): number {
  for (const d of [2, 0, 1]) if (Math.abs(a[d] - b[d]) > 1e-9) return a[d] - b[d];
  return 0;
}
