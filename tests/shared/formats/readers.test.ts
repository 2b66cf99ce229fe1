import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import {
  BOHR_IN_ANGSTROM,
  detectFormat,
  elementFromAtomName,
  formatParseFailure,
  iterateStructures,
  readStructures,
  type MoleculeInput,
  type ReadResult,
} from '@shared/formats';

/**
 * Reader tests. The files in ./samples are constructed test inputs (typical bond lengths and
 * angles typed from memory, with ±1e-3 Å noise), written to look like real programs' output.
 */

const sample = (name: string) => readFileSync(fileURLToPath(new URL(`./samples/${name}`, import.meta.url)));

const molecules = (rs: ReadResult[]): MoleculeInput[] => rs.flatMap((r) => (r.ok ? [r.molecule] : []));
const messages = (rs: ReadResult[]): string[] => rs.flatMap((r) => (r.ok ? [] : [formatParseFailure(r.error)]));
const formula = (m: MoleculeInput) => m.atoms.map((a) => a.element).join('');

describe('XYZ', () => {
  it('reads every frame of ligands.xyz and reports the short third frame with file, line and frame', () => {
    const rs = readStructures('ligands.xyz', sample('ligands.xyz'));
    expect(rs).toHaveLength(4);
    expect(molecules(rs).map((m) => m.name)).toEqual(['water, B3LYP/def2-TZVP optimized', 'ammonia opt', 'methane']);
    expect(molecules(rs).map((m) => m.frameIndex)).toEqual([0, 1, 3]);
    expect(messages(rs)).toEqual(['ligands.xyz:25: frame 3: expected 12 atom lines, found 11']);
  });

  it('hands the frames out one at a time, the same as reading the whole file', () => {
    const frames = iterateStructures('ligands.xyz', sample('ligands.xyz'));
    const first = frames.next();
    expect(first.done).toBe(false);
    expect(first.value).toEqual(readStructures('ligands.xyz', sample('ligands.xyz'))[0]);
    expect([first.value, ...frames]).toEqual(readStructures('ligands.xyz', sample('ligands.xyz')));
    expect([...iterateStructures('blank.xyz', '\n\n')]).toEqual(readStructures('blank.xyz', '\n\n'));
    expect([...iterateStructures('blank.xyz', '\n\n')].map((r) => !r.ok && r.error.message)).toEqual(['empty file']);
  });

  it('takes charge=, multiplicity= and mult= from the comment line and keeps the rest as the name', () => {
    const [water, ammonia, , methane] = readStructures('ligands.xyz', sample('ligands.xyz'));
    expect(water.ok && [water.molecule.charge, water.molecule.multiplicity]).toEqual([0, 1]);
    expect(ammonia.ok && [ammonia.molecule.charge, ammonia.molecule.multiplicity]).toEqual([null, null]);
    expect(methane.ok && [methane.molecule.charge, methane.molecule.multiplicity]).toEqual([0, 1]);
  });

  it('reads a comment line of 300,000 characters like a short one (no key=value scan that grows with its square)', () => {
    // Constructed test input: a long run of word characters with no '=', then one key.
    const long = `${'x'.repeat(300_000)} charge=1 multiplicity=2 tail`;
    const [r] = readStructures('long.xyz', new TextEncoder().encode(`1\n${long}\nHe 0 0 0\n`));
    expect(r.ok && [r.molecule.charge, r.molecule.multiplicity, r.molecule.name?.length]).toEqual([1, 2, 200]);
    // The same keys as in a short comment, wherever they stand: after digits, '-' or quotes too.
    const [s] = readStructures('keys.xyz', `1\n9charge=-1 -mult=3 'q'name\nHe 0 0 0\n`);
    expect(s.ok && [s.molecule.charge, s.molecule.multiplicity]).toEqual([-1, 3]);
  });

  it('reads coordinates exactly as written, in Å and file order', () => {
    const [water] = molecules(readStructures('ligands.xyz', sample('ligands.xyz')));
    expect(water.atoms[1]).toEqual({ element: 'H', x: -0.00085513, y: 0.75702209, z: -0.4688509 });
  });

  it('accepts a UTF-8 BOM, CRLF line ends, trailing blank lines, lower-case symbols and atomic numbers', () => {
    const text = '\uFEFF3\r\nwater\r\no 0 0 0.1173\r\n1 0 0.757 -0.469\r\nh 0 -0.757 -0.469\r\n\r\n\r\n';
    const rs = readStructures('w.xyz', new TextEncoder().encode(text));
    expect(messages(rs)).toEqual([]);
    expect(formula(molecules(rs)[0])).toBe('OHH');
    expect(molecules(rs)[0].name).toBe('water');
  });

  it('names a frame with an empty comment <file>#<frame>', () => {
    expect(molecules(readStructures('x.xyz', '1\n\nHe 0 0 0\n'))[0].name).toBe('x.xyz#1');
  });

  it('reports a count line that says fewer atoms than follow, and keeps the next frame', () => {
    const rs = readStructures('m.xyz', '2\nshort count\nH 0 0 0\nH 0 0 0.74\nH 0 0 3\n1\nnext\nNe 0 0 0\n');
    expect(messages(rs)).toEqual(['m.xyz:5: frame 1: the count line says 2 atoms but 3 atom lines follow']);
    expect(molecules(rs).map((m) => m.name)).toEqual(['next']);
  });

  it('reports a line that is not a count line and resumes at the next frame', () => {
    const rs = readStructures('j.xyz', 'garbage here\nH 0 0 0\n1\nok\nAr 0 0 0\n');
    expect(messages(rs)).toEqual(["j.xyz:1: frame 1: expected an atom count, found 'garbage here'"]);
    expect(molecules(rs)[0].atoms[0].element).toBe('Ar');
  });

  it('refuses NaN, Infinity and coordinates beyond 1e6 Å, naming atom and line', () => {
    expect(messages(readStructures('n.xyz', '2\n\nH 0 0 0\nH 0 NaN 0\n'))).toEqual([
      "n.xyz:4: frame 1: atom 2: coordinate 'NaN' is not a finite number",
    ]);
    expect(messages(readStructures('n.xyz', '1\n\nH Infinity 0 0\n'))).toEqual([
      "n.xyz:3: frame 1: atom 1: coordinate 'Infinity' is not a finite number",
    ]);
    expect(messages(readStructures('n.xyz', '1\n\nH 1e300 0 0\n'))).toEqual([
      "n.xyz:3: frame 1: atom 1: coordinate '1e300' is out of range (|x| > 1e6 Å)",
    ]);
    expect(messages(readStructures('n.xyz', '1\n\nH 0x10 0 0\n'))).toEqual(["n.xyz:3: frame 1: atom 1: coordinate '0x10' is not a number"]);
  });

  it('refuses unknown elements, with a hint for deuterium', () => {
    expect(messages(readStructures('u.xyz', '2\n\nXx 0 0 0\nH 0 0 1\n'))).toEqual(["u.xyz:3: frame 1: atom 1: unknown element 'Xx'"]);
    expect(messages(readStructures('u.xyz', '1\n\nD 0 0 0\n'))[0]).toMatch(/unknown element 'D' \(isotope labels are not supported; write H\)/);
  });

  it('reports 10⁶ atoms against the per-structure limit without reading them, and honours a configured limit', () => {
    const big = `1000000\nhuge\n${'H 0 0 0\n'.repeat(1000)}`;
    expect(messages(readStructures('big.xyz', big))).toEqual(['big.xyz:1: frame 1: 1,000,000 atoms exceeds the limit of 20,000 per structure']);
    const rs = readStructures('lim.xyz', '3\n\nH 0 0 0\nH 0 0 1\nH 0 0 2\n1\n\nHe 0 0 0\n', { maxAtoms: 2 });
    expect(messages(rs)).toEqual(['lim.xyz:1: frame 1: 3 atoms exceeds the limit of 2 per structure']);
    expect(molecules(rs)).toHaveLength(1);
  });

  it('refuses a non-integer charge and a zero multiplicity on the comment line', () => {
    expect(messages(readStructures('c.xyz', '1\ncharge=0.5\nH 0 0 0\n'))).toEqual(["c.xyz:2: frame 1: charge '0.5' is not an integer"]);
    expect(messages(readStructures('c.xyz', '1\nmultiplicity=0\nH 0 0 0\n'))).toEqual([
      "c.xyz:2: frame 1: multiplicity '0' is not an integer ≥ 1",
    ]);
  });
});

describe('extended XYZ', () => {
  it('reads species and pos columns from Properties, ignores Lattice and extra columns, reads atomic numbers', () => {
    const rs = readStructures('ethylene.extxyz', sample('ethylene.extxyz'));
    const [neutral, cation] = molecules(rs);
    expect(messages(rs)).toEqual([]);
    expect([neutral.name, neutral.charge, neutral.multiplicity, formula(neutral)]).toEqual(['ethylene opt', 0, 1, 'CCHHHH']);
    expect([cation.name, cation.charge, cation.multiplicity, formula(cation)]).toEqual(['ethylene-cation', 1, 2, 'CCHHHH']);
    expect(Math.abs(neutral.atoms[0].z - 0.6695)).toBeLessThan(2e-3);
  });

  it('finds pos wherever Properties puts it', () => {
    const [m] = molecules(readStructures('o.xyz', '1\nProperties=tag:I:1:pos:R:3:species:S:1\n7 1.5 2.5 3.5 Cl\n'));
    expect(m.atoms[0]).toEqual({ element: 'Cl', x: 1.5, y: 2.5, z: 3.5 });
  });

  it('reports a Properties without a pos column', () => {
    expect(messages(readStructures('p.extxyz', '1\nProperties=species:S:1:vel:R:3\nH 0 0 0\n'))).toEqual([
      'p.extxyz:2: frame 1: Properties has no pos column',
    ]);
  });
});

describe('molfile and SD', () => {
  it('reads every SD record, sums M  CHG, takes data items, and locates the broken record', () => {
    const rs = readStructures('ligands.sdf', sample('ligands.sdf'));
    expect(rs).toHaveLength(4);
    const ms = molecules(rs);
    expect(ms.map((m) => [m.name, formula(m), m.charge, m.multiplicity])).toEqual([
      ['methane', 'CHHHH', null, null],
      ['ammonium', 'NHHHH', 1, 1],
      ['water radical cation', 'OHH', 1, 2],
    ]);
    expect(messages(rs)).toEqual(['ligands.sdf:41: frame 3: expected 3 atom lines, found 2']);
  });

  it('reads a single molfile, atom-block charge codes when there is no M  CHG, and white-space separated lines', () => {
    const mol = [
      'hydroxide',
      '',
      '',
      '  2  1  0  0  0  0  0  0  0  0999 V2000',
      '    0.0000    0.0000    0.0000 O   0  5  0  0  0  0  0  0  0  0  0  0',
      '0.0 0.0 0.97 H 0 0',
      '  1  2  1  0',
      'M  END',
    ].join('\n');
    const [m] = molecules(readStructures('oh.mol', mol));
    expect([m.name, formula(m), m.charge, m.atoms[1].z]).toEqual(['hydroxide', 'OH', -1, 0.97]);
  });

  // V3000 records (read since V3000 support was added): tests/shared/formats/molfile-v3000.test.ts.
});

describe('PDB', () => {
  it('reads MODEL/ENDMDL frames, element columns 77–78 and, without them, the atom name', () => {
    const rs = readStructures('benzene.pdb', sample('benzene.pdb'));
    expect(messages(rs)).toEqual([]);
    const [m1, m2] = molecules(rs);
    expect([m1.name, m2.name]).toEqual(['BENZENE TWO SNAPSHOTS (model 1)', 'BENZENE TWO SNAPSHOTS (model 2)']);
    expect(formula(m1)).toBe('CCCCCCHHHHHH');
    expect(formula(m2)).toBe('CCCCCCHHHHHH');
    expect(Math.abs(Math.hypot(m1.atoms[0].x, m1.atoms[0].y) - 1.397)).toBeLessThan(3e-3);
  });

  it('derives elements from atom names by the PDB column convention', () => {
    // wwPDB format 3.3: one-letter element names start in column 14, two-letter ones in column 13.
    expect(elementFromAtomName(' CA ')).toBe('C');
    expect(elementFromAtomName('CA  ')).toBe('Ca');
    expect(elementFromAtomName('FE  ')).toBe('Fe');
    expect(elementFromAtomName('1HB ')).toBe('H');
    expect(elementFromAtomName('HG21')).toBe('H');
  });

  it('sums the charge columns, keeps only the first alternate location, and reports a short line', () => {
    const pdb = [
      'HETATM    1 CL   CL  A   1       0.000   0.000   0.000  1.00  0.00          CL1-',
      'HETATM    2 NA  ANA  A   2       2.800   0.000   0.000  0.50  0.00          NA1+',
      'HETATM    3 NA  BNA  A   2       2.900   0.000   0.000  0.50  0.00          NA1+',
      'END',
    ].join('\n');
    const [m] = molecules(readStructures('nacl.pdb', pdb));
    expect([formula(m), m.charge, m.atoms[1].x]).toEqual(['ClNa', 0, 2.8]);
    expect(messages(readStructures('s.pdb', 'ATOM      1  N   ALA A   1       1.000   2.000\n'))).toEqual([
      's.pdb:1: frame 1: atom 1: the line is too short for x, y, z in columns 31–54',
    ]);
  });
});

describe('CML', () => {
  it('reads molecules with atom elements and the atomArray array form, with prefixes, names and charges', () => {
    const rs = readStructures('water-ammonia.cml', sample('water-ammonia.cml'));
    expect(messages(rs)).toEqual([]);
    const [w, a] = molecules(rs);
    expect([w.name, formula(w), w.charge, w.multiplicity]).toEqual(['water', 'OHH', 0, 1]);
    expect([a.name, formula(a), a.charge, a.multiplicity]).toEqual(['ammonia', 'NHHH', null, null]);
  });

  it('refuses 2D-only atoms, and keeps molecules closed before a syntax error', () => {
    const cml = [
      '<cml>',
      '<molecule id="flat"><atomArray><atom id="a1" elementType="C" x2="0" y2="0"/></atomArray></molecule>',
      '<molecule id="ok" formalCharge="-1"><atomArray><atom id="a1" elementType="F" x3="0" y3="0" z3="0"/></atomArray></molecule>',
      '<molecule id="cut"><atomArray><atom id="a1" elementType="He" x3="0" y3="0" z3="0"/>',
    ].join('\n');
    const rs = readStructures('mixed.cml', cml);
    expect(messages(rs)).toEqual([
      'mixed.cml:2: frame 1: atom 1 (a1): no 3D coordinates (x3, y3, z3)',
      'mixed.cml:4: frame 3: XML syntax error: the document ends inside <atomArray>',
    ]);
    expect(molecules(rs).map((m) => [m.name, m.charge])).toEqual([['ok', -1]]);
  });
});

describe('QCSchema', () => {
  it('reads the molecule of a QCSchema output and converts bohr to Å with the CODATA 2018 Bohr radius', () => {
    const text = sample('methane.qcschema.json').toString('utf8');
    const raw = JSON.parse(text).molecule.geometry as number[];
    const [m] = molecules(readStructures('methane.qcschema.json', text));
    expect([m.name, formula(m), m.charge, m.multiplicity]).toEqual(['methane', 'CHHHH', 0, 1]);
    // CODATA 2018: a0 = 0.529177210903 Å.
    expect(BOHR_IN_ANGSTROM).toBe(0.529177210903);
    expect(m.atoms[1].x).toBeCloseTo(raw[3] * 0.529177210903, 14);
    expect(Math.abs(m.atoms[1].x - 1.087 / Math.sqrt(3))).toBeLessThan(2e-3);
  });

  it('reads an array of molecules as frames, nested geometry and lower-case symbols, and locates bad ones', () => {
    const doc = [
      { symbols: ['he'], geometry: [[0, 0, 0]] },
      { schema_name: 'qcschema_input', molecule: { symbols: ['H', 'H'], geometry: [0, 0, 0, 0, 0, 1.4], molecular_charge: 0 } },
      { symbols: ['H', 'H'], geometry: [0, 0, 0, 0, 0] },
      { symbols: ['H'], geometry: [0, 0, 0], real: [false] },
    ];
    const rs = readStructures('many.json', JSON.stringify(doc));
    expect(molecules(rs).map((m) => [m.name, formula(m)])).toEqual([
      ['many.json#1', 'He'],
      ['many.json#2', 'HH'],
    ]);
    expect(messages(rs)).toEqual([
      'many.json: frame 3: geometry has 5 numbers for 2 atoms (expected 6)',
      'many.json: frame 4: ghost atoms (real: false) are not supported',
    ]);
  });

  it('names the line of a JSON syntax error', () => {
    expect(messages(readStructures('bad.json', '{\n  "symbols": ["H"],\n  "geometry": [0, 0, 0,]\n}'))).toEqual([
      "bad.json:3: frame 1: JSON syntax error: unexpected ']'",
    ]);
  });
});

describe('whole-file problems and format detection', () => {
  it('reports binary junk, invalid UTF-8 and empty files as one failure each', () => {
    expect(messages(readStructures('img.xyz', new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0, 0, 0, 13])))).toEqual([
      'img.xyz: frame 1: not a text file (it contains NUL bytes)',
    ]);
    expect(messages(readStructures('latin1.xyz', new Uint8Array([0x31, 0x0a, 0xe9, 0x0a])))).toEqual([
      'latin1.xyz: frame 1: not a text file (it is not valid UTF-8)',
    ]);
    expect(messages(readStructures('empty.xyz', ''))).toEqual(['empty.xyz: frame 1: empty file']);
    expect(messages(readStructures('blank.sdf', '\n\n  \n'))).toEqual(['blank.sdf: frame 1: empty file']);
    expect(messages(readStructures('notes.txt', 'just some notes'))[0]).toMatch(/unrecognised file format/);
  });

  it('detects by extension first, then by content', () => {
    expect(detectFormat('a.XYZ', '1\n\nH 0 0 0')).toBe('xyz');
    expect(detectFormat('a.xyz', '1\nProperties=species:S:1:pos:R:3\nH 0 0 0')).toBe('extxyz');
    expect(detectFormat('a.sdf', '')).toBe('sdf');
    expect(detectFormat('a.ent', '')).toBe('pdb');
    expect(detectFormat('a.json', '')).toBe('qcschema');
    expect(detectFormat('upload', sample('ligands.sdf').toString())).toBe('sdf');
    expect(detectFormat('upload', sample('benzene.pdb').toString())).toBe('pdb');
    expect(detectFormat('upload', sample('water-ammonia.cml').toString())).toBe('cml');
    expect(detectFormat('upload', sample('methane.qcschema.json').toString())).toBe('qcschema');
    expect(detectFormat('upload', sample('ligands.xyz').toString())).toBe('xyz');
    expect(detectFormat('upload', 'hello')).toBeNull();
  });
});
