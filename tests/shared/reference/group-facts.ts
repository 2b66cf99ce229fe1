/**
 * The rows of shared/reference/group-facts.md as data. Source named there: Atkins, Child &
 * Phillips, *Tables for Group Theory* (OUP), and Cotton, *Chemical Applications of Group
 * Theory*, 3rd ed. (1990), App. IIA — written from memory by the reference author and recomputed
 * by an independent closure script (both stated in that file). For C∞v and D∞h the order is
 * infinite; the engine contract (shared/contracts/structure.ts) writes it as 0.
 */
export interface GroupFact {
  group: string;
  /** Group order; 0 stands for ∞ (contract convention). */
  order: number;
  /** Number of conjugacy classes; null for the infinite groups. */
  classes: number | null;
  inversion: boolean;
  /** Largest D2h-type subgroup; two entries where the table says "either". */
  computationalSubgroups: string[];
}

const row = (group: string, order: number, classes: number | null, inversion: boolean, ...computationalSubgroups: string[]): GroupFact => ({
  group,
  order,
  classes,
  inversion,
  computationalSubgroups,
});

export const GROUP_FACTS: GroupFact[] = [
  row('C1', 1, 1, false, 'C1'),
  row('Cs', 2, 2, false, 'Cs'),
  row('Ci', 2, 2, true, 'Ci'),
  row('C2', 2, 2, false, 'C2'),
  row('C3', 3, 3, false, 'C1'),
  row('C4', 4, 4, false, 'C2'),
  row('C5', 5, 5, false, 'C1'),
  row('C6', 6, 6, false, 'C2'),
  row('C8', 8, 8, false, 'C2'),
  row('C2v', 4, 4, false, 'C2v'),
  row('C3v', 6, 3, false, 'Cs'),
  row('C4v', 8, 5, false, 'C2v'),
  row('C5v', 10, 4, false, 'Cs'),
  row('C6v', 12, 6, false, 'C2v'),
  row('C2h', 4, 4, true, 'C2h'),
  row('C3h', 6, 6, false, 'Cs'),
  row('C4h', 8, 8, true, 'C2h'),
  row('C5h', 10, 10, false, 'Cs'),
  row('C6h', 12, 12, true, 'C2h'),
  row('D2', 4, 4, false, 'D2'),
  row('D3', 6, 3, false, 'C2'),
  row('D4', 8, 5, false, 'D2'),
  row('D5', 10, 4, false, 'C2'),
  row('D6', 12, 6, false, 'D2'),
  row('D2d', 8, 5, false, 'D2', 'C2v'),
  row('D3d', 12, 6, true, 'C2h'),
  row('D4d', 16, 7, false, 'D2', 'C2v'),
  row('D5d', 20, 8, true, 'C2h'),
  row('D6d', 24, 9, false, 'D2', 'C2v'),
  row('D2h', 8, 8, true, 'D2h'),
  row('D3h', 12, 6, false, 'C2v'),
  row('D4h', 16, 10, true, 'D2h'),
  row('D5h', 20, 8, false, 'C2v'),
  row('D6h', 24, 12, true, 'D2h'),
  row('D8h', 32, 14, true, 'D2h'),
  row('S4', 4, 4, false, 'C2'),
  row('S6', 6, 6, true, 'Ci'),
  row('S8', 8, 8, false, 'C2'),
  row('T', 12, 4, false, 'D2'),
  row('Td', 24, 5, false, 'D2', 'C2v'),
  row('Th', 24, 8, true, 'D2h'),
  row('O', 24, 5, false, 'D2'),
  row('Oh', 48, 10, true, 'D2h'),
  row('I', 60, 5, false, 'D2'),
  row('Ih', 120, 10, true, 'D2h'),
  // "C2v (memory)" / "D2h (memory)" in the table.
  row('C∞v', 0, null, false, 'C2v'),
  row('D∞h', 0, null, true, 'D2h'),
];

export function groupFact(group: string): GroupFact {
  const f = GROUP_FACTS.find((g) => g.group === group);
  if (!f) throw new Error(`no group-facts row for ${group}`);
  return f;
}

/**
 * Rotational symmetry number σ = number of proper rotations in the group (|G| for a group of
 * rotations only, |G|/2 when it also has improper operations); σ = 1 for C∞v and 2 for D∞h.
 * Common practice, from memory (e.g. the statistical-mechanics texts: H2O 2, NH3 3, CH4 12,
 * C6H6 12, SF6 24, C60 60); no source checked in this session.
 */
export function rotationalSymmetryNumber(f: GroupFact): number {
  if (f.group === 'C∞v') return 1;
  if (f.group === 'D∞h') return 2;
  const properOnly = /^(C\d+|D\d+|T|O|I)$/.test(f.group);
  return properOnly ? f.order : f.order / 2;
}

/**
 * Conventional atomic weights, IUPAC/CIAAW 2021 (Prohaska et al., Pure Appl. Chem. 94, 573
 * (2022)), as listed from memory in shared/reference/npm-data.md; Ar, Cr, Re and U are from
 * memory too (not in that list). Used only for the independent centre-of-mass and
 * inertia-tensor checks; cross-checked against the registry package node-periodic-table in
 * molecules.test.ts.
 */
export const IUPAC_WEIGHTS: Record<string, number> = {
  H: 1.008,
  B: 10.81,
  C: 12.011,
  N: 14.007,
  O: 15.999,
  F: 18.998403162,
  Si: 28.085,
  P: 30.973761998,
  S: 32.06,
  Cl: 35.45,
  Ar: 39.95,
  Cr: 51.9961,
  Fe: 55.845,
  Co: 58.933194,
  Ni: 58.6934,
  Br: 79.904,
  Xe: 131.293,
  Re: 186.207,
  U: 238.02891,
};
