/**
 * The engine on geometries made by an outside, general-purpose library: openchemlib 9.25.0
 * (BSD-3-Clause, npm registry). Its conformer generator builds 3D coordinates from SMILES (raw
 * conformers carry ~1e-3 Å of template noise), and its MMFF94s force field minimises them to
 * symmetric structures (about 1e-8 Å, shared/reference/npm-data.md). The expected point groups
 * are textbook facts (benzene D6h, methane Td, chair cyclohexane D3d, staggered ethane D3d,
 * water C2v, ammonia C3v; memory), and npm-data.md records that openchemlib's minimised ethane
 * is staggered and its cyclohexane a chair.
 */
import { ConformerGenerator, ForceFieldMMFF94, Molecule, Resources, version as oclVersion } from 'openchemlib';
import { describe, expect, it } from 'vitest';
import { perceive, snap } from '@shared/engine';
import { type Atom, asInput } from './geometry';

const SEED = 42;

it('runs against openchemlib 9.25.0, the version the expected values were recorded with', () => {
  expect(oclVersion).toBe('9.25.0');
});

// Without this, new ConformerGenerator(seed) throws "static resources must be registered first".
// At module level: the describe bodies below build conformers while the tests are collected.
Resources.registerFromNodejs();

function atomsOf(mol: Molecule): Atom[] {
  const out: Atom[] = [];
  for (let i = 0; i < mol.getAllAtoms(); i++)
    out.push({ element: mol.getAtomLabel(i), x: mol.getAtomX(i), y: mol.getAtomY(i), z: mol.getAtomZ(i) });
  return out;
}

/** A raw conformer (explicit H, 3D) and, optionally, its MMFF94s minimum. */
function conformer(smiles: string, minimise: boolean): Atom[] {
  const mol = new ConformerGenerator(SEED).getOneConformerAsMolecule(Molecule.fromSmiles(smiles));
  if (!mol) throw new Error(`openchemlib made no conformer for ${smiles}`);
  if (minimise) {
    const code = new ForceFieldMMFF94(mol, 'MMFF94s', {}).minimise({ maxIts: 20000, gradTol: 1e-8, funcTol: 1e-12 });
    if (code !== 0) throw new Error(`MMFF94s minimise returned ${code} for ${smiles}`);
  }
  return atomsOf(mol);
}

describe('openchemlib 9.25.0 MMFF94s minima are perceived at the default tolerance', () => {
  it.each([
    ['benzene', 'c1ccccc1', 'D6h', 12],
    ['methane', 'C', 'Td', 5],
    ['cyclohexane (chair)', 'C1CCCCC1', 'D3d', 18],
    ['ethane (staggered)', 'CC', 'D3d', 8],
    ['water', 'O', 'C2v', 3],
    ['ammonia', 'N', 'C3v', 4],
  ])('%s (%s) → %s', (_name, smiles, group, count) => {
    const atoms = conformer(smiles, true);
    expect(atoms).toHaveLength(count);
    expect(perceive(atoms).pointGroup).toBe(group);
  });
});

describe('openchemlib 9.25.0 raw (unminimised) benzene conformer, noise ~1e-3 Å', () => {
  const atoms = conformer('c1ccccc1', false);
  it('is perceived as D6h at 0.01 Å', () => {
    expect(perceive(atoms, { tolerance: 0.01 }).pointGroup).toBe('D6h');
  });
  it('snaps to D6h moving no atom by more than 0.01 Å', () => {
    const r = snap(asInput('openchemlib raw benzene', atoms), { tolerance: 0.01 });
    expect(r.pointGroup).toBe('D6h');
    expect(r.symmetryRmsdAfter).toBeLessThanOrEqual(1e-10);
    // npm-data.md: C–C spread 7.2e-4 Å RMS, C–H 5.0e-4 Å: moving atoms by up to ~1e-2 would be wrong.
    expect(r.maxDisplacement).toBeLessThan(0.01);
    expect(r.displacementRmsd).toBeLessThan(0.005);
  });
});
