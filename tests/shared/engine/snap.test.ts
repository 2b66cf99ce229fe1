/**
 * The snap pipeline on synthetic structures (orbits of generic seed points under each group's
 * exact matrices — labelled synthetic, not molecules), plus the ladder, targets, flags, frames
 * and bad input. Properties follow methods.md (a): the group average is an orthogonal projector,
 * so its output is exactly invariant and projecting again changes nothing.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { StructureResult } from '@shared/contracts/structure';
import { allowedTargets, EngineError, LADDER_MAX, LADDER_MIN, LADDER_RUNGS, ladder, perceive, pointGroupAt, snap } from '@shared/engine';
import { analyse } from '@shared/engine/analysis';
import { ladderRanges } from '@shared/engine/ladder';
import { findOp } from '@shared/engine/op-store';
import { prepareMolecule } from '@shared/engine/molecule';
import { fitElement, residualWithPermutation } from '@shared/engine/operations';
import { GENERIC_SEEDS, input, mv, orbit, scramble, setDistance } from './helpers';
import { benzene, water } from './molecule-builders';

const FAMILIES = [
  'Cs', 'Ci', 'C2', 'C3', 'C4', 'C5', 'C6', 'C2v', 'C3v', 'C4v', 'C5v', 'C6v', 'C2h', 'C3h', 'C4h', 'C5h', 'C6h',
  'D2', 'D3', 'D4', 'D5', 'D6', 'D2d', 'D3d', 'D4d', 'D5d', 'D6d', 'D2h', 'D3h', 'D4h', 'D5h', 'D6h', 'D8h',
  'S4', 'S6', 'S8', 'T', 'Td', 'Th', 'O', 'Oh', 'I', 'Ih',
];

/** Largest |D(g)xᵢ − x_π(i)| over the reported operations of a result (output frame). */
function invarianceError(r: StructureResult): number {
  const c = r.frame === 'input' ? centreOfMass(r) : [0, 0, 0];
  const x = r.atoms.map((a) => ({ ...a, x: a.x - c[0], y: a.y - c[1], z: a.z - c[2] }));
  let worst = 0;
  for (const op of r.operations) {
    x.forEach((a, i) => {
      const v = mv(op.matrix, a);
      const b = x[op.permutation[i]];
      worst = Math.max(worst, Math.hypot(v[0] - b.x, v[1] - b.y, v[2] - b.z));
    });
  }
  return worst;
}

function centreOfMass(r: StructureResult): number[] {
  const w = (e: string) => ({ H: 1.008, C: 12.011, O: 15.999 })[e] ?? 1;
  const m = r.atoms.reduce((s, a) => s + w(a.element), 0);
  return (['x', 'y', 'z'] as const).map((k) => r.atoms.reduce((s, a) => s + w(a.element) * a[k], 0) / m);
}

describe('every finite family, from a noisy, moved and re-ordered synthetic orbit', () => {
  it.each(FAMILIES)('%s is recovered, exact afterwards, idempotent and independent of the input frame', (name) => {
    const ideal = orbit(name, GENERIC_SEEDS);
    const a = snap(input(scramble(ideal, 101, 0.001).atoms));
    expect(a.pointGroup).toBe(name);
    expect(a.operations).toHaveLength(a.order);
    expect(a.symmetryRmsdAfter).toBeLessThanOrEqual(1e-10);
    expect(invarianceError(a)).toBeLessThan(1e-10);
    expect(a.maxDisplacement).toBeLessThan(0.004);
    // Idempotent: snapping the output again (kept in its frame) moves nothing…
    const again = snap(input(a.atoms), { frame: 'input' });
    expect(again.pointGroup).toBe(name);
    expect(again.maxDisplacement).toBeLessThan(1e-10);
    // …and the standard frame is a fixed point atom by atom, not only as a point set.
    const std = snap(input(a.atoms));
    std.atoms.forEach((p, i) => expect(Math.hypot(p.x - a.atoms[i].x, p.y - a.atoms[i].y, p.z - a.atoms[i].z)).toBeLessThan(1e-10));
    // Another orientation, position, atom order and noise draw lands on the same points.
    const b = snap(input(scramble(ideal, 202).atoms));
    const c = snap(input(scramble(ideal, 303).atoms));
    expect(setDistance(b.atoms, c.atoms)).toBeLessThan(1e-9);
  });
});

describe('pointGroupAt (the write-back check) names what perceive names', () => {
  it.each(FAMILIES)('%s, noisy, at tolerances across the ladder', (name) => {
    const atoms = scramble(orbit(name, GENERIC_SEEDS), 404, 0.002).atoms;
    for (const tolerance of [1e-6, 1e-4, 0.001, 0.003, 0.01, 0.05]) {
      expect(pointGroupAt(atoms, tolerance)).toBe(perceive(atoms, { tolerance }).pointGroup);
    }
  });
});

describe('properties over random cases (fast-check)', () => {
  const pool = ['C2v', 'C3v', 'D3d', 'D2d', 'S4', 'Td', 'C4h', 'D5h'];
  it('output is invariant under every reported operation, in both frames, and the transform maps input to output', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...pool),
        fc.integer({ min: 1, max: 1e6 }),
        fc.double({ min: 0, max: 0.003, noNaN: true }),
        fc.constantFrom<'standard' | 'input'>('standard', 'input'),
        (name, seed, noise, frame) => {
          const { atoms } = scramble(orbit(name, GENERIC_SEEDS), seed, noise);
          const r = snap(input(atoms), { frame, tolerance: 0.02 });
          expect(r.pointGroup).toBe(name);
          expect(invarianceError(r)).toBeLessThan(1e-10);
          const R = r.transform.rotation;
          atoms.forEach((a, i) => {
            const v = mv(R, a).map((c, k) => c + r.transform.translation[k]);
            const o = r.atoms[i];
            // the transform is the fitted frame's, the displacement is after the best superposition
            expect(Math.hypot(v[0] - o.x, v[1] - o.y, v[2] - o.z)).toBeLessThan(2 * r.maxDisplacement + 1e-9);
          });
        },
      ),
      { seed: 77, numRuns: 30 },
    );
  });
});

describe('ladder', () => {
  const noisy = scramble(benzene(), 5, 0.004).atoms;
  const rungs = ladder(noisy);
  it('covers 1e-4 … 0.3 Å in contiguous ranges of distinct groups (≥ 16 rungs sampled)', () => {
    expect(LADDER_RUNGS).toBeGreaterThanOrEqual(16);
    expect(rungs[0].fromTolerance).toBe(LADDER_MIN);
    expect(rungs[rungs.length - 1].toTolerance).toBe(LADDER_MAX);
    rungs.forEach((r, i) => {
      expect(r.toTolerance).toBeGreaterThan(r.fromTolerance);
      if (i > 0) {
        expect(r.fromTolerance).toBe(rungs[i - 1].toTolerance);
        expect(r.group).not.toBe(rungs[i - 1].group);
      }
    });
    expect(rungs[0].group).toBe('C1');
    expect(rungs[rungs.length - 1].group).toBe('D6h');
  });
  it('agrees with perceive at each range, and snapping costs nothing at the bottom and grows upward', () => {
    for (const r of rungs) {
      const mid = Math.sqrt(r.fromTolerance * r.toTolerance);
      expect(perceive(noisy, { tolerance: mid }).pointGroup).toBe(r.group);
    }
    expect(rungs[0].maxDisplacement).toBeLessThan(1e-12);
    const top = rungs[rungs.length - 1];
    expect(top.maxDisplacement).toBeGreaterThan(0);
    expect(top.maxDisplacement).toBeLessThan(0.01);
  });
});

describe('targets', () => {
  const noisy = input(scramble(benzene(), 6, 0.002).atoms, 'benzene');
  it('snaps to a named subgroup, to the computational subgroup, and lists the allowed targets', () => {
    const r = snap(noisy);
    const targets = allowedTargets(r);
    expect(targets[0]).toBe('D6h');
    for (const g of ['D3h', 'C6v', 'D2h', 'C2v', 'Cs', 'C1']) expect(targets).toContain(g);
    expect(targets).not.toContain('Oh');
    const c2v = snap(noisy, { target: { kind: 'group', group: 'c2v' } });
    expect([c2v.pointGroup, c2v.perceivedGroup, c2v.order]).toEqual(['C2v', 'D6h', 4]);
    expect(c2v.maxDisplacement).toBeLessThanOrEqual(r.maxDisplacement + 1e-12);
    expect(snap(noisy, { target: { kind: 'computational' } }).pointGroup).toBe('D2h');
  });
  it('keeps the perceived group with a flag for a target that is neither on the ladder nor a subgroup', () => {
    const r = snap(noisy, { target: { kind: 'group', group: 'Oh' } });
    expect(r.pointGroup).toBe('D6h');
    expect(r.flags).toContain('target-not-subgroup');
    expect(() => snap(noisy, { target: { kind: 'group', group: 'Q9' } })).toThrow(EngineError);
  });
  it('allows a higher group from the ladder, with the saddle-point caution', () => {
    const loose = input(scramble(benzene(), 7, 0.02).atoms);
    const r0 = snap(loose, { tolerance: 0.005 });
    expect(r0.perceivedGroup).not.toBe('D6h');
    expect(r0.ladder.map((l) => l.group)).toContain('D6h');
    const r = snap(loose, { tolerance: 0.005, target: { kind: 'group', group: 'D6h' } });
    expect(r.pointGroup).toBe('D6h');
    expect(r.flags).toContain('higher-symmetry');
    expect(r.flagNotes.find((n) => n.flag === 'higher-symmetry')?.message).toMatch(/saddle point.*frequency calculation/);
  });
});

describe('flags', () => {
  it('over-budget when an atom moves more than the displacement budget', () => {
    const r = snap(input(scramble(benzene(), 8, 0.004).atoms), { displacementBudget: 0.001 });
    expect(r.flags).toContain('over-budget');
  });
  it('charge-multiplicity when the parity of the electron count contradicts the multiplicity', () => {
    expect(snap(input(water(), 'w', 0, 2)).flags).toContain('charge-multiplicity');
    expect(snap(input(water(), 'w', 1, 2)).flags).not.toContain('charge-multiplicity');
    const r = snap(input(water(), 'w', null, null), { charge: -1 });
    expect([r.charge, r.multiplicity]).toEqual([-1, 2]);
  });
  it('close-contact for atoms nearer than 0.5 Å', () => {
    const atoms = [...water(), { element: 'H', x: 0.2, y: 0.1, z: -0.3 }];
    expect(snap(input(atoms)).flags).toContain('close-contact');
  });
  it('not-closed when two mirrors are within the tolerance but their product is not (synthetic)', () => {
    const d = 0.02;
    const atoms = [
      { element: 'O', x: 0, y: 0, z: 0.5 },
      { element: 'H', x: 0.8, y: 0.6, z: -0.3 + d },
      { element: 'H', x: 0.8, y: -0.6, z: -0.3 },
      { element: 'H', x: -0.8, y: 0.6, z: -0.3 },
      { element: 'H', x: -0.8, y: -0.6, z: -0.3 - d },
    ];
    const p = perceive(atoms, { tolerance: 0.015 });
    expect(p.pointGroup).toBe('Cs');
    expect(p.flags).toContain('not-closed');
    expect(p.flags).toContain('knife-edge');
    expect(perceive(atoms, { tolerance: 0.05 }).pointGroup).toBe('C2v');
  });
});

describe('special structures', () => {
  it('one atom is Kh; two atoms are linear', () => {
    const atom = snap(input([{ element: 'Ar', x: 1, y: 2, z: 3 }]));
    expect([atom.pointGroup, atom.order, atom.atoms[0].x, atom.atoms[0].z]).toEqual(['Kh', 0, 0, 0]);
    expect(snap(input([{ element: 'H', x: 0, y: 0, z: 0 }, { element: 'F', x: 0.5, y: 0.5, z: 0.5 }])).pointGroup).toBe('C∞v');
    expect(snap(input([{ element: 'N', x: 0, y: 0, z: 0 }, { element: 'N', x: 0.5, y: 0.5, z: 0.5 }])).pointGroup).toBe('D∞h');
  });
  it('a slightly bent triatomic is C2v at a tight tolerance and D∞h at a loose one', () => {
    const bent = [
      { element: 'O', x: -1.16, y: 0, z: 0 },
      { element: 'C', x: 0, y: 0.01, z: 0 },
      { element: 'O', x: 1.16, y: 0, z: 0 },
    ];
    expect(perceive(bent, { tolerance: 0.001 }).pointGroup).toBe('C2v');
    expect(perceive(bent, { tolerance: 0.05 }).pointGroup).toBe('D∞h');
  });
});

describe('bad input', () => {
  const cases: [string, unknown[], string][] = [
    ['no atoms', [], 'empty'],
    ['NaN', [{ element: 'H', x: Number.NaN, y: 0, z: 0 }], 'bad-coordinates'],
    ['1e300', [{ element: 'H', x: 0, y: 1e300, z: 0 }], 'bad-coordinates'],
    ['unknown element', [{ element: 'Xx', x: 0, y: 0, z: 0 }], 'unknown-element'],
    ['two atoms on one spot', [{ element: 'H', x: 0, y: 0, z: 0 }, { element: 'H', x: 0.001, y: 0, z: 0 }], 'coincident-atoms'],
    ['a million atoms', new Array(1_000_000).fill({ element: 'H', x: 0, y: 0, z: 0 }), 'too-many-atoms'],
  ];
  it.each(cases)('%s → EngineError with a one-line message', (_, atoms, code) => {
    try {
      snap(input(atoms as never));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EngineError);
      expect((e as EngineError).code).toBe(code);
      expect((e as EngineError).message).not.toMatch(/\n/);
    }
  });
  it('rejects invalid settings', () => {
    expect(() => snap(input(water()), { tolerance: -1 })).toThrow(/tolerance/);
  });
});

describe('found operations', () => {
  // Common practice (no source): an operation's residual should depend on the operation, not on
  // how the search met it. Every stored operation — matched and refined, or formed as a product
  // of others — must carry the residual of the exact element fitted to its own pairing.
  it.each([
    ['benzene', () => scramble(benzene(), 11, 0.004).atoms],
    ['water', () => scramble(water(), 12, 0.003).atoms],
    ['Oh orbit', () => scramble(orbit('Oh', GENERIC_SEEDS.slice(0, 2)), 13, 0.003).atoms],
  ])('%s: residuals do not depend on the route', (_name, atoms) => {
    const mol = prepareMolecule(atoms());
    const a = analyse(mol);
    let checked = 0;
    for (const op of a.store.byKey.values()) {
      if (!Number.isFinite(op.residual) || op.kind === 'identity') continue;
      const fit = fitElement(mol.y, op.perm, op.det);
      expect(fit).not.toBeNull();
      expect(op.residual).toBe(residualWithPermutation(mol.y, fit!.matrix, op.perm));
      checked++;
    }
    expect(checked).toBeGreaterThan(0);
  });
});

describe('several structures at once', () => {
  // Common practice (no source): perception of one structure must not depend on what was
  // perceived in between. The operation tables are shared by all analyses of small structures
  // (op-store.ts), and each new analysis clears what the last one wrote there.
  it('an analysis stays whole while another structure is analysed', () => {
    const molA = prepareMolecule(scramble(orbit('Oh', GENERIC_SEEDS.slice(0, 2)), 21, 0.003).atoms);
    const molB = prepareMolecule(scramble(benzene(), 22, 0.004).atoms);
    const alone = ladderRanges(analyse(molA)).map((r) => [r.found.name, r.from, r.to]);
    const a = analyse(molA);
    const b = analyse(molB);
    expect(ladderRanges(b).map((r) => r.found.name)).toContain('D6h');
    for (const [key, op] of a.store.byKey) expect(findOp(a.store, key)).toBe(op);
    expect(ladderRanges(a).map((r) => [r.found.name, r.from, r.to])).toEqual(alone);
    expect(alone.map((r) => r[0])).toContain('Oh');
  });
});
