import type { AtomJson } from '../contracts/structure';
import {
  DEFAULT_MAX_ATOMS,
  FrameError,
  checkCoordinate,
  chargeFrom,
  cleanName,
  defaultName,
  elementOf,
  failure,
  multiplicityFrom,
  tooManyAtoms,
  type ReadOptions,
} from './common';
import type { ReadResult } from './types';

/**
 * QCSchema molecules (MolSSI QCSchema, `qcschema/dev/molecule.py`: `symbols`, `geometry` as a
 * flat (3·nat) vector in bohr, `molecular_charge`, `molecular_multiplicity`, `fix_com`,
 * `fix_orientation`, `fix_symmetry`, `real`, `name`, `extras`, `provenance`).
 *
 * Read: a molecule object; a QCSchema input or output (`schema_name` `qcschema_input` /
 * `qcschema_output`, or any object with a `molecule` member) contributes its `molecule`; a JSON
 * array of any of these is a list of frames. `geometry` may also be nested (nat × 3). `symbols`
 * in any case, or `atomic_numbers` when `symbols` is absent. Ghost atoms (`real: false`) are
 * refused, since Pointfold has no notion of them. JSON carries no line numbers per molecule, so
 * failures other than JSON syntax errors name the frame and the JSON member instead.
 */

/** The Bohr radius in Å, CODATA 2018 (0.529177210903(80) Å). */
export const BOHR_IN_ANGSTROM = 0.529177210903;

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

function isObject(v: Json | undefined): v is { [k: string]: Json } {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/**
 * Locate a JSON syntax error: a small recursive-descent scan (run only after JSON.parse failed,
 * because V8's messages do not always give a position). Returns a 1-based line and a message.
 */
export function locateJsonError(text: string): { line: number; message: string } {
  let i = 0;
  const err = (message: string): never => {
    throw Object.assign(new Error(message), { at: i });
  };
  const ws = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i])) i++;
  };
  const what = () => (i >= text.length ? 'the end of the text' : `'${text[i]}'`);
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') return void i++;
      for (;;) {
        ws();
        if (text[i] !== '"') err(`expected a "key", found ${what()}`);
        string();
        ws();
        if (text[i] !== ':') err(`expected ':', found ${what()}`);
        i++;
        value();
        ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === '}') return void i++;
        err(`expected ',' or '}', found ${what()}`);
      }
    } else if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') return void i++;
      for (;;) {
        value();
        ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === ']') return void i++;
        err(`expected ',' or ']', found ${what()}`);
      }
    } else if (c === '"') {
      string();
    } else {
      const m = /^(-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?|true|false|null)/.exec(text.slice(i, i + 400));
      if (!m) err(`unexpected ${what()}`);
      i += m![0].length;
    }
  };
  const string = () => {
    i++;
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') i++;
      else if (text[i] === '\n') err('unterminated string');
      i++;
    }
    if (i >= text.length) err('unterminated string');
    i++;
  };
  let message = 'not valid JSON';
  try {
    value();
    ws();
    if (i < text.length) err(`unexpected ${what()} after the JSON value`);
  } catch (e) {
    message = (e as Error).message;
  }
  let line = 1;
  for (let k = 0; k < Math.min(i, text.length); k++) if (text.charCodeAt(k) === 10) line++;
  return { line, message };
}

function moleculeOf(v: Json): { [k: string]: Json } | null {
  if (!isObject(v)) return null;
  if ('symbols' in v || 'geometry' in v || v.schema_name === 'qcschema_molecule') return v;
  if (isObject(v.molecule)) return v.molecule;
  return null;
}

function readOne(file: string, frame: number, v: Json, maxAtoms: number): ReadResult {
  const mol = moleculeOf(v);
  if (mol == null) throw new FrameError(null, 'not a QCSchema molecule (no symbols and geometry, and no molecule member)');
  const symbols = mol.symbols ?? mol.atomic_numbers;
  const what = mol.symbols != null ? 'symbols' : 'atomic_numbers';
  if (!Array.isArray(symbols)) throw new FrameError(null, 'symbols is missing or not an array');
  if (symbols.length === 0) throw new FrameError(null, 'symbols is empty');
  if (symbols.length > maxAtoms) throw new FrameError(null, tooManyAtoms(symbols.length, maxAtoms));
  let geometry = mol.geometry;
  if (!Array.isArray(geometry)) throw new FrameError(null, 'geometry is missing or not an array');
  if (geometry.length > 0 && Array.isArray(geometry[0])) geometry = (geometry as Json[]).flat();
  if (geometry.length !== 3 * symbols.length) {
    throw new FrameError(null, `geometry has ${geometry.length} numbers for ${symbols.length} atoms (expected ${3 * symbols.length})`);
  }
  if (Array.isArray(mol.real) && mol.real.some((r) => r === false)) {
    throw new FrameError(null, 'ghost atoms (real: false) are not supported');
  }
  const atoms: AtomJson[] = symbols.map((s, i) => {
    if (typeof s !== 'string' && typeof s !== 'number') throw new FrameError(null, `${what}[${i}] is not a symbol`);
    const element = elementOf(s, i + 1, null);
    const c = [0, 1, 2].map((k) => {
      const g = geometry[3 * i + k];
      if (typeof g !== 'number') throw new FrameError(null, `atom ${i + 1}: geometry[${3 * i + k}] is not a number`);
      return checkCoordinate(g * BOHR_IN_ANGSTROM, String(g), i + 1, null);
    });
    return { element, x: c[0], y: c[1], z: c[2] };
  });
  const q = mol.molecular_charge;
  const m = mol.molecular_multiplicity;
  if (q != null && typeof q !== 'number') throw new FrameError(null, 'molecular_charge is not a number');
  if (m != null && typeof m !== 'number') throw new FrameError(null, 'molecular_multiplicity is not a number');
  const name = typeof mol.name === 'string' ? cleanName(mol.name) : null;
  return {
    ok: true,
    molecule: {
      name: name ?? defaultName(file, frame),
      sourceFile: file,
      frameIndex: frame,
      atoms,
      charge: q == null ? null : chargeFrom(q, null),
      multiplicity: m == null ? null : multiplicityFrom(m, null),
    },
  };
}

/** Read QCSchema JSON (one molecule, an input/output, or an array of them). Never throws. */
export function readQcschema(file: string, text: string, options: ReadOptions = {}): ReadResult[] {
  const maxAtoms = options.maxAtoms ?? DEFAULT_MAX_ATOMS;
  let doc: Json;
  try {
    doc = JSON.parse(text) as Json;
  } catch {
    const { line, message } = locateJsonError(text);
    return [failure(file, 0, line, `JSON syntax error: ${message}`)];
  }
  const items = Array.isArray(doc) ? doc : [doc];
  if (items.length === 0) return [failure(file, 0, null, 'empty JSON array (no structures)')];
  return items.map((item, frame) => {
    try {
      return readOne(file, frame, item, maxAtoms);
    } catch (e) {
      if (!(e instanceof FrameError)) throw e;
      return failure(file, frame, e.line, e.message);
    }
  });
}

/** What a written QCSchema molecule records besides the atoms. */
export interface QcschemaHeader {
  name: string;
  group: string;
  subgroup: string;
  charge: number;
  multiplicity: number;
  engineVersion: string;
  frame: 'standard' | 'input';
  tolerance: number;
}

/**
 * A QCSchema molecule (schema_version 2) with geometry in bohr at full double precision,
 * `fix_com`/`fix_orientation` true (so a QC program keeps the frame that carries the symmetry),
 * `fix_symmetry` the computational subgroup in lower case, and `extras.pointfold` recording the
 * point group, the computational subgroup, the frame, the tolerance and the engine version.
 */
export function writeQcschema(atoms: readonly AtomJson[], h: QcschemaHeader): string {
  const doc = {
    schema_name: 'qcschema_molecule',
    schema_version: 2,
    name: h.name,
    symbols: atoms.map((a) => a.element),
    geometry: atoms.flatMap((a) => [a.x / BOHR_IN_ANGSTROM, a.y / BOHR_IN_ANGSTROM, a.z / BOHR_IN_ANGSTROM]),
    molecular_charge: h.charge,
    molecular_multiplicity: h.multiplicity,
    fix_com: true,
    fix_orientation: true,
    fix_symmetry: h.subgroup.toLowerCase(),
    provenance: { creator: 'Pointfold', version: h.engineVersion, routine: 'pointfold.snap' },
    extras: {
      pointfold: {
        point_group: h.group,
        computational_subgroup: h.subgroup,
        frame: h.frame,
        tolerance: h.tolerance,
        engine_version: h.engineVersion,
      },
    },
  };
  return `${JSON.stringify(doc, null, 2)}\n`;
}
