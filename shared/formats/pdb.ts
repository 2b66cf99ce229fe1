import type { AtomJson } from '../contracts/structure';
import { normalizeElement } from '../elements';
import {
  DEFAULT_MAX_ATOMS,
  FrameError,
  LineReader,
  atomFrom,
  cleanName,
  defaultName,
  failure,
  tooManyAtoms,
  type ReadOptions,
} from './common';
import type { ReadResult } from './types';

/**
 * PDB coordinate files, after the wwPDB "Atomic Coordinate Entry Format" (version 3.3), fixed
 * columns: ATOM/HETATM name 13–16, altLoc 17, x 31–38, y 39–46, z 47–54 (Å), element 77–78,
 * charge 79–80 (`2+`, `1-`). MODEL … ENDMDL blocks are frames; without MODEL records the whole
 * file is one structure. Of alternate locations only the first (blank or `A`) is kept, so
 * disordered sites do not become coincident atoms. Where columns 77–78 are blank (common in
 * files written by QC programs) the element comes from the atom name: a name starting in
 * column 14 (or with a digit in column 13) holds a one-letter element in column 14; a name
 * starting in column 13 holds a two-letter element in 13–14 unless it is a 4-character
 * hydrogen name such as `HG21` (the PDB's own convention; the hydrogen exception is common
 * practice). Charge: the sum of columns 79–80 where any atom has one, else null. Name: the
 * TITLE (or COMPND) text, with the model number when there are several models.
 */

/** Element of a PDB atom from its 4-column name (columns 13–16), or null. */
export function elementFromAtomName(name4: string): string | null {
  const n = name4.padEnd(4);
  const c13 = n[0];
  const c14 = n[1];
  if (c13 === ' ' || /\d/.test(c13)) return normalizeElement(c14);
  const trimmed = n.trim();
  if (c13.toUpperCase() === 'H' && trimmed.length === 4) return 'H';
  const two = normalizeElement(`${c13}${c14}`);
  if (two != null && /[A-Za-z]/.test(c14)) return two;
  return normalizeElement(c13);
}

function pdbCharge(field: string): number {
  const m = /^\s*(\d)([+-])\s*$/.exec(field);
  if (!m) return 0;
  return (m[2] === '-' ? -1 : 1) * Number(m[1]);
}

interface Model {
  line: number;
  serial: string;
  atoms: AtomJson[];
  count: number;
  charge: number | null;
  error: FrameError | null;
}

/** Read every model of a PDB file. Never throws. */
export function readPdb(file: string, text: string, options: ReadOptions = {}): ReadResult[] {
  const maxAtoms = options.maxAtoms ?? DEFAULT_MAX_ATOMS;
  const r = new LineReader(text);
  const models: Model[] = [];
  let current: Model | null = null;
  let usedModels = false;
  const titleParts: string[] = [];
  const compndParts: string[] = [];
  const fresh = (line: number, serial: string): Model => ({ line, serial, atoms: [], count: 0, charge: null, error: null });

  for (let t = r.next(); t !== null; t = r.next()) {
    const rec = t.slice(0, 6).trimEnd().toUpperCase();
    if (rec === 'TITLE') titleParts.push(t.slice(10, 80).trim());
    else if (rec === 'COMPND') compndParts.push(t.slice(10, 80).trim());
    else if (rec === 'MODEL') {
      usedModels = true;
      current = fresh(r.lineNo, t.slice(10, 14).trim());
      models.push(current);
    } else if (rec === 'ENDMDL') {
      current = null;
    } else if (rec === 'END') {
      break;
    } else if (rec === 'ATOM' || rec === 'HETATM') {
      if (current == null) {
        // Atoms outside MODEL blocks: one implicit model (a second one after an ENDMDL).
        current = fresh(r.lineNo, '');
        models.push(current);
      }
      const m = current;
      m.count++;
      if (m.error) continue;
      if (m.count > maxAtoms) {
        m.error = new FrameError(m.line, ''); // message written once the whole model is counted
        m.atoms = [];
        continue;
      }
      const altLoc = t[16] ?? ' ';
      if (altLoc !== ' ' && altLoc.toUpperCase() !== 'A') continue;
      try {
        if (t.length < 54) throw new FrameError(r.lineNo, `atom ${m.count}: the line is too short for x, y, z in columns 31–54`);
        const name4 = t.slice(12, 16);
        const elementField = t.slice(76, 78).trim();
        let element: string | number | null = elementField !== '' ? elementField : elementFromAtomName(name4);
        if (element == null) element = name4.trim();
        const a = atomFrom(element, t.slice(30, 38), t.slice(38, 46), t.slice(46, 54), m.count, r.lineNo);
        m.atoms.push(a);
        const c = t.slice(78, 80);
        if (c.trim() !== '') m.charge = (m.charge ?? 0) + pdbCharge(c);
      } catch (e) {
        if (!(e instanceof FrameError)) throw e;
        m.error = e;
      }
    }
  }
  const title = cleanName(titleParts.join(' ')) ?? cleanName(compndParts.join(' ').replace(/^MOL_ID:\s*\d+;\s*MOLECULE:\s*/i, ''));
  const out: ReadResult[] = models.map((m, frame): ReadResult => {
    if (m.count > maxAtoms) return failure(file, frame, m.line, tooManyAtoms(m.count, maxAtoms));
    if (m.error) return failure(file, frame, m.error.line, m.error.message);
    if (m.atoms.length === 0) return failure(file, frame, m.line, 'the model has no ATOM or HETATM records');
    const name = title == null ? defaultName(file, frame) : models.length > 1 ? `${title} (model ${m.serial || frame + 1})` : title;
    return {
      ok: true,
      molecule: { name, sourceFile: file, frameIndex: frame, atoms: m.atoms, charge: m.charge, multiplicity: null },
    };
  });
  if (out.length === 0) out.push(failure(file, 0, null, usedModels ? 'no atoms in any MODEL' : 'no ATOM or HETATM records'));
  return out;
}
