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
  splitFields,
  type ReadOptions,
} from './common';
import { fixed } from './xyz';
import type { ReadResult } from './types';

/**
 * MDL molfiles (V2000 and V3000 connection tables) and SD files (molfiles separated by `$$$$`,
 * each with optional `> <field>` data items; V2000 and V3000 records may be mixed), after the
 * published CTfile formats description (MDL/BIOVIA).
 *
 * Read: the title line is the name; the counts line on the fourth line says V2000 or V3000.
 * V2000: the counts line gives the atom and bond counts; the atom block gives x y z (Å) and the
 * symbol; bonds are skipped (Pointfold needs only positions). Total charge: the sum of `M  CHG`
 * entries when any are present (they supersede the atom block, as the CTfile description says),
 * else the sum of the atom-block charge codes when any are non-zero, else null — so a batch's
 * default charge applies to files that say nothing.
 * V3000: `M  V30` lines from `BEGIN CTAB` to `END CTAB`, then `M  END`; a line ending in `-`
 * continues on the next `M  V30` line. `COUNTS na nb …` must agree with the ATOM and BOND blocks;
 * atom lines `index type x y z aamap [KEY=VALUE …]` give the symbol and x y z (Å); atom lists
 * and pseudo-atoms are refused like unknown elements. Total charge: the sum of the atoms' `CHG=`
 * values when any atom has one, else null (the counterpart of `M  CHG`). Bonds are only counted;
 * Sgroup, collection, 3D and other blocks are skipped.
 * Data items `> <charge>` and `> <multiplicity>` (any case) win over the table in both versions.
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

/** Atoms and the total charge (null when the table says nothing) of one connection table. */
interface Table {
  atoms: AtomJson[];
  charge: number | null;
}

/** The V2000 counts line, atom block, bond block and properties block up to `M  END`. */
function readV2000(counts: string, countsNo: number, rec: RecordReader, maxAtoms: number): Table {
  let nAtoms = parseInteger(counts.slice(0, 3));
  let nBonds = parseInteger(counts.slice(3, 6));
  if (nAtoms == null || nBonds == null) {
    // Some writers do not keep the fixed columns; accept white-space separated counts.
    const t = splitFields(counts);
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
      const tok = splitFields(t);
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
    const tok = splitFields(t.slice(6)).map((v) => parseInteger(v));
    const n = tok[0];
    if (n == null || tok.length < 1 + 2 * n || tok.some((v) => v == null)) {
      throw new FrameError(rec.no, `M  CHG line is malformed: ${quote(t)}`);
    }
    for (let j = 0; j < n; j++) chgSum = (chgSum ?? 0) + (tok[2 + 2 * j] as number);
  }
  return { atoms, charge: chgSum ?? (blockCharge !== 0 ? blockCharge : null) };
}

/**
 * One logical `M  V30` line: the text after `M  V30 ` with continuations joined, and the number of
 * its first physical line; or, at `M  END` or the end of the record, `text` null and the number of
 * the line where the table stopped.
 */
interface V30Line {
  text: string | null;
  line: number;
}

const V30_PREFIX = /^M {2}V30(?: |$)/;

/**
 * The next logical V3000 line. A line whose text ends with `-` continues on the next `M  V30`
 * line: the hyphen is dropped and the next line's text (after `M  V30 `) is appended as is.
 * @throws FrameError on a line that is not an `M  V30` line, or a continuation with nothing after.
 */
function nextV30(rec: RecordReader): V30Line {
  const t = rec.next();
  if (t === null) return { text: null, line: rec.no + 1 };
  if (/^M {2}END/.test(t)) return { text: null, line: rec.no };
  const line = rec.no;
  if (!V30_PREFIX.test(t)) throw new FrameError(line, `expected an 'M  V30' line in the V3000 table, found ${quote(t)}`);
  let text = t.slice(7).trimEnd();
  while (text.endsWith('-')) {
    const c = rec.next();
    if (c === null || !V30_PREFIX.test(c)) {
      throw new FrameError(c === null ? rec.no + 1 : rec.no, `the line ending in '-' (line ${line}) is not continued by an 'M  V30' line`);
    }
    text = text.slice(0, -1) + c.slice(7).trimEnd();
  }
  return { text: text.trim(), line };
}

/**
 * The fields of a V3000 line: white-space separated, but a "quoted" string (`""` for a quote) or a
 * parenthesised list (`KEY=(2 1 2)`) stays one field.
 */
function v30Fields(text: string): string[] {
  return text.match(/(?:[^\s"(]*(?:"(?:[^"]|"")*"|\([^)]*\))[^\s"(]*)+|[^\s"(]+/g) ?? [];
}

/** `BEGIN name` / `END name` of a V3000 block (upper case), or null. */
function blockWord(text: string, which: 'BEGIN' | 'END'): string | null {
  const m = /^(BEGIN|END)\s+(\S+)/i.exec(text);
  return m && m[1].toUpperCase() === which ? m[2].toUpperCase() : null;
}

/**
 * A V3000 connection table, from `M  V30 BEGIN CTAB` to `M  END` (the header counts line, which
 * says V3000, has been read). Atoms come from the ATOM block; the charge is the sum of the atoms'
 * `CHG=` values when any atom has one, else null. The BOND block is only counted against COUNTS;
 * other blocks (Sgroups, collections, 3D features, R-group and template blocks after the table)
 * are skipped.
 */
function readV3000(rec: RecordReader, maxAtoms: number): Table {
  const need = (what: string): { text: string; line: number } => {
    const l = nextV30(rec);
    if (l.text === null) throw new FrameError(l.line, `the V3000 table ends early (expected ${what})`);
    return { text: l.text, line: l.line };
  };
  const begin = need("'M  V30 BEGIN CTAB'");
  if (blockWord(begin.text, 'BEGIN') !== 'CTAB') {
    throw new FrameError(begin.line, `expected 'M  V30 BEGIN CTAB', found ${quote(begin.text)}`);
  }
  const countsLine = need("'M  V30 COUNTS'");
  const ct = v30Fields(countsLine.text);
  const nAtoms = parseInteger(ct[1] ?? '');
  const nBonds = parseInteger(ct[2] ?? '');
  if (ct[0]?.toUpperCase() !== 'COUNTS' || nAtoms == null || nBonds == null || nAtoms < 0 || nBonds < 0) {
    throw new FrameError(countsLine.line, `expected 'COUNTS atoms bonds …', found ${quote(countsLine.text)}`);
  }
  if (nAtoms === 0) throw new FrameError(countsLine.line, 'the atom count is 0');
  if (nAtoms > maxAtoms) throw new FrameError(countsLine.line, tooManyAtoms(nAtoms, maxAtoms));

  const atoms: AtomJson[] = [];
  let chgSum: number | null = null;
  let atomBlock = false;
  let bondLines: number | null = null;
  let bondBlockLine = 0;
  for (;;) {
    const l = nextV30(rec);
    if (l.text === null) throw new FrameError(l.line, "the V3000 table has no 'M  V30 END CTAB'");
    if (/^END\s+CTAB\b/i.test(l.text)) break;
    const block = blockWord(l.text, 'BEGIN');
    if (block === 'ATOM') {
      if (atomBlock) throw new FrameError(l.line, 'a second atom block in one connection table');
      atomBlock = true;
      const ids = new Set<number>();
      let lines = 0;
      let firstExtra = 0;
      for (;;) {
        const a = nextV30(rec);
        const word = a.text === null ? null : /^(BEGIN|END)\b/i.test(a.text) ? a.text : '';
        if (word !== null && /^END\s+ATOM\b/i.test(word)) break;
        if (a.text === null || word !== '') {
          const found = a.text === null ? '' : ` (found ${quote(a.text)})`;
          throw new FrameError(a.line, `the atom block has no 'M  V30 END ATOM'${found}`);
        }
        lines++;
        if (lines > nAtoms) {
          // More atom lines than COUNTS says: count them, but do not turn them into atoms.
          if (firstExtra === 0) firstExtra = a.line;
          continue;
        }
        const atom = v3000Atom(a.text, lines, a.line, ids);
        atoms.push(atom.atom);
        if (atom.charge != null) chgSum = (chgSum ?? 0) + atom.charge;
      }
      if (lines !== nAtoms) {
        throw new FrameError(firstExtra || rec.no, `the COUNTS line says ${nAtoms} atoms but ${lines} atom lines follow`);
      }
    } else if (block === 'BOND') {
      bondBlockLine = l.line;
      bondLines = skipV30Block(rec, 'BOND', l.line);
    } else if (block != null) {
      skipV30Block(rec, block, l.line);
    }
    // Other single lines in the table (LINKNODE, …) carry nothing Pointfold needs.
  }
  const endCtab = rec.no;
  if (!atomBlock) throw new FrameError(endCtab, "the V3000 table has no atom block ('M  V30 BEGIN ATOM')");
  if ((bondLines ?? 0) !== nBonds) {
    throw new FrameError(bondBlockLine || endCtab, `the COUNTS line says ${nBonds} bonds but ${bondLines ?? 0} bond lines follow`);
  }
  // After the table: R-group or template blocks, then M  END.
  for (;;) {
    const t = rec.next();
    if (t === null || t.startsWith('>')) {
      throw new FrameError(t === null ? rec.no + 1 : rec.no, "no 'M  END' after the V3000 table");
    }
    if (/^M {2}END/.test(t)) break;
  }
  return { atoms, charge: chgSum };
}

/** Skip a V3000 block to its `END word` line; returns the number of logical lines inside. */
function skipV30Block(rec: RecordReader, word: string, beginLine: number): number {
  let n = 0;
  for (;;) {
    const l = nextV30(rec);
    if (l.text === null) throw new FrameError(l.line, `the ${word} block begun on line ${beginLine} has no 'M  V30 END ${word}'`);
    if (blockWord(l.text, 'END') === word) return n;
    if (/^END\s+CTAB\b/i.test(l.text)) {
      throw new FrameError(l.line, `the ${word} block begun on line ${beginLine} has no 'M  V30 END ${word}'`);
    }
    n++;
  }
}

/**
 * One V3000 atom line: `index type x y z aamap [KEY=VALUE …]`; `CHG=` is the formal charge.
 * @throws FrameError on a bad index, an atom list or pseudo-atom, a bad coordinate or charge.
 */
function v3000Atom(text: string, atom: number, line: number, ids: Set<number>): { atom: AtomJson; charge: number | null } {
  const f = v30Fields(text);
  if (f.length < 5) throw new FrameError(line, `atom ${atom}: expected index type x y z aamap, found ${quote(text)}`);
  const id = parseInteger(f[0]);
  if (id == null || id < 1) throw new FrameError(line, `atom ${atom}: index ${quote(f[0], 12)} is not a positive integer`);
  if (ids.has(id)) throw new FrameError(line, `atom ${atom}: index ${id} is used twice`);
  ids.add(id);
  const type = f[1];
  if (/^NOT$/i.test(type) || type.startsWith('[')) {
    const list = /^NOT$/i.test(type) ? `${type} ${f[2] ?? ''}` : type;
    throw new FrameError(line, `atom ${atom}: atom list ${quote(list, 20)} is not an element`);
  }
  // Pseudo-atoms (*, R#, A, Q, …) fail here as unknown elements, as in the V2000 atom block.
  if (!/^[A-Za-z]/.test(type)) throw new FrameError(line, `atom ${atom}: unknown element ${quote(type, 12)}`);
  const a = atomFrom(type, f[2], f[3], f[4], atom, line);
  if (f[5] != null && !f[5].includes('=') && parseInteger(f[5]) == null) {
    throw new FrameError(line, `atom ${atom}: atom-atom mapping ${quote(f[5], 12)} is not an integer`);
  }
  let charge: number | null = null;
  for (const kv of f.slice(5)) {
    const m = /^CHG=(.*)$/i.exec(kv);
    if (!m) continue;
    const v = parseInteger(m[1]);
    if (v == null) throw new FrameError(line, `atom ${atom}: CHG ${quote(m[1], 12)} is not an integer`);
    charge = (charge ?? 0) + v;
  }
  return { atom: a, charge };
}

function parseRecord(file: string, frame: number, rec: RecordReader, maxAtoms: number): ReadResult {
  const title = rec.need('a title line');
  rec.need('a program line');
  rec.need('a comment line');
  const counts = rec.need('a counts line');
  const countsNo = rec.no;
  const table = /V3000/i.test(counts) ? readV3000(rec, maxAtoms) : readV2000(counts, countsNo, rec, maxAtoms);
  let charge = table.charge;
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
      atoms: table.atoms,
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
