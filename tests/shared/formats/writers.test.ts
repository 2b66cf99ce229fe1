import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { outputFormats, type OutputFormat } from '@shared/contracts/settings';
import type { StructureResult } from '@shared/contracts/structure';
import { isEngineError, snap } from '@shared/engine';
import {
  BOHR_IN_ANGSTROM,
  VERIFY_TOLERANCE,
  expandUniqueAtoms,
  outputFileName,
  readStructures,
  readUniqueAtoms,
  verifyWritten,
  writeStructure,
  type MoleculeInput,
} from '@shared/formats';

/**
 * Writers: each format is written, read back by Pointfold's readers and re-perceived
 * (verifyWritten), on the constructed sample structures (tests/shared/formats/samples).
 */

const sample = (name: string) => readFileSync(fileURLToPath(new URL(`./samples/${name}`, import.meta.url)));
const firstMolecule = (file: string, index = 0): MoleculeInput => {
  const r = readStructures(file, sample(file)).filter((x) => x.ok)[index];
  if (!r?.ok) throw new Error(`no structure ${index} in ${file}`);
  return r.molecule;
};

let results: Record<string, StructureResult>;
beforeAll(() => {
  results = {
    water: snap(firstMolecule('ligands.xyz', 0)),
    ammonia: snap(firstMolecule('ligands.xyz', 1)),
    methane: snap(firstMolecule('methane.qcschema.json')),
    ammonium: snap(firstMolecule('ligands.sdf', 1)),
    benzene: snap(firstMolecule('benzene.pdb')),
    ethyleneCation: snap(firstMolecule('ethylene.extxyz', 1)),
  };
});

const formats = outputFormats as readonly OutputFormat[];

function checkThrowsWriteCheck(f: () => void, pattern: RegExp) {
  try {
    f();
  } catch (e) {
    expect(isEngineError(e) && e.code).toBe('write-check-failed');
    expect((e as Error).message).toMatch(pattern);
    return;
  }
  throw new Error('expected a write-check-failed error');
}

describe('round trip of every output format', () => {
  it.each(['water', 'ammonia', 'methane', 'ammonium', 'benzene', 'ethyleneCation'])('%s: every format passes the write-back check', (key) => {
    const r = results[key];
    for (const format of formats) {
      const text = writeStructure(format, r);
      expect(() => verifyWritten(format, text, r), `${key} ${format}`).not.toThrow();
    }
  });

  it('XYZ and extended XYZ keep ≥ 10 decimals, the name, the group, charge and multiplicity', () => {
    const r = results.ethyleneCation;
    for (const format of ['xyz', 'extxyz'] as const) {
      const text = writeStructure(format, r);
      const lines = text.split('\n');
      expect(lines[0]).toBe('6');
      expect(lines[2]).toMatch(/^C\s+-?\d+\.\d{12}\s+-?\d+\.\d{12}\s+-?\d+\.\d{12}$/);
      const [back] = readStructures(`x.${format}`, text);
      expect(back.ok && [back.molecule.name, back.molecule.charge, back.molecule.multiplicity]).toEqual(['ethylene-cation', 1, 2]);
      expect(lines[1]).toMatch(format === 'xyz' ? /group=D2h subgroup=D2h charge=1 multiplicity=2/ : /point_group=D2h computational_subgroup=D2h/);
      if (back.ok) back.molecule.atoms.forEach((a, i) => expect(Math.abs(a.x - r.atoms[i].x)).toBeLessThan(1e-12));
    }
  });

  it('molfile V2000: MDL fixed columns, 4 decimals, bonds from covalent radii, SD data items', () => {
    const text = writeStructure('mol', results.ammonium);
    const lines = text.split('\n');
    expect(lines[0]).toBe('ammonium');
    // CTfile counts line: aaabbblllfffcccsssxxxrrrpppiiimmmvvvvvv.
    expect(lines[3]).toBe('  5  4  0  0  0  0  0  0  0  0999 V2000');
    expect(lines[4]).toMatch(/^[ -]\s*\d+\.\d{4}[ -]\s*\d+\.\d{4}[ -]\s*\d+\.\d{4} N   0  0/);
    expect(lines[4].length).toBe(69);
    // N–H ≈ 1.03 Å < 0.71 + 0.31 + 0.45 (Cordero radii plus slack); H···H ≈ 1.68 Å > 0.31 + 0.31 + 0.45.
    expect(lines.slice(9, 13)).toEqual(['  1  2  1  0  0  0  0', '  1  3  1  0  0  0  0', '  1  4  1  0  0  0  0', '  1  5  1  0  0  0  0']);
    expect(text).toMatch(/M {2}END\n> <charge>\n1\n\n> <multiplicity>\n1\n/);
    expect(text.trimEnd().endsWith('$$$$')).toBe(true);
    expect(VERIFY_TOLERANCE.mol).toBe(5e-4);
  });

  it('QCSchema: MolSSI field names, geometry in bohr at full precision, fixed frame, extras.pointfold', () => {
    const r = results.methane;
    const doc = JSON.parse(writeStructure('qcschema', r));
    // Field names as in MolSSI QCSchema qcschema/dev/molecule.py.
    expect(doc.schema_name).toBe('qcschema_molecule');
    expect(doc.schema_version).toBe(2);
    expect(doc.symbols).toEqual(['C', 'H', 'H', 'H', 'H']);
    expect(doc.geometry).toHaveLength(15);
    expect(doc.geometry[3] * 0.529177210903).toBeCloseTo(r.atoms[1].x, 14);
    expect(BOHR_IN_ANGSTROM).toBe(0.529177210903);
    expect([doc.molecular_charge, doc.molecular_multiplicity, doc.fix_com, doc.fix_orientation]).toEqual([0, 1, true, true]);
    expect(doc.extras.pointfold).toMatchObject({ point_group: 'Td', computational_subgroup: r.computationalSubgroup, engine_version: r.engineVersion });
  });

  it('unique atoms: the group, the unique atoms with their class sizes, and the structure rebuilt from them', () => {
    const r = results.benzene;
    const text = writeStructure('unique', r);
    const f = readUniqueAtoms(text);
    expect([f.pointGroup, f.computationalSubgroup, f.atomCount, f.operations.length]).toEqual(['D6h', 'D2h', 12, 24]);
    expect(f.unique.map((u) => [u.element, u.classSize])).toEqual([
      ['C', 6],
      ['H', 6],
    ]);
    const rebuilt = expandUniqueAtoms(f);
    expect(rebuilt.atoms).toHaveLength(12);
    for (const a of rebuilt.atoms) {
      const d = Math.min(...r.atoms.filter((b) => b.element === a.element).map((b) => Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z)));
      expect(d).toBeLessThan(1e-9);
    }
  });
});

describe('the write-back check catches lost symmetry', () => {
  it('refuses an XYZ whose digits were cut so that an atom moved', () => {
    const r = results.benzene;
    const text = writeStructure('xyz', r).replace(/(\n\S+\s+-?\d+\.\d{3})\d{9}/, '$1000000000');
    checkThrowsWriteCheck(() => verifyWritten('xyz', text, r), /^written xyz file: atom 1 moved by/);
  });

  it('refuses a file whose re-perceived group differs (one H pushed 0.01 Å, the result edited to match)', () => {
    const r = results.water;
    const moved: StructureResult = { ...r, atoms: r.atoms.map((a, i) => (i === 1 ? { ...a, x: a.x + 0.01 } : a)) };
    const text = writeStructure('qcschema', moved);
    // The text matches `moved` exactly, but `moved` is not what was snapped: compare to the real result.
    checkThrowsWriteCheck(() => verifyWritten('qcschema', text, r), /atom 2 moved/);
    // And when the in-memory result itself carries the broken geometry, perception still agrees
    // with itself, so the check passes: it proves the digits, not the snap.
    expect(() => verifyWritten('qcschema', text, moved)).not.toThrow();
  });

  it('refuses a unique-atoms file with the wrong group line or a missing operation', () => {
    const r = results.ammonia;
    const text = writeStructure('unique', r);
    checkThrowsWriteCheck(() => verifyWritten('unique', text.replace('point-group: C3v', 'point-group: C3h'), r), /group line says C3h/);
    // Keep only E and C3²: the three H no longer regenerate from the unique one.
    const cut = text.split('\n').filter((l) => !/^op (C3|σv) /.test(l)).join('\n').replace(/operations: 6/, 'operations: 2');
    checkThrowsWriteCheck(() => verifyWritten('unique', cut, r), /^written unique file: unique atom 2 regenerates 2 atoms, its class has 3$/);
  });

  it('refuses a molfile that lost an atom', () => {
    const r = results.methane;
    const text = writeStructure('mol', r).replace(/^ {2}5 {2}4/m, '  4  4');
    checkThrowsWriteCheck(() => verifyWritten('mol', text, r), /written mol file/);
  });
});

describe('output file names', () => {
  it('uses the input base name, a padded frame number for multi-frame inputs, and the format extension', () => {
    expect(outputFileName('runs/ligands.sdf', 1, 12, 'xyz')).toBe('ligands-02.xyz');
    expect(outputFileName('C:\\data\\water.xyz', 0, 1, 'qcschema')).toBe('water.qcschema.json');
    expect(outputFileName('batch.zip/dir/my mol.pdb', 4, 5, 'unique')).toBe('my_mol-5.unique.txt');
    expect(outputFileName('noext', 0, 1, 'mol')).toBe('noext.mol');
    // A file Pointfold wrote, fed back in: its two-part extension goes as a whole.
    expect(outputFileName('out/water.qcschema.json', 0, 1, 'xyz')).toBe('water.xyz');
    expect(outputFileName('out/water.qcschema.json', 0, 1, 'qcschema')).toBe('water.qcschema.json');
    expect(outputFileName('a.b.cml', 0, 1, 'extxyz')).toBe('a.b.extxyz');
  });
});
