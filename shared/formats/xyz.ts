import type { AtomJson } from '../contracts/structure';
import { normalizeElement } from '../elements';
import {
  DEFAULT_MAX_ATOMS,
  FrameError,
  MAX_ABS_COORDINATE,
  LineReader,
  atomFrom,
  chargeFrom,
  cleanName,
  defaultName,
  failure,
  multiplicityFrom,
  parseInteger,
  quote,
  splitFields,
  tooManyAtoms,
  type ByteSource,
  type ReadOptions,
} from './common';
import type { ReadResult } from './types';

/**
 * XYZ and extended XYZ.
 *
 * XYZ (common practice, no formal specification): per frame a line with the atom count, a free
 * comment line, then one `element x y z` line per atom (Å). Frames follow one another; blank
 * lines between frames and at the end are ignored. The element may be a symbol in any case or an
 * atomic number; extra columns after z are ignored. On the comment line, `charge=N`,
 * `multiplicity=N` (or `mult=N`) set the charge and multiplicity; `group=` and `subgroup=` (which
 * Pointfold writes) are dropped; the rest of the comment is the structure's name.
 *
 * Extended XYZ (the convention of the atomistic-simulation community): the comment line is a
 * list of `key=value` pairs (values may be "quoted"); `Properties=name:type:ncols:…` says which
 * columns hold the species (`species:S:1`, or atomic numbers `Z:I:1`) and the positions
 * (`pos:R:3`). `Lattice=` is accepted and ignored (Pointfold treats every structure as a
 * molecule). `charge`, `multiplicity`/`mult` and `name` keys are read. A frame is read as extended
 * XYZ whenever its comment line has a `Properties=` or `Lattice=` key.
 */

// The look-behind starts a key only where no letter or _ precedes: inside a word no key can
// match where the attempt at the word's first letter failed, and without it a long word with no
// '=' cost time quadratic in its length (a 400,000-character comment line took minutes).
export const KEY_VALUE = /(?<![A-Za-z_])([A-Za-z_][\w\-]*)\s*=\s*("(?:[^"\\]|\\.)*"|'[^']*'|\{[^}]*\}|[^\s"']+)/g;

interface CommentInfo {
  name: string | null;
  charge: number | null;
  multiplicity: number | null;
  /** Column of the element token and of x (y, z follow); species columns may hold atomic numbers. */
  speciesColumn: number;
  posColumn: number;
}

function unquote(v: string): string {
  if ((v.startsWith('"') && v.endsWith('"')) || (v.startsWith("'") && v.endsWith("'"))) {
    return v.slice(1, -1).replace(/\\(.)/g, '$1');
  }
  if (v.startsWith('{') && v.endsWith('}')) return v.slice(1, -1);
  return v;
}

/** Parse an XYZ comment line (plain or extended). @throws FrameError on a bad charge/multiplicity/Properties. */
function parseComment(comment: string, line: number): CommentInfo {
  const pairs = new Map<string, string>();
  for (const m of comment.matchAll(KEY_VALUE)) pairs.set(m[1].toLowerCase(), unquote(m[2]));
  const extended = pairs.has('properties') || pairs.has('lattice');
  const info: CommentInfo = { name: null, charge: null, multiplicity: null, speciesColumn: 0, posColumn: 1 };
  const charge = pairs.get('charge');
  if (charge != null) info.charge = chargeFrom(charge, line);
  const mult = pairs.get('multiplicity') ?? pairs.get('mult');
  if (mult != null) info.multiplicity = multiplicityFrom(mult, line);

  if (extended) {
    info.name = cleanName(pairs.get('name'));
    const props = pairs.get('properties');
    if (props != null) {
      const parts = props.split(':');
      if (parts.length % 3 !== 0) throw new FrameError(line, `Properties ${quote(props)} is not a list of name:type:columns`);
      let col = 0;
      let species = -1;
      let pos = -1;
      for (let i = 0; i < parts.length; i += 3) {
        const name = parts[i].toLowerCase();
        const cols = parseInteger(parts[i + 2]);
        if (cols == null || cols < 1) throw new FrameError(line, `Properties ${quote(props)}: bad column count for ${parts[i]}`);
        if ((name === 'species' || name === 'element' || name === 'z') && species < 0) species = col;
        if ((name === 'pos' || name === 'positions') && pos < 0) {
          if (cols !== 3) throw new FrameError(line, 'Properties: pos must have 3 columns');
          pos = col;
        }
        col += cols;
      }
      if (species < 0) throw new FrameError(line, 'Properties has no species (or Z) column');
      if (pos < 0) throw new FrameError(line, 'Properties has no pos column');
      info.speciesColumn = species;
      info.posColumn = pos;
    }
  } else {
    // Plain XYZ: drop the keys Pointfold reads or writes; the rest is the title.
    const rest = comment.replace(KEY_VALUE, (all, key: string) =>
      /^(charge|multiplicity|mult|group|subgroup)$/i.test(key) ? ' ' : all,
    );
    info.name = cleanName(rest);
  }
  return info;
}

const COUNT_LINE = /^\s*\d+\s*$/;

/** Powers of ten exactly representable as doubles (10⁰ … 10²²). */
const EXACT_POWERS = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * The common atom line, `El x y z` with plain decimals, read in one scan without building field
 * strings. Returns false — and the general path reads the line — for anything else: an unknown
 * element, an exponent, more than 15 digits, a coordinate out of range, fewer than four fields,
 * non-ASCII text. What it accepts it reads exactly as the general path does: a decimal of at
 * most 15 digits is an integer below 2⁵³ divided by an exact power of ten, and that one IEEE
 * division is correctly rounded, as Number() is (Clinger, PLDI 1990, "fast path").
 */
function fastAtomLine(line: string, atoms: AtomJson[], elements: Map<string, string | null>): boolean {
  const n = line.length;
  let i = 0;
  let c = 0;
  while (i < n && ((c = line.charCodeAt(i)) === 32 || c === 9)) i++;
  const start = i;
  while (i < n && (c = line.charCodeAt(i)) !== 32 && c !== 9) {
    if (c > 127 || c < 32) return false;
    i++;
  }
  if (i === start || i - start > 3) return false;
  const token = line.slice(start, i);
  let element = elements.get(token);
  if (element === undefined) {
    element = normalizeElement(token);
    elements.set(token, element);
  }
  if (element == null) return false;
  let x = 0;
  let y = 0;
  let z = 0;
  for (let axis = 0; axis < 3; axis++) {
    while (i < n && ((c = line.charCodeAt(i)) === 32 || c === 9)) i++;
    if (i === n) return false;
    let negative = false;
    if (c === 45 || c === 43) {
      negative = c === 45;
      i++;
    }
    let mantissa = 0;
    let digits = 0;
    let decimals = 0;
    let dot = false;
    for (; i < n; i++) {
      c = line.charCodeAt(i);
      if (c >= 48 && c <= 57) {
        mantissa = mantissa * 10 + (c - 48);
        digits++;
        if (dot) decimals++;
      } else if (c === 46 && !dot) dot = true;
      else break;
    }
    // The number must end at a field separator (or the line's end); a digit count of 15 keeps
    // the mantissa exact.
    if (digits === 0 || digits > 15 || (i < n && c !== 32 && c !== 9 && c !== 13)) return false;
    const magnitude = decimals === 0 ? mantissa : mantissa / EXACT_POWERS[decimals];
    if (magnitude > MAX_ABS_COORDINATE) return false;
    const v = negative ? -magnitude : magnitude;
    if (axis === 0) x = v;
    else if (axis === 1) y = v;
    else z = v;
  }
  // Columns after z are ignored, as on the general path; but only ASCII is read here.
  for (let k = i; k < n; k++) if (line.charCodeAt(k) > 127) return false;
  atoms.push({ element, x, y, z });
  return true;
}

function looksLikeAtomLine(line: string): boolean {
  const t = splitFields(line);
  return t.length >= 4 && /^[A-Za-z]{1,3}$|^\d{1,3}$/.test(t[0]) && t.slice(1, 4).every((s) => !Number.isNaN(Number(s)));
}

/**
 * Read every frame of an XYZ or extended XYZ text. Never throws: a bad frame becomes a located
 * failure and reading resumes at the next count line.
 */
export function readXyz(file: string, text: string, options: ReadOptions = {}): ReadResult[] {
  return [...iterateXyz(file, text, options)];
}

/**
 * The frames of {@link readXyz} one at a time, each read only when it is asked for (a long
 * trajectory is never held in memory as parsed atoms all at once).
 */
export function* iterateXyz(file: string, content: string | Uint8Array | ByteSource, options: ReadOptions = {}): Generator<ReadResult, void, undefined> {
  const maxAtoms = options.maxAtoms ?? DEFAULT_MAX_ATOMS;
  const r = new LineReader(content);
  let frame = 0;
  const elementCache = new Map<string, string | null>();

  /** Skip to the next count line (not consumed), as after a damaged frame. */
  const resync = () => {
    for (let l = r.peek(); l !== null && !COUNT_LINE.test(l); l = r.peek()) r.next();
  };

  for (;;) {
    let line = r.next();
    while (line !== null && line.trim() === '') line = r.next();
    if (line === null) {
      // Every frame met so far was yielded (read or failed); none at all: an empty file.
      if (frame === 0) yield failure(file, 0, null, 'empty file (no structures)');
      break;
    }
    const countLineNo = r.lineNo;
    const count = COUNT_LINE.test(line) ? Number(line) : null;
    if (count == null) {
      yield failure(file, frame, countLineNo, `expected an atom count, found ${quote(line)}`);
      resync();
      frame++;
      continue;
    }
    if (count === 0) {
      yield failure(file, frame, countLineNo, 'the atom count is 0');
      r.next();
      resync();
      frame++;
      continue;
    }
    if (count > maxAtoms) {
      // Skip the frame's lines without parsing them.
      r.skip(count + 1);
      yield failure(file, frame, countLineNo, tooManyAtoms(count, maxAtoms));
      frame++;
      continue;
    }
    const comment = r.next();
    if (comment === null) {
      yield failure(file, frame, countLineNo, `expected a comment line and ${count} atom lines, found the end of the file`);
      break;
    }
    const commentLineNo = r.lineNo;
    let firstError: FrameError | null = null;
    let info: CommentInfo = { name: null, charge: null, multiplicity: null, speciesColumn: 0, posColumn: 1 };
    try {
      info = parseComment(comment, commentLineNo);
    } catch (e) {
      firstError = e as FrameError;
    }

    const atoms: AtomJson[] = [];
    let found = 0;
    const plainColumns = info.speciesColumn === 0 && info.posColumn === 1;
    while (found < count) {
      const next = r.next();
      if (next !== null && plainColumns && !firstError && fastAtomLine(next, atoms, elementCache)) {
        found++;
        continue;
      }
      if (next === null || COUNT_LINE.test(next) || next.trim() === '') {
        // A blank line is consumed; a count line is left for the next frame.
        if (next !== null && next.trim() !== '') r.back();
        firstError = new FrameError(next === null || next.trim() !== '' ? r.lineNo + 1 : r.lineNo, `expected ${count} atom lines, found ${found}`);
        break;
      }
      found++;
      if (firstError) continue;
      try {
        const t = splitFields(next);
        const need = Math.max(info.speciesColumn, info.posColumn + 2) + 1;
        if (t.length < need) throw new FrameError(r.lineNo, `atom ${found}: expected element x y z, found ${quote(next)}`);
        atoms.push(atomFrom(t[info.speciesColumn], t[info.posColumn], t[info.posColumn + 1], t[info.posColumn + 2], found, r.lineNo));
      } catch (e) {
        firstError = e as FrameError;
      }
    }
    // More atom lines than the count says: report, and skip them.
    if (found === count) {
      let extra = 0;
      const extraLine = r.lineNo + 1;
      for (let l = r.peek(); l !== null && looksLikeAtomLine(l); l = r.peek()) {
        r.next();
        extra++;
      }
      if (extra > 0 && !firstError) {
        firstError = new FrameError(extraLine, `the count line says ${count} atoms but ${count + extra} atom lines follow`);
      }
    }
    if (firstError) {
      yield failure(file, frame, firstError.line, firstError.message);
      resync();
    } else {
      yield {
        ok: true,
        molecule: {
          name: info.name ?? defaultName(file, frame),
          sourceFile: file,
          frameIndex: frame,
          atoms,
          charge: info.charge,
          multiplicity: info.multiplicity,
        },
      };
    }
    frame++;
  }
}

/** Fixed-point text of a coordinate with `decimals` places, never `-0.000…`. */
export function fixed(v: number, decimals: number): string {
  const s = v.toFixed(decimals);
  return /^-0\.0*$/.test(s) ? s.slice(1) : s;
}

/** The fields a written XYZ header carries. */
export interface XyzHeader {
  name: string;
  group: string;
  subgroup: string;
  charge: number;
  multiplicity: number;
}

/** Number of decimals Pointfold writes in XYZ files (≥ 10 so that exact symmetry survives). */
export const XYZ_DECIMALS = 12;

function atomLines(atoms: readonly AtomJson[]): string {
  const w = Math.max(...atoms.map((a) => a.element.length), 2);
  return atoms
    .map((a) => `${a.element.padEnd(w)} ${fixed(a.x, XYZ_DECIMALS).padStart(20)} ${fixed(a.y, XYZ_DECIMALS).padStart(20)} ${fixed(a.z, XYZ_DECIMALS).padStart(20)}`)
    .join('\n');
}

/**
 * Plain XYZ with 12 decimals. Comment line: `<name> group=<G> subgroup=<H> charge=<q> multiplicity=<m>`
 * (the name with line breaks removed), which {@link readXyz} reads back.
 */
export function writeXyz(atoms: readonly AtomJson[], h: XyzHeader): string {
  const name = cleanName(h.name) ?? '';
  const comment = `${name} group=${h.group} subgroup=${h.subgroup} charge=${h.charge} multiplicity=${h.multiplicity}`.trim();
  return `${atoms.length}\n${comment}\n${atomLines(atoms)}\n`;
}

function extValue(v: string): string {
  return /^[^\s"'=]+$/.test(v) ? v : `"${v.replace(/["\\]/g, '\\$&')}"`;
}

/**
 * Extended XYZ with 12 decimals: `Properties=species:S:1:pos:R:3 name=… point_group=…
 * computational_subgroup=… charge=… multiplicity=… pbc="F F F"`.
 */
export function writeExtxyz(atoms: readonly AtomJson[], h: XyzHeader): string {
  const name = cleanName(h.name) ?? '';
  const comment = [
    'Properties=species:S:1:pos:R:3',
    `name=${extValue(name)}`,
    `point_group=${extValue(h.group)}`,
    `computational_subgroup=${extValue(h.subgroup)}`,
    `charge=${h.charge}`,
    `multiplicity=${h.multiplicity}`,
    'pbc="F F F"',
  ].join(' ');
  return `${atoms.length}\n${comment}\n${atomLines(atoms)}\n`;
}
