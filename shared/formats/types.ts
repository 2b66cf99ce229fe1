import type { AtomJson } from '../contracts/structure';

/** A structure as read from a file, before perception. Coordinates in Å, file order. */
export interface MoleculeInput {
  /** Title/comment/molecule name from the file, or `<file>#<frame>`. */
  name: string;
  sourceFile: string;
  /** 0-based frame (record) index within the file. */
  frameIndex: number;
  atoms: AtomJson[];
  /** From the file where the format carries it, else null. */
  charge: number | null;
  multiplicity: number | null;
}

/** A parse failure located in its file. `line` is 1-based; null when it is the whole file. */
export interface ParseFailure {
  file: string;
  frame: number;
  line: number | null;
  message: string;
}

export type ReadResult = { ok: true; molecule: MoleculeInput } | { ok: false; error: ParseFailure };

/** The input formats the engine reads. */
export type InputFormat = 'xyz' | 'extxyz' | 'mol' | 'sdf' | 'pdb' | 'cml' | 'qcschema';

/** One-line message: `file:line: frame N: message` (line omitted when unknown). */
export function formatParseFailure(e: ParseFailure): string {
  return `${e.file}${e.line != null ? `:${e.line}` : ''}: frame ${e.frame + 1}: ${e.message}`;
}
