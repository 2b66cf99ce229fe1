/**
 * Independent check that a structure sits in the standard frame of DESIGN.md ("The engine",
 * step 5), without reading the engine's own symmetry elements: the centre of mass (IUPAC 2021
 * weights) is at the origin, and every matrix of the group written in the standard frame
 * (frames.ts, from textbook generators) carries the structure onto itself with a same-element
 * permutation. Mulliken's rules (J. Chem. Phys. 23, 1997 (1955)) for planar C2v water and planar
 * D2h ethylene, and principal axes of inertia for C1/Ci, are checked directly.
 */
import { type Atom, type Mat3, centroid, det, operationResidual, pos } from './geometry';
import { standardGroups } from './frames';
import { IUPAC_WEIGHTS } from './group-facts';

/** Within this many Å an operation counts as mapping the structure onto itself. */
export const FRAME_TOLERANCE = 1e-8;

/** Human description of an orthogonal 3×3 matrix: "C(180°) about (1.000, 0.000, 0.000)" etc. */
export function describeOperation(m: Mat3): string {
  const d = det(m);
  const proper = d > 0 ? m : m.map((v) => -v);
  const trace = proper[0] + proper[4] + proper[8];
  const ang = Math.acos(Math.max(-1, Math.min(1, (trace - 1) / 2)));
  // Axis: the eigenvector of the proper part with eigenvalue 1 (largest row of R + Rᵀ + (1 − tr)I).
  const s = [0, 1, 2].map((i) => [0, 1, 2].map((j) => proper[3 * i + j] + proper[3 * j + i] + (i === j ? 1 - trace : 0)));
  const row = s.reduce((best, r) => (Math.hypot(...r) > Math.hypot(...best) ? r : best));
  const n = Math.hypot(...row) || 1;
  const axis = row.map((v) => (v / n).toFixed(3)).join(', ');
  const deg = ((ang * 180) / Math.PI).toFixed(1);
  if (d > 0) return ang < 1e-9 ? 'E' : `rotation by ${deg}° about (${axis})`;
  if (ang < 1e-9) return 'inversion';
  // An improper rotation −R: S by (180° − angle); a reflection is −C2.
  if (Math.abs(ang - Math.PI) < 1e-9) return `reflection in the plane with normal (${axis})`;
  return `improper rotation S by ${(180 - Number(deg)).toFixed(1)}° about (${axis})`;
}

/** Mass-weighted centre (IUPAC 2021 weights; throws for an element not in the table). */
export function centreOfMass(atoms: readonly Atom[]) {
  const w = atoms.map((a) => {
    const m = IUPAC_WEIGHTS[a.element];
    if (m === undefined) throw new Error(`no atomic weight for ${a.element}`);
    return m;
  });
  return centroid(atoms.map(pos), w);
}

/**
 * What is wrong with the frame of `atoms` for a structure of `group` (empty list: nothing).
 * `id` is the reference-molecule number, for the Mulliken planar rules (#6 water, #27 ethylene).
 */
export function frameProblems(atoms: readonly Atom[], group: string, id?: number): string[] {
  const problems: string[] = [];
  const com = centreOfMass(atoms);
  if (Math.hypot(...com) > 1e-9) problems.push(`centre of mass at (${com.map((v) => v.toExponential(2)).join(', ')}), not the origin`);

  const groups = standardGroups(group);
  if (groups === null) {
    const off = Math.max(...atoms.map((a) => Math.hypot(a.x, a.y)));
    if (off > FRAME_TOLERANCE) problems.push(`linear molecule not on z (an atom is ${off.toExponential(2)} Å off the axis)`);
    if (group === 'D∞h' && operationResidual(atoms, [-1, 0, 0, 0, -1, 0, 0, 0, -1], FRAME_TOLERANCE) > FRAME_TOLERANCE)
      problems.push('inversion through the origin does not map it onto itself');
  } else {
    const failures = groups.map((g) => g.filter((m) => operationResidual(atoms, m, FRAME_TOLERANCE) > FRAME_TOLERANCE));
    if (!failures.some((f) => f.length === 0)) {
      const f = failures.reduce((a, b) => (b.length < a.length ? b : a));
      problems.push(`not mapped onto itself by ${f.length} standard-frame operation(s) of ${group}, e.g. ${f.slice(0, 3).map(describeOperation).join('; ')}`);
    }
  }

  if (group === 'C1' || group === 'Ci') {
    // Principal axes of inertia: the inertia tensor is diagonal.
    const I = inertia(atoms);
    const scale = I[0] + I[4] + I[8];
    const off = Math.max(Math.abs(I[1]), Math.abs(I[2]), Math.abs(I[5]));
    if (off > 1e-8 * scale) problems.push(`inertia tensor not diagonal (largest off-diagonal ${off.toExponential(2)} amu·Å²)`);
  }
  if (id === 6 || id === 27) {
    // Mulliken 1955: x perpendicular to the molecular plane (plane = yz).
    const x = Math.max(...atoms.map((a) => Math.abs(a.x)));
    if (x > FRAME_TOLERANCE) problems.push(`molecular plane is not yz (|x| up to ${x.toExponential(2)} Å)`);
  }
  if (id === 27) {
    const off = Math.max(...atoms.filter((a) => a.element === 'C').map((a) => Math.hypot(a.x, a.y)));
    if (off > FRAME_TOLERANCE) problems.push(`C=C not along z (C off axis by ${off.toExponential(2)} Å)`);
  }
  return problems;
}

function inertia(atoms: readonly Atom[]): Mat3 {
  const I = new Array<number>(9).fill(0);
  for (const a of atoms) {
    const m = IUPAC_WEIGHTS[a.element];
    const r = [a.x, a.y, a.z];
    const r2 = a.x * a.x + a.y * a.y + a.z * a.z;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) I[3 * i + j] += m * ((i === j ? r2 : 0) - r[i] * r[j]);
  }
  return I;
}
