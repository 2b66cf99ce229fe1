/**
 * Validates the reference-molecule builders before they are used to validate the engine: every
 * bond length, angle and twist of shared/reference/reference-molecules.md is recovered from the
 * built coordinates (to 1e-9 unless the table itself rounds), formulas and atom counts are right,
 * and each ideal geometry is exactly invariant under its table group, written in the frame the
 * table describes, as closed from textbook generators in frames.ts (group orders from
 * shared/reference/group-facts.md).
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { type Mat3, DEG, dist, hillFormula, matMul, operationResidual, pos, reflection, rotation, transpose } from './geometry';
import { standardGroups } from './frames';
import { IUPAC_WEIGHTS, groupFact } from './group-facts';
import { GROUP_I, GROUP_O, REFERENCE_MOLECULES, icosahedronVertices } from './molecules';

/**
 * Where the table's ideal frame differs from DESIGN's standard frame: the rotation F that takes
 * the standard frame to the table's (the table's group is F·G·Fᵀ).
 */
const TABLE_FRAME: Record<number, Mat3> = {
  // H2O2: the table puts O–O on x and the C2 on y (standard: C2 on z).
  4: rotation([1, 0, 0], -90 * DEG),
  // Allene: CH2 planes xz and yz, so the C2′ axes bisect x and y (standard: a C2 on x).
  18: rotation([0, 0, 1], 45 * DEG),
};

describe.each(REFERENCE_MOLECULES.map((m) => [`${m.name} (#${m.id}, ${m.pointGroup})`, m] as const))('builder %s', (_, m) => {
  it.each(m.checks.map((c) => [c.label, c] as const))('reproduces the table value: %s', (_l, c) => {
    const values = c.actual(m.atoms);
    expect(values.length).toBeGreaterThan(0);
    for (const v of values) expect(Math.abs(v - c.expected)).toBeLessThanOrEqual(c.tolerance ?? 1e-9);
  });

  it(`has formula ${m.formula}`, () => {
    expect(hillFormula(m.atoms)).toBe(m.formula);
  });

  it('has no two atoms closer than 0.9 Å', () => {
    for (let i = 0; i < m.atoms.length; i++)
      for (let j = i + 1; j < m.atoms.length; j++) expect(dist(pos(m.atoms[i]), pos(m.atoms[j]))).toBeGreaterThan(0.9);
  });

  it(`is exactly invariant under ${m.pointGroup} in the table's frame`, () => {
    const groups = standardGroups(m.pointGroup);
    if (groups === null) {
      // Linear: every atom on z.
      for (const a of m.atoms) expect(Math.hypot(a.x, a.y)).toBeLessThan(1e-12);
      return;
    }
    const f = TABLE_FRAME[m.id] ?? [1, 0, 0, 0, 1, 0, 0, 0, 1];
    // The I/Ih builders use the (0, ±1, ±φ) frame named in the table: the first variant.
    const group = groups[0].map((g) => matMul(matMul(f, g), transpose(f)));
    expect(group.length).toBe(groupFact(m.pointGroup).order);
    for (const g of group) expect(operationResidual(m.atoms, g, 1e-9)).toBeLessThanOrEqual(1e-9);
  });
});

describe('group generators used by the builders', () => {
  it('close O from C4(z) and C3(1,1,1) into 24 proper rotations', () => {
    expect(GROUP_O).toHaveLength(24);
  });
  it('close I from C2(z), C3(1,1,1), C5(0,1,φ) into 60 rotations that keep the icosahedron (0, ±1, ±φ)', () => {
    expect(GROUP_I).toHaveLength(60);
    const v = icosahedronVertices(1).map((p) => ({ element: 'B', x: p[0], y: p[1], z: p[2] }));
    for (const g of GROUP_I) expect(operationResidual(v, g, 1e-12)).toBeLessThan(1e-12);
  });
  it.each(['T', 'Td', 'Th', 'O', 'Oh', 'I', 'Ih', 'D8h', 'D6d', 'S8', 'C5h'])('standard-frame %s has the order of group-facts.md', (g) => {
    for (const group of standardGroups(g)!) expect(group.length).toBe(groupFact(g).order);
  });
});

describe('atomic weights used for the independent centre-of-mass checks', () => {
  // Cross-check of IUPAC_WEIGHTS (IUPAC 2021, memory) against a registry package:
  // node-periodic-table@0.0.6 (Wikipedia-derived JSON). Relative agreement 1e-4 (the package
  // has Fe 55.8452 and Ar 39.9481, slightly off the conventional values).
  const table = createRequire(import.meta.url)('node-periodic-table/elements.json') as { symbol: string; atomic_mass: number }[];
  it.each(Object.entries(IUPAC_WEIGHTS))('%s agrees with node-periodic-table@0.0.6 to 1e-4 relative', (sym, w) => {
    const e = table.find((x) => x.symbol === sym)!;
    expect(Math.abs(e.atomic_mass - w) / w).toBeLessThan(1e-4);
  });
});

/**
 * The constructed entries (model geometries) must not carry more symmetry than the table says,
 * or the engine test would be judged against a wrong expectation. For each, every operation of
 * the possible larger groups is tried and must miss by more than 0.05 Å for some atom (so no
 * tolerance up to 0.05 Å can find it). Vertical mirrors and perpendicular C2 axes are tried on a
 * 7.5° azimuth grid, which contains every azimuth these constructions could allow.
 */
describe('constructed entries have no symmetry beyond their table group', () => {
  const grid = Array.from({ length: 24 }, (_, k) => k * 7.5 * DEG);
  const verticalMirrors = grid.map((b) => reflection([-Math.sin(b), Math.cos(b), 0]));
  const perpendicularC2 = grid.map((b) => rotation([Math.cos(b), Math.sin(b), 0], Math.PI));
  const sigmaH = reflection([0, 0, 1]);
  const inversion: Mat3 = [-1, 0, 0, 0, -1, 0, 0, 0, -1];
  const candidates: Record<number, Mat3[]> = {
    5: [...verticalMirrors, ...perpendicularC2, sigmaH],
    12: [...verticalMirrors, ...perpendicularC2],
    13: [...verticalMirrors, sigmaH, inversion],
    14: [...verticalMirrors, sigmaH, inversion],
    16: [...verticalMirrors, sigmaH, inversion],
    34: [reflection([1, -1, 0]), reflection([1, 1, 0]), rotation([1, 1, 1], (2 * Math.PI) / 3), rotation([1, 0, 0], Math.PI), inversion],
    35: [...verticalMirrors, ...perpendicularC2, sigmaH, rotation([0, 0, 1], Math.PI / 3)],
    36: [inversion, sigmaH, rotation([0, 0, 1], Math.PI / 2), reflection([1, -1, 0]), matMul(sigmaH, rotation([0, 0, 1], Math.PI / 2))],
    43: [inversion, sigmaH],
    44: [inversion],
  };
  it.each(Object.entries(candidates).map(([id, ops]) => [Number(id), ops] as const))('#%i', (id, ops) => {
    const m = REFERENCE_MOLECULES.find((r) => r.id === id)!;
    for (const g of ops) expect(operationResidual(m.atoms, g, 0.05)).toBe(Infinity);
  });
});
