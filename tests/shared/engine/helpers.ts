/**
 * Test helpers for the engine's unit tests: synthetic structures built as orbits of seed points
 * under a group's exact matrices (labelled synthetic: not molecules), seeded random numbers,
 * rigid motions and noise.
 */
import type { AtomJson } from '@shared/contracts/structure';
import type { MoleculeInput } from '@shared/formats/types';
import { idealGroup } from '@shared/engine/groups';
import { apply3, normalize3, rotation3, type Mat3 } from '@shared/engine/mat3';
import { mulberry32 } from '../../support/random';

/** Seeded PRNG shared by all tests (tests/support/random.ts). */
export const rng = mulberry32;

/** Synthetic structure: the orbit of each seed point under the ideal group `name` (canonical frame). */
export function orbit(name: string, seeds: readonly { element: string; p: readonly number[] }[]): AtomJson[] {
  const g = idealGroup(name);
  const atoms: AtomJson[] = [];
  for (const s of seeds) {
    const pts: number[][] = [];
    for (const e of g.elements) {
      const q = apply3(e.matrix, s.p);
      if (!pts.some((p) => Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]) < 1e-6)) pts.push(q);
    }
    for (const q of pts) atoms.push({ element: s.element, x: q[0], y: q[1], z: q[2] });
  }
  return atoms;
}

/** Generic seeds (no extra symmetry for any group tested): two off-axis points and one on z. */
export const GENERIC_SEEDS = [
  { element: 'C', p: [1.3, 0.4, 0.7] },
  { element: 'H', p: [0.3, 2.1, -0.9] },
  { element: 'O', p: [0, 0, 1.5] },
];

/** A random proper rotation (axis uniform on the sphere by normalised Gaussian-free sampling). */
export function randomRotation(rand: () => number): Mat3 {
  const u = 2 * rand() - 1;
  const phi = 2 * Math.PI * rand();
  const axis = normalize3([Math.sqrt(1 - u * u) * Math.cos(phi), Math.sqrt(1 - u * u) * Math.sin(phi), u])!;
  return rotation3(axis, 2 * Math.PI * rand());
}

/** Rotates, translates, permutes and perturbs (uniform ±noise per coordinate) a structure. */
export function scramble(atoms: readonly AtomJson[], seed: number, noise = 0): { atoms: AtomJson[]; order: number[] } {
  const rand = rng(seed);
  const R = randomRotation(rand);
  const t = [rand() * 20 - 10, rand() * 20 - 10, rand() * 20 - 10];
  const order = atoms.map((_, i) => i);
  for (let i = order.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [order[i], order[j]] = [order[j], order[i]];
  }
  return {
    order,
    atoms: order.map((k) => {
      const a = atoms[k];
      const v = apply3(R, [a.x, a.y, a.z]);
      return {
        element: a.element,
        x: v[0] + t[0] + (2 * rand() - 1) * noise,
        y: v[1] + t[1] + (2 * rand() - 1) * noise,
        z: v[2] + t[2] + (2 * rand() - 1) * noise,
      };
    }),
  };
}

/** Wraps atoms as a MoleculeInput. */
export function input(atoms: AtomJson[], name = 'test', charge: number | null = null, multiplicity: number | null = null): MoleculeInput {
  return { name, sourceFile: 'test.xyz', frameIndex: 0, atoms, charge, multiplicity };
}

/** Largest distance from each atom of `a` to the nearest same-element atom of `b` (point-set distance). */
export function setDistance(a: readonly AtomJson[], b: readonly AtomJson[]): number {
  let worst = 0;
  for (const p of a) {
    let best = Infinity;
    for (const q of b) if (q.element === p.element) best = Math.min(best, Math.hypot(p.x - q.x, p.y - q.y, p.z - q.z));
    worst = Math.max(worst, best);
  }
  return worst;
}

/** Applies a row-major matrix to [x, y, z]. */
export function mv(m: readonly number[], a: AtomJson): number[] {
  return apply3(m, [a.x, a.y, a.z]);
}
