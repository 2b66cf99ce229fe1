import type { OpKind } from './operations';

/** What {@link identifyGroup} needs to know about each element. */
export interface ElementSummary {
  det: number;
  order: number;
  kind: OpKind;
}

/**
 * The Schoenflies name of a finite point group from the types of its elements alone, or null if
 * they cannot form one. Pure counting, so it does not depend on how well the axes were located:
 * the rotation subgroup (|R| proper elements, highest order n) is cyclic Cₙ (|R| = n), dihedral
 * Dₙ (|R| = 2n), T (12, n = 3), O (24, n = 4) or I (60, n = 5); the improper half then decides
 * between the extensions (with i: Cₙₕ/S₂ₙ, Dₙₕ/Dₙd, Th, Oh, Ih by the parity of n; without i:
 * Cₙᵥ, Cₙₕ, S₂ₙ, Dₙₕ, Dₙd, Td by the number of mirrors). This is the usual decision tree
 * (Cotton, *Chemical Applications of Group Theory*, 3rd ed. 1990, ch. 3) expressed in counts.
 * The result is checked against the group order.
 */
export function identifyGroup(elements: readonly ElementSummary[]): string | null {
  const total = elements.length;
  let proper = 0;
  let nmax = 1;
  let c2 = 0;
  let mirrors = 0;
  let inversion = false;
  for (const e of elements) {
    if (e.det > 0) {
      proper++;
      if (e.order > nmax) nmax = e.order;
      if (e.order === 2) c2++;
    } else if (e.kind === 'reflection') mirrors++;
    else if (e.kind === 'inversion') inversion = true;
  }
  let rot: { family: 'C' | 'D' | 'T' | 'O' | 'I'; n: number } | null = null;
  if (proper === nmax) rot = { family: 'C', n: nmax };
  else if (proper === 12 && nmax === 3 && c2 === 3) rot = { family: 'T', n: 3 };
  else if (proper === 24 && nmax === 4) rot = { family: 'O', n: 4 };
  else if (proper === 60 && nmax === 5) rot = { family: 'I', n: 5 };
  else if (proper === 2 * nmax && (nmax >= 3 || c2 === 3)) rot = { family: 'D', n: nmax };
  if (!rot) return null;
  const { family, n } = rot;
  let name: string | null = null;
  if (total === proper) {
    name = family === 'C' ? (n === 1 ? 'C1' : `C${n}`) : family === 'D' ? `D${n}` : family;
  } else if (total === 2 * proper) {
    if (family === 'C') {
      if (inversion) name = n === 1 ? 'Ci' : n % 2 === 0 ? `C${n}h` : `S${2 * n}`;
      else if (n === 1) name = mirrors === 1 ? 'Cs' : null;
      else if (mirrors === n) name = `C${n}v`;
      else if (mirrors === 1 && n % 2 === 1) name = `C${n}h`;
      else if (mirrors === 0 && n % 2 === 0) name = `S${2 * n}`;
    } else if (family === 'D') {
      if (inversion) name = n % 2 === 0 ? `D${n}h` : `D${n}d`;
      else if (n % 2 === 1 && mirrors === n + 1) name = `D${n}h`;
      else if (n % 2 === 0 && mirrors === n) name = `D${n}d`;
    } else if (family === 'T') name = inversion ? 'Th' : mirrors === 6 ? 'Td' : null;
    else if (family === 'O') name = inversion ? 'Oh' : null;
    else if (family === 'I') name = inversion ? 'Ih' : null;
  }
  return name;
}
