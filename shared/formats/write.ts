import type { OutputFormat } from '../contracts/settings';
import type { AtomJson, StructureResult } from '../contracts/structure';
import { EngineError } from '../engine/errors';
import { pointGroupAt } from '../engine';
import { writeMolfile, readMolfile } from './molfile';
import { readQcschema, writeQcschema } from './qcschema';
import type { ReadResult } from './types';
import { expandUniqueAtoms, readUniqueAtoms, writeUniqueAtoms } from './unique';
import { readXyz, writeExtxyz, writeXyz } from './xyz';

/**
 * Writing snapped structures, and proving that the written digits kept the symmetry.
 */

/** File-name suffix of each output format. */
export const OUTPUT_EXTENSIONS: Record<OutputFormat, string> = {
  xyz: '.xyz',
  extxyz: '.extxyz',
  mol: '.mol',
  qcschema: '.qcschema.json',
  unique: '.unique.txt',
};

/**
 * Tolerance (Å) at which {@link verifyWritten} re-perceives a written file: 1e-6 Å for the
 * formats with 12 decimals or full double precision. A V2000 molfile carries 4 decimals, so each
 * coordinate may be rounded by 5e-5 Å, each atom moved by up to √3·5e-5 ≈ 8.7e-5 Å and the centre
 * of mass by as much; an operation's residual (image of atom i about the centre versus its
 * partner j) can then grow by |δi| + |δj| + 2|δc| ≤ 3.5e-4 Å. The molfile check uses 5e-4 Å.
 */
export const VERIFY_TOLERANCE: Record<OutputFormat, number> = {
  xyz: 1e-6,
  extxyz: 1e-6,
  mol: 5e-4,
  qcschema: 1e-6,
  unique: 1e-6,
};

/** Largest coordinate difference (Å) allowed between the written and the in-memory atoms. */
const COORDINATE_TOLERANCE: Record<OutputFormat, number> = {
  xyz: 1e-9,
  extxyz: 1e-9,
  mol: 5.1e-5,
  qcschema: 1e-9,
  unique: 1e-9,
};

/**
 * The text of a snapped structure in an output format: XYZ and extended XYZ (12 decimals; the
 * comment carries name, group, subgroup, charge, multiplicity), molfile V2000 (4 decimals, bonds
 * from covalent radii, SD data items with charge, multiplicity and group), QCSchema JSON (bohr,
 * `extras.pointfold`), or `unique` (Pointfold's unique-atoms format, see unique.ts).
 * Coordinates are the result's output atoms (its frame), in the input's atom order.
 * @throws EngineError 'too-many-atoms' or 'bad-coordinates' when a molfile cannot hold the structure (over 999 atoms or bonds; a coordinate beyond the 10.4 column).
 */
export function writeStructure(format: OutputFormat, result: StructureResult): string {
  const h = {
    name: result.name,
    group: result.pointGroup,
    subgroup: result.computationalSubgroup,
    charge: result.charge,
    multiplicity: result.multiplicity,
  };
  switch (format) {
    case 'xyz':
      return writeXyz(result.atoms, h);
    case 'extxyz':
      return writeExtxyz(result.atoms, h);
    case 'mol':
      try {
        return writeMolfile(result.atoms, h);
      } catch (e) {
        throw new EngineError(/atoms/.test((e as Error).message) ? 'too-many-atoms' : 'bad-coordinates', (e as Error).message);
      }
    case 'qcschema':
      return writeQcschema(result.atoms, { ...h, engineVersion: result.engineVersion, frame: result.frame, tolerance: result.tolerance });
    case 'unique':
      return writeUniqueAtoms(result);
  }
}

/**
 * File name for a written structure: the input's base name (directories and extension dropped,
 * characters other than letters, digits, `.`, `_`, `-` replaced by `_`), a zero-padded 1-based
 * frame number when the input held several structures, and the format's extension
 * ({@link OUTPUT_EXTENSIONS}). `ligands.sdf`, frame 2 of 12, xyz → `ligands-02.xyz`.
 */
export function outputFileName(inputFile: string, frameIndex: number, frameCount: number, format: OutputFormat): string {
  const base = inputFile.split(/[\\/]/).pop() ?? '';
  // Two-part extensions first (a QCSchema file Pointfold wrote is `name.qcschema.json`).
  const bare = base.replace(/\.(gz|zip)$/i, '').replace(/\.qcschema\.json$/i, '').replace(/\.[^.]*$/, '');
  const stem = (bare || 'structure').replace(/[^A-Za-z0-9._-]/g, '_');
  const frame = frameCount > 1 ? `-${String(frameIndex + 1).padStart(String(frameCount).length, '0')}` : '';
  return `${stem}${frame}${OUTPUT_EXTENSIONS[format]}`;
}

function readBack(format: OutputFormat, text: string): ReadResult[] {
  switch (format) {
    case 'xyz':
    case 'extxyz':
      return readXyz('written', text);
    case 'mol':
      return readMolfile('written', text);
    case 'qcschema':
      return readQcschema('written', text);
    case 'unique':
      return [];
  }
}

function fail(format: OutputFormat, message: string): never {
  throw new EngineError('write-check-failed', `written ${format} file: ${message}`);
}

function compareAtoms(format: OutputFormat, got: readonly AtomJson[], want: readonly AtomJson[]): void {
  if (got.length !== want.length) fail(format, `${got.length} atoms read back, ${want.length} expected`);
  const tol = COORDINATE_TOLERANCE[format];
  for (let i = 0; i < want.length; i++) {
    const a = got[i];
    const b = want[i];
    if (a.element !== b.element) fail(format, `atom ${i + 1} reads back as ${a.element}, not ${b.element}`);
    const d = Math.max(Math.abs(a.x - b.x), Math.abs(a.y - b.y), Math.abs(a.z - b.z));
    if (!(d <= tol)) fail(format, `atom ${i + 1} moved by ${d.toExponential(2)} Å in writing (allowed ${tol} Å)`);
  }
}

/** The group of a snapped result at each verify tolerance, perceived once per result (not once per format). */
const expectedGroups = new WeakMap<readonly AtomJson[], Map<number, string>>();

function expectedGroup(result: StructureResult, tolerance: number): string {
  let byTolerance = expectedGroups.get(result.atoms);
  if (!byTolerance) {
    byTolerance = new Map();
    expectedGroups.set(result.atoms, byTolerance);
  }
  let group = byTolerance.get(tolerance);
  if (group === undefined) {
    group = pointGroupAt(result.atoms, tolerance);
    byTolerance.set(tolerance, group);
  }
  return group;
}

/**
 * Read a written file back and prove the symmetry survived its digits. The atoms must read back
 * in order with the same elements and coordinates (within the format's precision), and the point
 * group perceived on them at {@link VERIFY_TOLERANCE} (1e-6 Å; molfile 5e-4 Å) must equal the
 * group perceived at the same tolerance on the in-memory result. For `unique`, the group line and
 * the atom count are checked and the structure is rebuilt from the operations: every class must
 * regenerate its size and every rebuilt atom must match an output atom within 1e-6 Å.
 * @throws EngineError 'write-check-failed' with a one-line message.
 */
export function verifyWritten(format: OutputFormat, text: string, result: StructureResult): void {
  if (format === 'unique') {
    let f;
    try {
      f = readUniqueAtoms(text);
    } catch (e) {
      fail(format, (e as Error).message);
    }
    if (f.pointGroup !== result.pointGroup) fail(format, `group line says ${f.pointGroup}, expected ${result.pointGroup}`);
    if (f.atomCount !== result.atoms.length) fail(format, `atom count says ${f.atomCount}, expected ${result.atoms.length}`);
    const { atoms, classSizes } = expandUniqueAtoms(f, VERIFY_TOLERANCE.unique);
    f.unique.forEach((u, k) => {
      if (classSizes[k] !== u.classSize) fail(format, `unique atom ${u.index} regenerates ${classSizes[k]} atoms, its class has ${u.classSize}`);
    });
    if (atoms.length !== result.atoms.length) fail(format, `the operations rebuild ${atoms.length} atoms, expected ${result.atoms.length}`);
    for (const a of atoms) {
      const hit = result.atoms.some(
        (b) => b.element === a.element && Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z) < VERIFY_TOLERANCE.unique,
      );
      if (!hit) fail(format, `a rebuilt ${a.element} atom matches no atom of the structure`);
    }
    return;
  }
  const back = readBack(format, text);
  if (back.length !== 1) fail(format, `${back.length} structures read back, 1 expected`);
  const first = back[0];
  if (!first.ok) fail(format, first.error.message);
  compareAtoms(format, first.molecule.atoms, result.atoms);
  const { charge, multiplicity } = first.molecule;
  if (charge !== result.charge || multiplicity !== result.multiplicity) {
    fail(format, `charge/multiplicity read back as ${charge}/${multiplicity}, expected ${result.charge}/${result.multiplicity}`);
  }
  const tolerance = VERIFY_TOLERANCE[format];
  const want = expectedGroup(result, tolerance);
  const got = pointGroupAt(first.molecule.atoms, tolerance);
  if (got !== want) fail(format, `re-perceived at ${tolerance} Å as ${got}, but the snapped structure is ${want} at that tolerance`);
}
