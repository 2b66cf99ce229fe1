/**
 * Test structures for point groups that have no molecule in reference-molecules.md (C4, C5, C6,
 * C8, C4h, C5h, C6h, D5, D6, S8): the orbits of two generic seed points (different elements)
 * under the group's matrices in the standard frame (frames.ts). A single orbit would not do —
 * the orbit of one point under Cn is a flat regular n-gon (Dnh) — but two orbits at different
 * heights with a generic relative turn keep exactly the group. `extraSymmetry` proves that for
 * each structure by trying every operation a larger group with the same principal axis could add.
 * "Model, not a molecule": coordinates in Å, chosen for the construction.
 */
import { type Atom, type Mat3, type Vec3, DEG, INVERSION, Z, atom, improper, matVec, operationResidual, reflection, rotation } from './geometry';
import { standardGroups } from './frames';

const SEEDS: [string, Vec3][] = [
  ['C', [1.3, 0.4, 0.7]],
  ['H', [0.5, 1.9, -0.9]],
];

/** Every image of both seeds under the group (the seeds' stabilisers are trivial: generic points). */
export function orbitStructure(group: string): Atom[] {
  const g = standardGroups(group)![0];
  const atoms: Atom[] = [];
  for (const [el, s] of SEEDS)
    for (const m of g) {
      const p = matVec(m, s);
      if (!atoms.some((a) => a.element === el && Math.hypot(a.x - p[0], a.y - p[1], a.z - p[2]) < 1e-6)) atoms.push(atom(el, p));
    }
  return atoms;
}

const same = (a: Mat3, b: Mat3) => a.every((v, i) => Math.abs(v - b[i]) < 1e-9);

/**
 * Operations that are NOT in `group` yet carry the structure onto itself within 0.05 Å. For a
 * structure whose symmetry axis is z and which has no other axis of order > 2, any larger
 * finite group keeps z and adds some of: Cm/Sm about z, σh, i, vertical mirrors, C2 ⟂ z. The
 * mirrors and C2 axes that could work must carry the first off-axis atom onto an atom of the
 * same element, which fixes their azimuth; every such candidate is tried.
 */
export function extraSymmetry(atoms: readonly Atom[], group: readonly Mat3[]): Mat3[] {
  const candidates: Mat3[] = [INVERSION, reflection(Z)];
  for (let m = 2; m <= 16; m++)
    for (let k = 1; k < m; k++) candidates.push(rotation(Z, (2 * Math.PI * k) / m), improper(Z, m, k));
  const a0 = atoms.find((a) => Math.hypot(a.x, a.y) > 0.1)!;
  const t0 = Math.atan2(a0.y, a0.x);
  for (const b of atoms) {
    if (b.element !== a0.element) continue;
    const beta = (t0 + Math.atan2(b.y, b.x)) / 2;
    for (const bb of [beta, beta + 90 * DEG]) {
      candidates.push(reflection([-Math.sin(bb), Math.cos(bb), 0]), rotation([Math.cos(bb), Math.sin(bb), 0], Math.PI));
    }
  }
  return candidates.filter((c) => !group.some((g) => same(g, c)) && operationResidual(atoms, c, 0.05) < Infinity);
}
