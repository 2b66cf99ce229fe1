/**
 * Every row of shared/reference/group-facts.md against the engine: order (groupOrder and the
 * snap result), number of conjugacy classes (computed here from the engine's reported operation
 * matrices, after checking they close into a group), presence of the inversion centre, the
 * computational (largest D2h-type) subgroup with the D2-or-C2v cases, and the rotational
 * symmetry number.
 *
 * Sources of the expected values: group-facts.md (Atkins, Child & Phillips; Cotton 1990 App.
 * IIA — from memory there, and recomputed there by an independent closure script). The
 * rotational symmetry number σ = |proper rotations| is common practice (memory, e.g. H2O 2,
 * NH3 3, CH4 12, benzene 12, SF6 24, C60 60); no source was checked for it.
 *
 * Structures: a reference molecule of that group (reference-molecules.md, builders in
 * molecules.ts), or, for groups with none, the orbit of two generic points under the group's
 * generators (orbit-structures.ts; proved to have no extra symmetry below). Snapping to the
 * computational subgroup on request is checked against the same column.
 */
import { describe, expect, it } from 'vitest';
import { groupOrder, isKnownGroup, snap } from '@shared/engine';
import type { StructureResult } from '@shared/contracts/structure';
import { type Atom, type Mat3, asInput, matMul, perturb, transpose } from './geometry';
import { standardGroups } from './frames';
import { frameProblems } from './frame-check';
import { GROUP_FACTS, rotationalSymmetryNumber } from './group-facts';
import { referenceMolecule } from './molecules';
import { extraSymmetry, orbitStructure } from './orbit-structures';

/** Reference molecule (#) used for each group that has one. */
const MOLECULE_FOR: Record<string, number> = {
  C1: 1, Cs: 2, Ci: 3, C2: 4, C3: 5, C2v: 6, C3v: 7, C4v: 8, C5v: 9, C6v: 10, C2h: 11, C3h: 12,
  D2: 13, D3: 14, D4: 16, D2d: 18, D3d: 19, D4d: 17, D5d: 22, D6d: 25, D2h: 27, D3h: 29,
  D4h: 15, D5h: 23, D6h: 31, D8h: 26, S4: 34, S6: 35, T: 36, Td: 37, Th: 40, O: 43, Oh: 41,
  I: 44, Ih: 45, 'C∞v': 47, 'D∞h': 49,
};

function structureFor(group: string): { source: string; atoms: Atom[]; charge: number } {
  const id = MOLECULE_FOR[group];
  if (id !== undefined) {
    const m = referenceMolecule(id);
    return { source: `#${id} ${m.name}`, atoms: m.atoms, charge: m.charge };
  }
  return { source: 'orbit of two generic points', atoms: orbitStructure(group), charge: 0 };
}

const sameMatrix = (a: Mat3, b: Mat3, tol = 1e-6) => a.every((v, i) => Math.abs(v - b[i]) < tol);

/** Conjugacy classes of a finite matrix group (throws if the matrices do not close). */
function classCount(ops: readonly Mat3[]): number {
  const index = (m: Mat3) => {
    const i = ops.findIndex((o) => sameMatrix(o, m));
    if (i < 0) throw new Error('reported operations do not close into a group');
    return i;
  };
  for (const a of ops) for (const b of ops) index(matMul(a, b));
  const seen = new Array<boolean>(ops.length).fill(false);
  let classes = 0;
  ops.forEach((x, i) => {
    if (seen[i]) return;
    classes++;
    for (const g of ops) seen[index(matMul(matMul(g, x), transpose(g)))] = true;
  });
  return classes;
}

describe('structures generated for groups without a reference molecule have exactly their group', () => {
  it.each(GROUP_FACTS.filter((f) => MOLECULE_FOR[f.group] === undefined).map((f) => f.group))('%s', (group) => {
    const atoms = orbitStructure(group);
    expect(atoms.length).toBe(2 * standardGroups(group)![0].length);
    expect(extraSymmetry(atoms, standardGroups(group)![0])).toEqual([]);
  });
});

describe.each(GROUP_FACTS.map((f) => [f.group, f] as const))('group %s (group-facts.md)', (group, fact) => {
  const s = structureFor(group);
  let cached: StructureResult | undefined;
  // ±0.001 Å noise at the default tolerance: the group must be found from a realistic input.
  const result = () => (cached ??= snap(asInput(`${group}: ${s.source}`, perturb(s.atoms, 500 + fact.order, 0.001).atoms, s.charge)));

  it(`groupOrder('${group}') is ${fact.order || '0 (∞)'} and the name is known`, () => {
    expect(isKnownGroup(group)).toBe(true);
    expect(groupOrder(group)).toBe(fact.order);
  });

  it(`is recovered with order ${fact.order || '0 (∞)'} for ${s.source}`, () => {
    expect(result().pointGroup).toBe(group);
    expect(result().order).toBe(fact.order);
  });

  it(`${fact.inversion ? 'has' : 'has no'} inversion operation`, () => {
    expect(result().operations.some((o) => o.kind === 'inversion')).toBe(fact.inversion);
  });

  it(`has computational subgroup ${fact.computationalSubgroups.join(' or ')}`, () => {
    const r = result();
    if (fact.computationalSubgroups.length === 1) {
      expect(r.computationalSubgroup).toBe(fact.computationalSubgroups[0]);
    } else {
      expect(fact.computationalSubgroups).toContain(r.computationalSubgroup);
      const other = fact.computationalSubgroups.find((g) => g !== r.computationalSubgroup)!;
      expect(r.computationalSubgroupAlternatives).toContain(other);
    }
  });

  it(`has rotational symmetry number ${rotationalSymmetryNumber(fact)} (common practice, memory)`, () => {
    const r = result();
    expect(r.rotationalSymmetryNumber).toBe(rotationalSymmetryNumber(fact));
    if (fact.order > 0) {
      // The same number counted from the reported operations: the proper ones (det +1).
      const proper = r.operations.filter((o) => o.kind === 'identity' || o.kind === 'rotation').length;
      expect(proper).toBe(rotationalSymmetryNumber(fact));
    }
  });

  it('snaps to its computational subgroup on request: exact, in that group’s standard frame, moving atoms no more than the full group', () => {
    const full = result();
    const sub = snap(asInput(`${group}: ${s.source}`, perturb(s.atoms, 500 + fact.order, 0.001).atoms, s.charge), {
      target: { kind: 'computational' },
    });
    expect(sub.pointGroup).toBe(full.computationalSubgroup);
    expect(sub.perceivedGroup).toBe(group);
    expect(sub.symmetryRmsdAfter).toBeLessThanOrEqual(1e-10);
    expect(frameProblems(sub.atoms, sub.pointGroup)).toEqual([]);
    // Projecting onto a subgroup's (larger) invariant subspace cannot move atoms farther
    // (methods.md (a)); 1e-6 Å allows for the separately fitted frames.
    expect(sub.displacementRmsd).toBeLessThanOrEqual(full.displacementRmsd + 1e-6);
  });

  if (fact.classes !== null) {
    it(`reports ${fact.order} operations that close into a group with ${fact.classes} classes`, () => {
      const ops = result().operations.map((o) => o.matrix);
      expect(ops).toHaveLength(fact.order);
      expect(classCount(ops)).toBe(fact.classes);
    });
  }
});
