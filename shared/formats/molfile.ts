import type { AtomJson } from '../contracts/structure';
import { covalentRadius } from '../elements';
import {
  DEFAULT_MAX_ATOMS,
  FrameError,
  LineReader,
  atomFrom,
  chargeFrom,
  cleanName,
  defaultName,
  failure,
  multiplicityFrom,
  parseInteger,
  quote,
  tooManyAtoms,
  type ReadOptions,
} from './common';
import { fixed } from './xyz';
import type { ReadResult } from './types';

/**
 * MDL molfile (V2000 connection table) and SD files (molfiles separated by `$$$$`, each with
 * optional `> <field>` data items), after the published CTfile formats description (MDL/BIOVIA).
 *
 * Read: the title line is the name; the counts line gives the atom and bond counts; the atom
 * block gives x y z (Å) and the symbol; bonds are skipped (Pointfold needs only positions).
 * Total charge: the sum of `M  CHG` entries when any are present (they supersede the atom block,
 * as the CTfile description says), else the sum of the atom-block charge codes when any are
 * non-zero, else null — so a batch's default charge applies to files that say nothing. Data items
 * `> <charge>` and `> <multiplicity>` (any case) win over both. V3000 tables are refused with a
 * clear message.
 */

const CHARGE_CODE: Record<number, number> = { 1: 3, 2: 2, 3: 1, 4: 0, 5: -1, 6: -2, 7: -3 };

/** Reads the lines of one SD record; never reads past its `$$$$`. */
class RecordReader {
  constructor(private readonly r: LineReader) {}
  /** Number of the last line returned. */
  get no(): number {
    return this.r.lineNo;
  }
  /** The next line of the record, or null at `$$$$` (left unread) or the end of the text. */
  next(): string | null {
    const t = this.r.peek();
    if (t === null || t.startsWith('$$$$')) return null;
    return this.r.next();
  }
  /** Like next, but a missing line is an error naming what was expected. */
  need(what: string): string {
    const t = this.next();
    if (t === null) throw new FrameError(this.r.lineNo + 1, `the record ends early (expected ${what})`);
    return t;
  }
  /** Skip to the end of the record and consume its `$$$$`. */
  finish(): void {
    while (this.next() !== null);
    if (this.r.peek() !== null) this.r.next();
  }
}

function parseRecord(file: string, frame: number, rec: RecordReader, maxAtoms: number): ReadResult {
  const title = rec.need('a title line');
  rec.need('a program line');
  rec.need('a comment line');
  const counts = rec.need('a counts line');
  const countsNo = rec.no;
  if (/V3000/i.test(counts)) throw new FrameError(countsNo, 'V3000 molfiles are not supported; save as V2000');
  let nAtoms = parseInteger(counts.slice(0, 3));
  let nBonds = parseInteger(counts.slice(3, 6));
  if (nAtoms == null || nBonds == null) {
    // Some writers do not keep the fixed columns; accept white-space separated counts.
    const t = counts.trim().split(/\s+/);
    nAtoms = parseInteger(t[0] ?? '');
    nBonds = parseInteger(t[1] ?? '');
  }
  if (nAtoms == null || nBonds == null) throw new FrameError(countsNo, `expected a counts line, found ${quote(counts)}`);
  if (nAtoms === 0) throw new FrameError(countsNo, 'the atom count is 0');
  if (nAtoms > maxAtoms) throw new FrameError(countsNo, tooManyAtoms(nAtoms, maxAtoms));

  const atoms: AtomJson[] = [];
  let blockCharge = 0;
  for (let i = 0; i < nAtoms; i++) {
    const t = rec.next();
    // The end of the record, M  END or a line of integers only (a bond line): the block is short.
    if (t === null || /^M {2}/.test(t) || /^(\s*[+-]?\d+)+\s*$/.test(t)) {
      throw new FrameError(t === null ? rec.no + 1 : rec.no, `expected ${nAtoms} atom lines, found ${i}`);
    }
    let atom: AtomJson;
    let code = 0;
    const sym = t.slice(31, 34).trim();
    if (t.length >= 34 && sym !== '' && /^[A-Za-z]/.test(sym)) {
      atom = atomFrom(sym, t.slice(0, 10), t.slice(10, 20), t.slice(20, 30), i + 1, rec.no);
      code = parseInteger(t.slice(36, 39)) ?? 0;
    } else {
      const tok = t.trim().split(/\s+/);
      if (tok.length < 4) throw new FrameError(rec.no, `atom ${i + 1}: expected x y z element, found ${quote(t)}`);
      atom = atomFrom(tok[3], tok[0], tok[1], tok[2], i + 1, rec.no);
      code = parseInteger(tok[5] ?? '0') ?? 0;
    }
    blockCharge += CHARGE_CODE[code] ?? 0;
    atoms.push(atom);
  }
  for (let i = 0; i < nBonds; i++) {
    const t = rec.next();
    if (t === null || /^M {2}END/.test(t)) {
      throw new FrameError(t === null ? rec.no + 1 : rec.no, `expected ${nBonds} bond lines, found ${i}`);
    }
  }

  // Properties block up to M  END (old writers may omit it when nothing follows).
  let chgSum: number | null = null;
  for (let t = rec.next(); t !== null && !/^M {2}END/.test(t); t = rec.next()) {
    if (!/^M {2}CHG/.test(t)) continue;
    const tok = t.slice(6).trim().split(/\s+/).map((v) => parseInteger(v));
    const n = tok[0];
    if (n == null || tok.length < 1 + 2 * n || tok.some((v) => v == null)) {
      throw new FrameError(rec.no, `M  CHG line is malformed: ${quote(t)}`);
    }
    for (let j = 0; j < n; j++) chgSum = (chgSum ?? 0) + (tok[2 + 2 * j] as number);
  }
  let charge: number | null = chgSum ?? (blockCharge !== 0 ? blockCharge : null);
  let multiplicity: number | null = null;

  // SD data items: "> <field>" (possibly with other text on the line), the value on the next line.
  for (let t = rec.next(); t !== null; t = rec.next()) {
    const m = /^>.*?<([^>]+)>/.exec(t);
    if (!m) continue;
    const field = m[1].trim().toLowerCase();
    const value = rec.next();
    if (value === null) break;
    if (field === 'charge' || field === 'total_charge') charge = chargeFrom(value.trim(), rec.no);
    if (field === 'multiplicity' || field === 'spin_multiplicity') multiplicity = multiplicityFrom(value.trim(), rec.no);
  }

  return {
    ok: true,
    molecule: {
      name: cleanName(title) ?? defaultName(file, frame),
      sourceFile: file,
      frameIndex: frame,
      atoms,
      charge,
      multiplicity,
    },
  };
}

/** Read a molfile or an SD file (every record). Never throws. */
export function readMolfile(file: string, text: string, options: ReadOptions = {}): ReadResult[] {
  const maxAtoms = options.maxAtoms ?? DEFAULT_MAX_ATOMS;
  const r = new LineReader(text);
  const rec = new RecordReader(r);
  const out: ReadResult[] = [];
  for (let frame = 0; ; frame++) {
    // Blank lines at the end are not a record (a blank title line inside a record is fine).
    if (r.restIsBlank()) break;
    try {
      out.push(parseRecord(file, frame, rec, maxAtoms));
    } catch (e) {
      if (!(e instanceof FrameError)) throw e;
      out.push(failure(file, frame, e.line, e.message));
    }
    rec.finish();
  }
  if (out.length === 0) out.push(failure(file, 0, null, 'empty file (no structures)'));
  return out;
}

/** Extra Å added to the sum of covalent radii when drawing bonds (common practice, no source). */
export const BOND_SLACK = 0.45;

/**
 * Pairs of atoms (0-based i < j) closer than the sum of their covalent radii (Cordero 2008) plus
 * {@link BOND_SLACK}. Bond orders are not perceived.
 */
export function guessBonds(atoms: readonly AtomJson[]): [number, number][] {
  const r = atoms.map((a) => covalentRadius(a.element));
  const bonds: [number, number][] = [];
  for (let i = 0; i < atoms.length; i++) {
    for (let j = i + 1; j < atoms.length; j++) {
      const dx = atoms[i].x - atoms[j].x;
      const dy = atoms[i].y - atoms[j].y;
      const dz = atoms[i].z - atoms[j].z;
      const cut = r[i] + r[j] + BOND_SLACK;
      const d2 = dx * dx + dy * dy + dz * dz;
      if (d2 < cut * cut && d2 > 0.01) bonds.push([i, j]);
    }
  }
  return bonds;
}

/** Fields of a written molfile besides the atoms. */
export interface MolfileHeader {
  name: string;
  group: string;
  subgroup: string;
  charge: number;
  multiplicity: number;
}

const pad = (v: number | string, w: number) => String(v).padStart(w);

/**
 * A V2000 molfile: title, program line `  Pointfld          3D` (no date, so the output is
 * reproducible), a comment with the group; coordinates with 4 decimals (all V2000 carries);
 * bonds from {@link guessBonds}, all written as single bonds (type 1) because orders are not
 * perceived; no per-atom charges (only the total is known), so the total charge and the
 * multiplicity, the point group and the computational subgroup follow `M  END` as SD data items
 * ending with `$$$$` — a one-record SD file, which molfile readers accept.
 * @throws RangeError if there are more than 999 atoms or bonds or a coordinate does not fit 10.4.
 */
export function writeMolfile(atoms: readonly AtomJson[], h: MolfileHeader): string {
  const bonds = guessBonds(atoms);
  if (atoms.length > 999 || bonds.length > 999) {
    throw new RangeError(`a V2000 molfile holds at most 999 atoms and 999 bonds (this structure: ${atoms.length} atoms, ${bonds.length} bonds)`);
  }
  if (atoms.some((a) => Math.max(Math.abs(a.x), Math.abs(a.y), Math.abs(a.z)) >= 99999.99995)) {
    throw new RangeError('a coordinate is too large for the molfile 10.4 column');
  }
  const out: string[] = [];
  out.push((cleanName(h.name) ?? '').slice(0, 80));
  out.push('  Pointfld          3D');
  out.push(`point group ${h.group}; computational subgroup ${h.subgroup}`.slice(0, 80));
  out.push(`${pad(atoms.length, 3)}${pad(bonds.length, 3)}  0  0  0  0  0  0  0  0999 V2000`);
  for (const a of atoms) {
    out.push(
      `${pad(fixed(a.x, 4), 10)}${pad(fixed(a.y, 4), 10)}${pad(fixed(a.z, 4), 10)} ${a.element.padEnd(3)} 0  0  0  0  0  0  0  0  0  0  0  0`,
    );
  }
  for (const [i, j] of bonds) out.push(`${pad(i + 1, 3)}${pad(j + 1, 3)}  1  0  0  0  0`);
  out.push('M  END');
  const item = (k: string, v: string | number) => out.push(`> <${k}>`, String(v), '');
  item('charge', h.charge);
  item('multiplicity', h.multiplicity);
  item('point_group', h.group);
  item('computational_subgroup', h.subgroup);
  out.push('$$$$');
  return `${out.join('\n')}\n`;
}
