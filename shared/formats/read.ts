import { readCml } from './cml';
import { allBytes, checkText, decodeText, failure, headText, type ByteSource, type ReadOptions } from './common';
import { readMolfile } from './molfile';
import { readPdb } from './pdb';
import { readQcschema } from './qcschema';
import type { InputFormat, ReadResult } from './types';
import { iterateXyz } from './xyz';

const BY_EXTENSION: Record<string, InputFormat> = {
  xyz: 'xyz',
  extxyz: 'extxyz',
  mol: 'mol',
  mdl: 'mol',
  sdf: 'sdf',
  sd: 'sdf',
  pdb: 'pdb',
  ent: 'pdb',
  cml: 'cml',
  json: 'qcschema',
  qcschema: 'qcschema',
};

function firstLines(content: string, n: number): string[] {
  const lines: string[] = [];
  let pos = 0;
  while (lines.length < n && pos <= content.length) {
    const end = content.indexOf('\n', pos);
    lines.push(content.slice(pos, end === -1 ? content.length : end).replace(/\r$/, ''));
    if (end === -1) break;
    pos = end + 1;
  }
  return lines;
}

/** Guess the format from the first lines of the content. */
function sniff(content: string): InputFormat | null {
  const head = content.slice(0, 4096).replace(/^\uFEFF/, '');
  const start = head.trimStart();
  if (start.startsWith('{') || start.startsWith('[')) return 'qcschema';
  if (start.startsWith('<')) return 'cml'; // the CML reader says so plainly if it is other XML
  const lines = firstLines(head, 6);
  if (lines.some((l) => /^(ATOM  |HETATM|HEADER|MODEL |CRYST1|COMPND|REMARK)/.test(l))) return 'pdb';
  if (lines.length >= 4 && /^[\s\d]{6}.*V[23]000\s*$/.test(lines[3])) return /^\$\$\$\$/m.test(content) ? 'sdf' : 'mol';
  const first = lines.findIndex((l) => l.trim() !== '');
  if (first !== -1 && /^\s*\d+\s*$/.test(lines[first])) {
    return /\b(Properties|Lattice)\s*=/i.test(lines[first + 1] ?? '') ? 'extxyz' : 'xyz';
  }
  return null;
}

/**
 * The input format of a file: by its extension (`.xyz`, `.extxyz`, `.mol`, `.sdf`, `.pdb`, `.cml`,
 * `.json`/`.qcschema`, case-insensitive), else by sniffing the content. A `.xyz` whose first
 * comment line carries `Properties=` or `Lattice=` is reported as extended XYZ. Null when neither
 * gives an answer.
 */
export function detectFormat(fileName: string, content: string): InputFormat | null {
  const ext = /\.([A-Za-z0-9]+)$/.exec(fileName)?.[1]?.toLowerCase();
  const byExt = ext != null ? BY_EXTENSION[ext] : undefined;
  if (byExt === 'xyz') return sniff(content) === 'extxyz' ? 'extxyz' : 'xyz';
  if (byExt != null) return byExt;
  return sniff(content);
}

/**
 * Read every structure of a file. Never throws: each frame is either a molecule or a located
 * failure (file, 0-based frame, 1-based line where known, one-line message); one bad frame never
 * stops the others. A file that is empty, binary (NUL bytes, invalid UTF-8) or of an unknown
 * format gives a single failure. Options: `maxAtoms` per structure (default 20,000).
 */
export function readStructures(fileName: string, content: string | Uint8Array, options: ReadOptions = {}): ReadResult[] {
  return [...iterateStructures(fileName, content, options)];
}

/**
 * The structures of {@link readStructures} one at a time: the frames of an XYZ file are read
 * only as they are asked for (other formats are read whole, then handed out). `content` may also
 * be a {@link ByteSource} (a file read piece by piece). Never throws.
 */
export function* iterateStructures(
  fileName: string,
  content: string | Uint8Array | ByteSource,
  options: ReadOptions = {},
): Generator<ReadResult, void, undefined> {
  // An XYZ file given as bytes is checked first and then decoded as its frames are read, never
  // as one string (a 500 MB trajectory would need another 0.5–1 GB); the other formats, and
  // texts, are decoded whole. Either way the same checks, in the same order, give the same result.
  if (typeof content !== 'string') {
    const checked = checkText(content);
    if (!checked.ok) {
      yield failure(fileName, 0, null, checked.message);
      return;
    }
    if (checked.blank) {
      yield failure(fileName, 0, null, 'empty file');
      return;
    }
    // Detection reads the first 4096 characters; only "mol or sdf?" looks further (whole text).
    const byHead = detectFormat(fileName, headText(content));
    if (byHead === 'xyz' || byHead === 'extxyz') {
      yield* guarded(fileName, () => iterateXyz(fileName, content, options));
      return;
    }
    if (!(content instanceof Uint8Array)) content = allBytes(content);
  }
  const decoded = decodeText(content);
  if (!decoded.ok) {
    yield failure(fileName, 0, null, decoded.message);
    return;
  }
  const text = decoded.text;
  if (text.trim() === '') {
    yield failure(fileName, 0, null, 'empty file');
    return;
  }
  const format = detectFormat(fileName, text);
  if (format === null) {
    yield failure(fileName, 0, null, 'unrecognised file format (expected XYZ, extended XYZ, molfile/SD, PDB, CML or QCSchema JSON)');
    return;
  }
  yield* guarded(fileName, () => READERS[format](fileName, text, options));
}

/**
 * The results of `read()`, with a last guard: the readers catch their own errors, but a bug must
 * never lose the batch (the structures handed out before it stay handed out). `read` is called
 * inside the first step, so the throw of a whole-file reader is caught here too.
 */
function* guarded(fileName: string, read: () => Iterable<ReadResult>): Generator<ReadResult, void, undefined> {
  const it = (function* () {
    yield* read();
  })();
  let frame = 0;
  for (;;) {
    let step: IteratorResult<ReadResult>;
    try {
      step = it.next();
    } catch (e) {
      yield failure(fileName, frame, null, `could not read the file: ${(e as Error).message.split('\n')[0]}`);
      return;
    }
    if (step.done) return;
    frame++;
    yield step.value;
  }
}

/** The reader of each format: XYZ frame by frame, the others whole. */
const READERS: Record<InputFormat, (file: string, text: string, options: ReadOptions) => Iterable<ReadResult>> = {
  xyz: iterateXyz,
  extxyz: iterateXyz,
  mol: readMolfile,
  sdf: readMolfile,
  pdb: readPdb,
  cml: readCml,
  qcschema: readQcschema,
};
