import type * as z from 'zod';
import type { AtomJson, transformSchema } from '@shared/contracts/structure';
import { atomicWeight, covalentRadius, normalizeElement } from '@shared/elements';

/** A point or vector in Å. */
export type Vec3 = [number, number, number];
export type Transform = z.infer<typeof transformSchema>;

/** Extra length (Å) beyond the sum of covalent radii within which two atoms count as bonded (common practice, no single source). */
export const BOND_SLACK = 0.45;
/** Pairs closer than this (Å) are overlapping atoms, not a bond; the close-contact flag reports them. */
const MIN_BOND_LENGTH = 0.1;

/** Radius used for a symbol that is not an element (dummy atoms): never bonded. */
function radiusOf(symbol: string): number | null {
  return normalizeElement(symbol) ? covalentRadius(symbol) : null;
}

/**
 * Bonds for drawing: atoms i < j are bonded when their distance d satisfies
 * 0.1 Å ≤ d < r_i + r_j + 0.45 Å (covalent radii of Cordero et al. 2008 from shared/elements).
 * A uniform grid of cells keeps this near-linear for large structures.
 * @returns index pairs [i, j] with i < j, sorted.
 */
export function perceiveBonds(atoms: readonly AtomJson[], slack = BOND_SLACK): Array<[number, number]> {
  const radii = atoms.map((a) => radiusOf(a.element));
  const maxRadius = Math.max(0, ...radii.map((r) => r ?? 0));
  const cell = 2 * maxRadius + slack || 1;
  const grid = new Map<string, number[]>();
  const key = (a: AtomJson) => [Math.floor(a.x / cell), Math.floor(a.y / cell), Math.floor(a.z / cell)];
  atoms.forEach((a, i) => {
    const k = key(a).join(',');
    const list = grid.get(k);
    if (list) list.push(i);
    else grid.set(k, [i]);
  });
  const bonds: Array<[number, number]> = [];
  atoms.forEach((a, i) => {
    const ri = radii[i];
    if (ri === null) return;
    const [cx, cy, cz] = key(a);
    for (let dx = -1; dx <= 1; dx++)
      for (let dy = -1; dy <= 1; dy++)
        for (let dz = -1; dz <= 1; dz++) {
          for (const j of grid.get(`${cx + dx},${cy + dy},${cz + dz}`) ?? []) {
            const rj = radii[j];
            if (j <= i || rj === null) continue;
            const b = atoms[j];
            const d = Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);
            if (d >= MIN_BOND_LENGTH && d < ri + rj + slack) bonds.push([i, j]);
          }
        }
  });
  return bonds.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
}

/** x' = R x + t with R row-major 3×3 acting on column vectors (the contract's convention). */
export function applyTransform(atoms: readonly AtomJson[], transform: Transform): AtomJson[] {
  const R = transform.rotation;
  const [tx, ty, tz] = transform.translation;
  return atoms.map((a) => ({
    element: a.element,
    x: R[0] * a.x + R[1] * a.y + R[2] * a.z + tx,
    y: R[3] * a.x + R[4] * a.y + R[5] * a.z + ty,
    z: R[6] * a.x + R[7] * a.y + R[8] * a.z + tz,
  }));
}

/**
 * Centre of mass (Å) with IUPAC standard atomic weights; every symmetry element passes through it,
 * so the viewer draws the elements there (the origin in the standard frame, elsewhere in the input frame).
 * Non-elements weigh nothing; with no weighted atom, the centroid.
 */
export function centreOfMass(atoms: readonly AtomJson[]): Vec3 {
  let m = 0;
  const c: Vec3 = [0, 0, 0];
  for (const a of atoms) {
    const w = normalizeElement(a.element) ? atomicWeight(a.element) : 0;
    m += w;
    c[0] += w * a.x;
    c[1] += w * a.y;
    c[2] += w * a.z;
  }
  if (m === 0) {
    const n = atoms.length || 1;
    return [atoms.reduce((s, a) => s + a.x, 0) / n, atoms.reduce((s, a) => s + a.y, 0) / n, atoms.reduce((s, a) => s + a.z, 0) / n];
  }
  return [c[0] / m, c[1] / m, c[2] / m];
}

/** Largest distance (Å) of an atom from `centre`; at least 1 Å so a single atom still gets visible elements. */
export function extent(atoms: readonly AtomJson[], centre: Vec3): number {
  let r = 0;
  for (const a of atoms) r = Math.max(r, Math.hypot(a.x - centre[0], a.y - centre[1], a.z - centre[2]));
  return Math.max(1, r);
}

/** Radius (Å) of the sphere drawn for an atom: a fraction of the covalent radius, so bonds stay visible. */
export function drawRadius(symbol: string): number {
  const r = radiusOf(symbol) ?? 0.7;
  return 0.18 + 0.22 * r;
}
