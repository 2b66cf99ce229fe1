/**
 * A handful of real molecules through perceive and snap (geometries and their sources:
 * molecule-builders.ts, from shared/reference/reference-molecules.md).
 * Standard-frame expectations: Mulliken, J. Chem. Phys. 23, 1997 (1955) for planar C2v (x ⊥
 * plane); the frame rules of the issue for the others (stated in shared/engine/orient.ts).
 */
import { describe, expect, it } from 'vitest';
import { perceive, snap } from '@shared/engine';
import { input, mv, scramble, setDistance } from './helpers';
import { ammonia, benzene, co2, methane, water } from './molecule-builders';

describe('water (C2v)', () => {
  const r = snap(input(scramble(water(), 11, 0.001).atoms, 'water'));
  it('is C2v of order 4 with computational subgroup C2v and σ = 2', () => {
    expect([r.pointGroup, r.perceivedGroup, r.order, r.computationalSubgroup, r.rotationalSymmetryNumber]).toEqual(['C2v', 'C2v', 4, 'C2v', 2]);
    expect(r.operations.map((o) => o.symbol).sort()).toEqual(['C2', 'E', 'σv', 'σv′']);
    expect(r.formula).toBe('H2O');
  });
  it('lies in the yz plane (Mulliken 1955: x ⊥ the molecular plane), C2 on z, O on +z', () => {
    for (const a of r.atoms) expect(Math.abs(a.x)).toBeLessThan(1e-12);
    const o = r.atoms.find((a) => a.element === 'O')!;
    expect(o.y).toBe(0);
    expect(o.z).toBeGreaterThan(0);
    const [h1, h2] = r.atoms.filter((a) => a.element === 'H');
    expect(h1.y).toBeCloseTo(-h2.y, 12);
    expect(h1.z).toBeCloseTo(h2.z, 12);
  });
  it('keeps the bond length and angle within the noise, and is exact afterwards', () => {
    const [o, h1, h2] = ['O', 'H', 'H'].map((e, k) => r.atoms.filter((a) => a.element === e)[k === 2 ? 1 : 0]);
    const d1 = Math.hypot(h1.x - o.x, h1.y - o.y, h1.z - o.z);
    const d2 = Math.hypot(h2.x - o.x, h2.y - o.y, h2.z - o.z);
    expect(d1).toBeCloseTo(d2, 12);
    expect(Math.abs(d1 - 0.9578)).toBeLessThan(0.003);
    expect(r.symmetryRmsdAfter).toBeLessThanOrEqual(1e-10);
    expect(r.maxDisplacement).toBeLessThan(0.003);
    expect(r.flags).toEqual([]);
  });
  it('classes: O alone, the two H together', () => {
    const o = r.atoms.findIndex((a) => a.element === 'O');
    const hs = r.atoms.map((a, i) => (a.element === 'H' ? i : -1)).filter((i) => i >= 0);
    expect(r.equivalenceClasses).toEqual([[o], hs].sort((p, q) => p[0] - q[0]));
    expect(r.uniqueAtoms).toEqual([Math.min(o, hs[0]), Math.max(o, hs[0])].sort((p, q) => p - q));
  });
});

describe('ammonia (C3v)', () => {
  const r = snap(input(scramble(ammonia(), 12, 0.001).atoms, 'ammonia'));
  it('is C3v with σ = 3 and computational subgroup Cs', () => {
    expect([r.pointGroup, r.order, r.rotationalSymmetryNumber, r.computationalSubgroup]).toEqual(['C3v', 6, 3, 'Cs']);
  });
  it('has N on +z and a mirror plane xz through an H (on +x)', () => {
    const n = r.atoms.find((a) => a.element === 'N')!;
    expect([n.x, n.y]).toEqual([0, 0]);
    expect(n.z).toBeGreaterThan(0);
    const onXz = r.atoms.filter((a) => a.element === 'H' && Math.abs(a.y) < 1e-12);
    expect(onXz).toHaveLength(1);
    expect(onXz[0].x).toBeGreaterThan(0);
    const mirrors = r.elements.planes.filter((p) => p.kind === 'σv');
    expect(mirrors).toHaveLength(3);
    expect(mirrors.some((p) => Math.abs(Math.abs(p.normal[1]) - 1) < 1e-12)).toBe(true);
  });
});

describe('methane (Td)', () => {
  const r = snap(input(scramble(methane(), 13, 0.001).atoms, 'methane'));
  it('is Td of order 24, σ = 12, computational subgroup D2 with C2v as the alternative', () => {
    expect([r.pointGroup, r.order, r.rotationalSymmetryNumber]).toEqual(['Td', 24, 12]);
    expect(r.computationalSubgroup).toBe('D2');
    expect(r.computationalSubgroupAlternatives).toEqual(['C2v']);
  });
  it('puts the three S4 axes on x, y, z: each H at (±a, ±a, ±a)', () => {
    for (const a of r.atoms.filter((x) => x.element === 'H')) {
      expect(Math.abs(a.x)).toBeCloseTo(Math.abs(a.y), 12);
      expect(Math.abs(a.y)).toBeCloseTo(Math.abs(a.z), 12);
    }
    const s4 = r.elements.axes.filter((ax) => ax.improperOrder === 4);
    expect(s4).toHaveLength(3);
  });
});

describe('benzene (D6h)', () => {
  const r = snap(input(scramble(benzene(), 14, 0.001).atoms, 'benzene'));
  it('is D6h of order 24 with computational subgroup D2h, σ = 12', () => {
    expect([r.pointGroup, r.order, r.computationalSubgroup, r.rotationalSymmetryNumber]).toEqual(['D6h', 24, 'D2h', 12]);
    expect(r.elements.inversionCentre).toBe(true);
    expect(r.elements.planes).toHaveLength(7);
    expect(r.elements.axes.filter((a) => a.order === 2)).toHaveLength(6);
    expect(r.elements.axes.filter((a) => a.order === 6 && a.principal && a.improperOrder === 6)).toHaveLength(1);
  });
  it('lies in the xy plane with a C2′ through atoms on x (a C on +x)', () => {
    for (const a of r.atoms) expect(Math.abs(a.z)).toBeLessThan(1e-12);
    const c = r.atoms.filter((a) => a.element === 'C' && Math.abs(a.y) < 1e-12 && a.x > 0);
    expect(c).toHaveLength(1);
    expect(Math.abs(c[0].x - 1.3914)).toBeLessThan(0.002);
    const c2x = r.operations.find((o) => o.symbol === 'C2′' && Math.abs(o.axis[0] - 1) < 1e-12);
    expect(c2x).toBeDefined();
  });
});

describe('CO2 (D∞h)', () => {
  const r = snap(input(scramble(co2(), 15, 0.001).atoms, 'CO2'));
  it('is D∞h (order 0) on z with computational subgroup D2h and σ = 2', () => {
    expect([r.pointGroup, r.order, r.computationalSubgroup, r.rotationalSymmetryNumber]).toEqual(['D∞h', 0, 'D2h', 2]);
    for (const a of r.atoms) expect([a.x, a.y]).toEqual([0, 0]);
    const zs = r.atoms.filter((a) => a.element === 'O').map((a) => a.z);
    expect(zs[0]).toBeCloseTo(-zs[1], 12);
    expect(r.elements.axes.find((a) => a.principal)?.order).toBe(0);
  });
});

describe('perceive (input frame)', () => {
  it('reports operations whose matrices map the centred input onto itself with the given pairing', () => {
    const atoms = scramble(benzene(), 21, 0.002).atoms;
    const p = perceive(atoms, { tolerance: 0.02 });
    expect(p.pointGroup).toBe('D6h');
    expect(p.operations).toHaveLength(24);
    const m = atoms.reduce((s, a) => s + (a.element === 'C' ? 12.011 : 1.008), 0);
    const c = ['x', 'y', 'z'].map((k) => atoms.reduce((s, a) => s + (a.element === 'C' ? 12.011 : 1.008) * (a as never)[k], 0) / m);
    const centred = atoms.map((a) => ({ ...a, x: a.x - c[0], y: a.y - c[1], z: a.z - c[2] }));
    for (const op of p.operations) {
      let worst = 0;
      centred.forEach((a, i) => {
        const v = mv(op.matrix, a);
        const b = centred[op.permutation[i]];
        worst = Math.max(worst, Math.hypot(v[0] - b.x, v[1] - b.y, v[2] - b.z));
      });
      expect(worst).toBeCloseTo(op.residual, 9);
      expect(worst).toBeLessThanOrEqual(0.02);
    }
  });
  it('finds the same group for the same molecule however it is moved', () => {
    for (const seed of [1, 2, 3]) expect(perceive(scramble(ammonia(), seed, 0.001).atoms).pointGroup).toBe('C3v');
    expect(setDistance(snap(input(water())).atoms, snap(input(scramble(water(), 9).atoms)).atoms)).toBeLessThan(1e-9);
  });
});
