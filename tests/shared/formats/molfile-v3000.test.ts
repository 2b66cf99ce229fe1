/**
 * Molfile V3000 and SD files with V3000 records.
 *
 * Sources. The outside writer and reader is openchemlib 9.25.0 (BSD-3-Clause, npm registry):
 * `Molecule.toMolfileV3()` and `toMolfile()` (V2000) write the files, `Molecule.fromMolfile`
 * reads them back. The V3000 layout of the hand-written samples (`M  V30` lines, COUNTS, ATOM and
 * BOND blocks, `KEY=VALUE` atom properties, `-` continuation lines, Sgroup/collection/OBJ3D
 * blocks) follows BIOVIA's "CTfile Formats" specification as remembered (from memory, not
 * checked against the document); openchemlib reading the same text the same way is the check
 * on that memory where it applies.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { ConformerGenerator, ForceFieldMMFF94, Molecule, Resources } from 'openchemlib';
import { describe, expect, it } from 'vitest';
import { perceive } from '@shared/engine';
import { detectFormat, formatParseFailure, readStructures, type MoleculeInput, type ReadResult } from '@shared/formats';

const sample = (name: string) => readFileSync(fileURLToPath(new URL(`./samples/${name}`, import.meta.url)));
const molecules = (rs: ReadResult[]): MoleculeInput[] => rs.flatMap((r) => (r.ok ? [r.molecule] : []));
const messages = (rs: ReadResult[]): string[] => rs.flatMap((r) => (r.ok ? [] : [formatParseFailure(r.error)]));
const formula = (m: MoleculeInput) => m.atoms.map((a) => a.element).join('');

// Without this, new ConformerGenerator(seed) throws "static resources must be registered first"
// (as in tests/shared/reference/openchemlib.test.ts).
Resources.registerFromNodejs();

/** An openchemlib 3D conformer (explicit H) of a SMILES, MMFF94s-minimised when asked. */
function oclMolecule(smiles: string, minimise = false): Molecule {
  const mol = new ConformerGenerator(42).getOneConformerAsMolecule(Molecule.fromSmiles(smiles));
  if (!mol) throw new Error(`openchemlib made no conformer for ${smiles}`);
  if (minimise) new ForceFieldMMFF94(mol, 'MMFF94s', {}).minimise({ maxIts: 20000, gradTol: 1e-8, funcTol: 1e-12 });
  return mol;
}

function only(rs: ReadResult[]): MoleculeInput {
  expect(messages(rs)).toEqual([]);
  expect(rs).toHaveLength(1);
  return molecules(rs)[0];
}

/**
 * openchemlib's reading of a molfile, in the file's axes: openchemlib keeps y and z negated
 * relative to the file (observed with 9.25.0: it reads a file's (x, y, z) as (x, −y, −z)).
 */
function oclReading(molfile: string) {
  const m = Molecule.fromMolfile(molfile);
  const atoms = [];
  for (let i = 0; i < m.getAllAtoms(); i++) atoms.push({ element: m.getAtomLabel(i), x: m.getAtomX(i), y: -m.getAtomY(i), z: -m.getAtomZ(i) });
  let charge = 0;
  for (let i = 0; i < m.getAllAtoms(); i++) charge += m.getAtomCharge(i);
  return { atoms, charge };
}

const maxDiff = (a: MoleculeInput['atoms'], b: MoleculeInput['atoms']) =>
  Math.max(...a.flatMap((p, i) => [Math.abs(p.x - b[i].x), Math.abs(p.y - b[i].y), Math.abs(p.z - b[i].z)]));

describe('V3000 written by openchemlib 9.25.0 reads like the V2000 it writes for the same molecule', () => {
  it.each([
    // [name, SMILES, atoms, total charge as the two files carry it]
    ['methane', 'C', 5, null],
    ['benzene', 'c1ccccc1', 12, null],
    ['ammonium', '[NH4+]', 5, 1],
    ['tetramethylammonium chloride', 'C[N+](C)(C)C.[Cl-]', 18, 0],
  ])('%s', (name, smiles, count, charge) => {
    const mol = oclMolecule(smiles);
    const v3 = mol.toMolfileV3();
    const v2 = mol.toMolfile();
    expect(v3.split('\n')[3]).toMatch(/V3000$/); // it really is V3000
    expect(v3).toMatch(/^M {2}V30 BEGIN ATOM$/m);
    const a = only(readStructures(`${name}.mol`, v3));
    const b = only(readStructures(`${name}.mol`, v2));
    expect(a.atoms).toHaveLength(count);
    // Elements: ours from both files, and openchemlib's own labels, in file order.
    const labels = Array.from({ length: mol.getAllAtoms() }, (_, i) => mol.getAtomLabel(i)).join('');
    expect(formula(a)).toBe(labels);
    expect(formula(b)).toBe(labels);
    // Coordinates: V2000 carries 4 decimals, and openchemlib 9.25.0 writes V3000 with at most 4 as
    // well (seen in its output); the two differ by at most one unit of the 4th decimal (seen: 1e-4
    // exactly for some coordinates, the last digit of the V3000 being rounded differently).
    expect(maxDiff(a.atoms, b.atoms)).toBeLessThanOrEqual(1.0001e-4);
    // Charge: CHG= summed in V3000, M  CHG summed in V2000; null when neither file has any.
    expect(a.charge).toBe(charge);
    expect(b.charge).toBe(charge);
    // openchemlib reading its own V3000 back: same coordinates (to float formatting) and the same total charge.
    const ocl = oclReading(v3);
    expect(ocl.atoms.map((p) => p.element).join('')).toBe(labels);
    expect(maxDiff(a.atoms, ocl.atoms)).toBeLessThan(1e-9);
    expect(ocl.charge).toBe(charge ?? 0);
    expect(a.multiplicity).toBeNull();
    expect(a.name).toBe(v3.split('\n')[0]);
  });

  it('an MMFF94s-minimised benzene written as V3000 is perceived D6h (textbook group, from memory)', () => {
    const m = only(readStructures('benzene.mol', oclMolecule('c1ccccc1', true).toMolfileV3()));
    expect(perceive(m.atoms).pointGroup).toBe('D6h');
  });

  it('an openchemlib V3000 file is detected as a molfile by content, and an SD file of them as SD', () => {
    const v3 = oclMolecule('C').toMolfileV3();
    expect(detectFormat('upload', v3)).toBe('mol');
    expect(detectFormat('upload', `${v3}$$$$\n${v3}$$$$\n`)).toBe('sdf');
    expect(detectFormat('m.MOL', v3)).toBe('mol');
    expect(detectFormat('m.sdf', v3)).toBe('sdf');
  });
});

describe('hand-written V3000 (layout from the CTfile Formats specification, from memory)', () => {
  const rs = readStructures('mixed-v3000.sdf', sample('mixed-v3000.sdf'));

  it('reads a mixed V2000/V3000 SD file record by record; the broken record fails alone, with its line', () => {
    expect(rs).toHaveLength(4);
    expect(molecules(rs).map((m) => [m.name, m.frameIndex, formula(m), m.charge, m.multiplicity])).toEqual([
      ['ammonium V3000', 0, 'NHHHH', 1, 1], // CHG=1 on N; multiplicity from the data item
      ['water V2000', 1, 'OHH', 0, null], // the charge data item of a V2000 record
      ['methane radical cation V3000', 3, 'CHHHH', 1, 2], // data items win over the (charge-free) table
    ]);
    // The existing coordinate check (the same message as every other format).
    expect(messages(rs)).toEqual(["mixed-v3000.sdf:57: frame 3: atom 2: coordinate 'NaN' is not a finite number"]);
  });

  it('joins continuation lines (even inside a number), skips KEY=VALUE, (lists) and Sgroup/collection/OBJ3D blocks', () => {
    const [nh4, , ch4] = molecules(rs);
    expect(nh4.atoms[2]).toEqual({ element: 'H', x: -0.5946, y: -0.5948, z: 0.5947 }); // "0 -" + "MASS=1"
    expect(nh4.atoms[3]).toEqual({ element: 'H', x: -0.5948, y: 0.5947, z: -0.5946 }); // "-0.59-" + "46 0"
    expect(nh4.atoms[4]).toEqual({ element: 'H', x: 0.5947, y: -0.5946, z: -0.5947 });
    expect(ch4.atoms[1]).toEqual({ element: 'H', x: 0.6276, y: 0.6276, z: 0.6276 });
  });

  it('openchemlib reads the continued record the same way (elements, coordinates, charge)', () => {
    const text = sample('mixed-v3000.sdf').toString('utf8');
    const record = text.slice(0, text.indexOf('$$$$'));
    const ocl = oclReading(record);
    const [nh4] = molecules(rs);
    expect(ocl.atoms.map((a) => a.element).join('')).toBe(formula(nh4));
    expect(maxDiff(nh4.atoms, ocl.atoms)).toBeLessThan(1e-9);
    expect(ocl.charge).toBe(nh4.charge);
  });

  it('sums CHG over the atoms (CHG=0 everywhere is 0, not "unknown"), and is case-insensitive about symbols', () => {
    const mol = (atoms: string[]) =>
      [
        ...['zwitterion', '', '', '  0  0  0     0  0            999 V3000'],
        ...['M  V30 BEGIN CTAB', `M  V30 COUNTS ${atoms.length} 0 0 0 0`, 'M  V30 BEGIN ATOM', ...atoms],
        ...['M  V30 END ATOM', 'M  V30 END CTAB', 'M  END'],
      ].join('\n');
    const zw = only(readStructures('z.mol', mol(['M  V30 1 N 0 0 0 0 CHG=1', 'M  V30 2 o 0 0 1.3 0 CHG=-1', 'M  V30 3 CL 0 0 -2 0 CHG=-1'])));
    expect([formula(zw), zw.charge]).toEqual(['NOCl', -1]);
    expect(only(readStructures('z.mol', mol(['M  V30 1 He 0 0 0 0 CHG=0']))).charge).toBe(0);
    expect(only(readStructures('z.mol', mol(['M  V30 1 He 0 0 0 0']))).charge).toBeNull();
  });
});

describe('V3000 errors: one line, located, and the other records still read', () => {
  /** A V3000 record around the given table lines (from COUNTS on); the table starts at line 5. */
  const record = (title: string, table: string[], tail = ['M  V30 END CTAB', 'M  END']) =>
    [title, '', '', '  0  0  0     0  0            999 V3000', 'M  V30 BEGIN CTAB', ...table, ...tail, '$$$$'].join('\n');
  const helium = record('helium', ['M  V30 COUNTS 1 0 0 0 0', 'M  V30 BEGIN ATOM', 'M  V30 1 He 0 0 0 0', 'M  V30 END ATOM']);
  /** Read a bad record followed by a good one; the good one must survive. */
  const errorOf = (table: string[], tail?: string[]) => {
    const rs = readStructures('bad.sdf', `${record('bad', table, tail)}\n${helium}\n`);
    expect(molecules(rs).map((m) => [m.name, m.frameIndex, formula(m)])).toEqual([['helium', 1, 'He']]);
    return messages(rs);
  };
  const atoms = (...lines: string[]) => ['M  V30 BEGIN ATOM', ...lines.map((l) => `M  V30 ${l}`), 'M  V30 END ATOM'];

  it('COUNTS that disagree with the atom lines, either way', () => {
    expect(errorOf(['M  V30 COUNTS 3 0 0 0 0', ...atoms('1 H 0 0 0 0', '2 H 0 0 0.74 0')])).toEqual([
      'bad.sdf:10: frame 1: the COUNTS line says 3 atoms but 2 atom lines follow',
    ]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 0 0 0', '2 H 0 0 0.74 0')])).toEqual([
      'bad.sdf:9: frame 1: the COUNTS line says 1 atoms but 2 atom lines follow',
    ]);
  });

  it('COUNTS that disagree with the bond lines', () => {
    expect(errorOf(['M  V30 COUNTS 2 2 0 0 0', ...atoms('1 H 0 0 0 0', '2 H 0 0 0.74 0'), 'M  V30 BEGIN BOND', 'M  V30 1 1 1 2', 'M  V30 END BOND'])).toEqual([
      'bad.sdf:11: frame 1: the COUNTS line says 2 bonds but 1 bond lines follow',
    ]);
  });

  it('a missing END ATOM, END CTAB, M  END or COUNTS line', () => {
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', 'M  V30 BEGIN ATOM', 'M  V30 1 H 0 0 0 0'])).toEqual([
      "bad.sdf:9: frame 1: the atom block has no 'M  V30 END ATOM' (found 'END CTAB')",
    ]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 0 0 0')], ['M  END'])).toEqual([
      "bad.sdf:10: frame 1: the V3000 table has no 'M  V30 END CTAB'",
    ]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 0 0 0')], ['M  V30 END CTAB', '> <charge>', '0'])).toEqual([
      "bad.sdf:11: frame 1: no 'M  END' after the V3000 table",
    ]);
    expect(errorOf(['M  V30 BEGIN ATOM'])).toEqual(["bad.sdf:6: frame 1: expected 'COUNTS atoms bonds …', found 'BEGIN ATOM'"]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', 'M  V30 BEGIN SGROUP'])).toEqual([
      "bad.sdf:8: frame 1: the SGROUP block begun on line 7 has no 'M  V30 END SGROUP'",
    ]);
  });

  it('bad numbers: counts, index, coordinates (NaN, 1e300, text), CHG, zero atoms', () => {
    expect(errorOf(['M  V30 COUNTS x 0 0 0 0'])).toEqual(["bad.sdf:6: frame 1: expected 'COUNTS atoms bonds …', found 'COUNTS x 0 0 0 0'"]);
    expect(errorOf(['M  V30 COUNTS 0 0 0 0 0'])).toEqual(['bad.sdf:6: frame 1: the atom count is 0']);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('one H 0 0 0 0')])).toEqual(["bad.sdf:8: frame 1: atom 1: index 'one' is not a positive integer"]);
    expect(errorOf(['M  V30 COUNTS 2 0 0 0 0', ...atoms('1 H 0 0 0 0', '1 H 0 0 1 0')])).toEqual(['bad.sdf:9: frame 1: atom 2: index 1 is used twice']);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 nan 0 0')])).toEqual(["bad.sdf:8: frame 1: atom 1: coordinate 'nan' is not a finite number"]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 1e300 0 0 0')])).toEqual([
      "bad.sdf:8: frame 1: atom 1: coordinate '1e300' is out of range (|x| > 1e6 Å)",
    ]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 0 zero 0')])).toEqual(["bad.sdf:8: frame 1: atom 1: coordinate 'zero' is not a number"]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 0 0 0 CHG=+')])).toEqual(["bad.sdf:8: frame 1: atom 1: CHG '+' is not an integer"]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms('1 H 0 0')])).toEqual(["bad.sdf:8: frame 1: atom 1: expected index type x y z aamap, found '1 H 0 0'"]);
  });

  it('atom lists, pseudo-atoms and unknown symbols, like unknown elements in V2000', () => {
    const one = (line: string) => errorOf(['M  V30 COUNTS 1 0 0 0 0', ...atoms(line)]);
    expect(one('1 [C,N,O] 0 0 0 0')).toEqual(["bad.sdf:8: frame 1: atom 1: atom list '[C,N,O]' is not an element"]);
    expect(one('1 NOT [C,N] 0 0 0 0')).toEqual(["bad.sdf:8: frame 1: atom 1: atom list 'NOT [C,N]' is not an element"]);
    expect(one('1 * 0 0 0 0')).toEqual(["bad.sdf:8: frame 1: atom 1: unknown element '*'"]);
    expect(one('1 R# 0 0 0 0 RGROUPS=(1 1)')).toEqual(["bad.sdf:8: frame 1: atom 1: unknown element 'R#'"]);
    expect(one('1 Q 0 0 0 0')).toEqual(["bad.sdf:8: frame 1: atom 1: unknown element 'Q'"]);
    expect(one('1 D 0 0 0 0')[0]).toMatch(/atom 1: unknown element 'D' \(isotope labels are not supported; write H\)$/);
  });

  it('a continuation line that is not continued, and a stray line inside the table', () => {
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', 'M  V30 BEGIN ATOM', 'M  V30 1 H 0 0 0 0 -', 'CHG=1', 'M  V30 END ATOM'])).toEqual([
      "bad.sdf:9: frame 1: the line ending in '-' (line 8) is not continued by an 'M  V30' line",
    ]);
    expect(errorOf(['M  V30 COUNTS 1 0 0 0 0', 'M  CHG  1   1   1', ...atoms('1 H 0 0 0 0')])).toEqual([
      "bad.sdf:7: frame 1: expected an 'M  V30' line in the V3000 table, found 'M  CHG  1   1   1'",
    ]);
  });

  it('the atom limit, from COUNTS, without reading the atom lines', () => {
    const rs = readStructures('big.sdf', `${record('big', ['M  V30 COUNTS 3 0 0 0 0', ...atoms('1 H 0 0 0 0', '2 H 0 0 1 0', '3 H 0 0 2 0')])}\n${helium}\n`, { maxAtoms: 2 });
    expect(messages(rs)).toEqual(['big.sdf:6: frame 1: 3 atoms exceeds the limit of 2 per structure']);
    expect(molecules(rs).map((m) => m.name)).toEqual(['helium']);
  });

  it('a table that stops after BEGIN CTAB (as the old refusal test had it)', () => {
    const v3 = 'x\n\n\n  0  0  0     0  0            999 V3000\nM  V30 BEGIN CTAB\n';
    expect(messages(readStructures('v3.mol', v3))).toEqual(["v3.mol:6: frame 1: the V3000 table ends early (expected 'M  V30 COUNTS')"]);
  });
});
