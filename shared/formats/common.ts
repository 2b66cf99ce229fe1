import type { AtomJson } from '../contracts/structure';
import { normalizeElement } from '../elements';
import type { ParseFailure, ReadResult } from './types';

/** Options shared by every reader. */
export interface ReadOptions {
  /**
   * Largest number of atoms accepted in one structure (default {@link DEFAULT_MAX_ATOMS}).
   * A larger frame is reported as a failure of that frame, without turning its lines into atoms.
   */
  maxAtoms?: number;
}

/** Default per-structure atom limit of the readers. */
export const DEFAULT_MAX_ATOMS = 20_000;

/** Largest accepted |coordinate| in Å; anything beyond is a unit or parsing mistake. */
export const MAX_ABS_COORDINATE = 1e6;

/** Thrown inside a reader to abandon the current frame; caught by the reader, never escapes. */
export class FrameError extends Error {
  constructor(
    readonly line: number | null,
    message: string,
  ) {
    super(message);
  }
}

/** A failed ReadResult. */
export function failure(file: string, frame: number, line: number | null, message: string): ReadResult {
  const error: ParseFailure = { file, frame, line, message };
  return { ok: false, error };
}

/** The name given to a structure whose file carries none: `<file>#<1-based frame>`. */
export function defaultName(file: string, frame: number): string {
  return `${file}#${frame + 1}`;
}

/** Quote a fragment of input for a one-line message (clipped, control characters shown as ·). */
export function quote(text: string, max = 40): string {
  const t = text.trim().replace(/[\u0000-\u001f\u007f]/g, '·');
  return `'${t.length > max ? `${t.slice(0, max)}…` : t}'`;
}

const NOT_TEXT_NUL = 'not a text file (it contains NUL bytes)';
const NOT_TEXT_UTF8 = 'not a text file (it is not valid UTF-8)';

/**
 * Decode file content to text. Bytes must be valid UTF-8 without NUL bytes (binary files, UTF-16
 * and images fail here with "not a text file"). A UTF-8 byte-order mark is dropped.
 */
export function decodeText(content: string | Uint8Array): { ok: true; text: string } | { ok: false; message: string } {
  let text: string;
  if (typeof content === 'string') {
    text = content;
  } else {
    if (content.indexOf(0) !== -1) return { ok: false, message: NOT_TEXT_NUL };
    try {
      text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(content);
    } catch {
      return { ok: false, message: NOT_TEXT_UTF8 };
    }
  }
  if (text.includes('\u0000')) return { ok: false, message: NOT_TEXT_NUL };
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return { ok: true, text };
}

/** Bytes decoded at a time when text is read from bytes ({@link checkText}, {@link LineReader}). */
export const TEXT_WINDOW_BYTES = 1 << 16;

/**
 * Bytes read a piece at a time, such as a file read by position: a long file then never needs to
 * be in memory whole. `read` returns up to `length` bytes from `position` (fewer only at the
 * end); the array it returns may be reused by its next call.
 */
export interface ByteSource {
  readonly size: number;
  read(position: number, length: number): Uint8Array;
}

/** Bytes in memory as a {@link ByteSource} (pieces are views, not copies). */
export function bytesSource(bytes: Uint8Array): ByteSource {
  return { size: bytes.length, read: (position, length) => bytes.subarray(position, Math.min(position + length, bytes.length)) };
}

/** All the bytes of a source, in one array. */
export function allBytes(source: ByteSource): Uint8Array {
  const out = new Uint8Array(source.size);
  for (let at = 0; at < source.size; ) {
    const piece = source.read(at, Math.min(TEXT_WINDOW_BYTES, source.size - at));
    if (piece.length === 0) return out.subarray(0, at); // the file became shorter
    out.set(piece, at);
    at += piece.length;
  }
  return out;
}

const asSource = (content: Uint8Array | ByteSource): ByteSource => (content instanceof Uint8Array ? bytesSource(content) : content);

/** Where the text of a source starts: after a UTF-8 byte-order mark, if any. */
function textStart(source: ByteSource): number {
  if (source.size < 3) return 0;
  const b = source.read(0, 3);
  return b.length === 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? 3 : 0;
}

/**
 * What {@link decodeText} would decide about bytes, without keeping their text: valid (UTF-8,
 * no NUL; `blank` when the text would be white space only) or the same message (a NUL byte
 * anywhere wins over invalid UTF-8). Decodes window by window and drops each window's text, so
 * a large file never exists as one string.
 */
export function checkText(content: Uint8Array | ByteSource, windowBytes = TEXT_WINDOW_BYTES): { ok: true; blank: boolean } | { ok: false; message: string } {
  const source = asSource(content);
  const decoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
  let blank = true;
  let valid = true;
  let at = textStart(source);
  while (at < source.size) {
    const piece = source.read(at, Math.min(windowBytes, source.size - at));
    if (piece.length === 0) break; // the file became shorter
    at += piece.length;
    if (piece.indexOf(0) !== -1) return { ok: false, message: NOT_TEXT_NUL };
    if (!valid) continue; // only a NUL further on could change the answer
    try {
      const window = decoder.decode(piece, { stream: at < source.size });
      if (blank && window.trim() !== '') blank = false;
    } catch {
      valid = false;
    }
  }
  if (valid) {
    try {
      decoder.decode(); // a multi-byte character cut off by the end of the file throws here
    } catch {
      valid = false;
    }
  }
  return valid ? { ok: true, blank } : { ok: false, message: NOT_TEXT_UTF8 };
}

/**
 * The start of the text of bytes that {@link checkText} accepted: at least their first
 * `windowBytes` bytes (all of them when fewer), without a byte-order mark.
 */
export function headText(content: Uint8Array | ByteSource, windowBytes = TEXT_WINDOW_BYTES): string {
  const source = asSource(content);
  const start = textStart(source);
  const piece = source.read(start, Math.min(windowBytes, source.size - start));
  return new TextDecoder('utf-8', { ignoreBOM: true }).decode(piece, { stream: start + piece.length < source.size });
}

const NON_SPACE = /\S/g;

/**
 * Reads a text line by line without splitting it up front (a 10⁶-line file costs nothing until
 * read). Accepts LF, CRLF and lone CR line ends. Line numbers are 1-based.
 *
 * Given bytes (already accepted by {@link checkText}) it decodes them a window at a time as the
 * lines are asked for, so that a long file is never one string: the window text holds the rest of
 * the current window and the previous line (for {@link back}).
 */
export class LineReader {
  private text: string;
  private pos = 0;
  private prevPos = 0;
  /** Number of the line most recently returned by {@link next} (0 before the first). */
  lineNo = 0;

  /** Whether the text has any CR at all (most files do not: then no line needs the CR checks). */
  private hasCr: boolean;

  /** Bytes still to decode (from `at`), and their decoder; null for a text given as a string. */
  private readonly source: ByteSource | null;
  private at = 0;
  private readonly decoder: TextDecoder | null;

  constructor(
    content: string | Uint8Array | ByteSource,
    private readonly windowBytes = TEXT_WINDOW_BYTES,
  ) {
    if (typeof content === 'string') {
      this.text = content;
      this.hasCr = content.includes('\r');
      this.source = null;
      this.decoder = null;
    } else {
      this.text = '';
      // Set by each window that has one: a line is only cut once its window has been decoded.
      this.hasCr = false;
      this.source = asSource(content);
      this.at = textStart(this.source);
      this.decoder = new TextDecoder('utf-8', { ignoreBOM: true });
      this.text = this.decodeNext() ?? '';
    }
  }

  /** The text of the next window of the bytes, or null when all are decoded. */
  private decodeNext(): string | null {
    const source = this.source;
    if (source === null || this.at >= source.size) return null;
    const piece = source.read(this.at, Math.min(this.windowBytes, source.size - this.at));
    if (piece.length === 0) return null; // the file became shorter
    this.at += piece.length;
    const text = this.decoder!.decode(piece, { stream: this.at < source.size });
    if (!this.hasCr && text.includes('\r')) this.hasCr = true;
    return text;
  }

  /**
   * Decodes windows onto the text until one has a line feed (all of them with `toEnd`). The text
   * keeps the previous line (back() returns to it); what lies before it is never read again. The
   * windows are joined once, so that a line longer than many windows costs no more than its
   * length. Returns the position of the first new line feed, or −1.
   */
  private more(toEnd = false): number {
    const parts = [this.text.slice(this.prevPos)];
    let length = parts[0].length;
    let found = -1;
    for (let next = this.decodeNext(); next !== null; next = found === -1 || toEnd ? this.decodeNext() : null) {
      parts.push(next);
      if (found === -1) {
        const lf = next.indexOf('\n');
        if (lf !== -1) found = length + lf;
      }
      length += next.length;
    }
    if (parts.length === 1) return -1;
    this.text = parts.join('');
    this.pos -= this.prevPos;
    this.prevPos = 0;
    return found;
  }

  /** The next line without its line end, or null at the end of the text. */
  next(): string | null {
    let end = this.text.indexOf('\n', this.pos);
    if (end === -1 && this.source !== null) end = this.more();
    const { text } = this;
    if (this.pos >= text.length) return null;
    let nextPos: number;
    if (end === -1) {
      end = text.length;
      nextPos = end;
    } else {
      nextPos = end + 1;
    }
    this.prevPos = this.pos;
    let line = text.slice(this.pos, end);
    if (this.hasCr) {
      if (line.endsWith('\r')) line = line.slice(0, -1);
      // A lone CR (old Mac files) inside what LF splitting took as one line: split there.
      const cr = line.indexOf('\r');
      if (cr !== -1) {
        line = line.slice(0, cr);
        nextPos = this.pos + cr + 1;
      }
    }
    this.pos = nextPos;
    this.lineNo++;
    return line;
  }

  /** The next line without consuming it. */
  peek(): string | null {
    // Through back(): next() may decode another window, which moves every position.
    const line = this.next();
    if (line !== null) this.back();
    return line;
  }

  /** Un-read the line most recently returned by {@link next} (once; cheaper than peek + next). */
  back(): void {
    this.pos = this.prevPos;
    this.lineNo--;
  }

  /** Skip up to n lines; returns how many were skipped. */
  skip(n: number): number {
    let k = 0;
    while (k < n && this.next() !== null) k++;
    return k;
  }

  /** True when every remaining line is blank. */
  restIsBlank(): boolean {
    if (this.source !== null) this.more(true);
    NON_SPACE.lastIndex = this.pos;
    return !NON_SPACE.test(this.text);
  }
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Whether `t` matches {@link NUMBER} exactly, by a scan of its characters (the usual coordinate). */
function isPlainDecimal(t: string): boolean {
  const n = t.length;
  let i = 0;
  let c = n > 0 ? t.charCodeAt(0) : 0;
  if (c === 43 || c === 45) c = ++i < n ? t.charCodeAt(i) : 0; // + -
  let digits = 0;
  while (c >= 48 && c <= 57) {
    digits++;
    c = ++i < n ? t.charCodeAt(i) : 0;
  }
  if (c === 46) {
    // .
    c = ++i < n ? t.charCodeAt(i) : 0;
    while (c >= 48 && c <= 57) {
      digits++;
      c = ++i < n ? t.charCodeAt(i) : 0;
    }
  }
  if (digits === 0) return false;
  if (c === 101 || c === 69) {
    // e E
    c = ++i < n ? t.charCodeAt(i) : 0;
    if (c === 43 || c === 45) c = ++i < n ? t.charCodeAt(i) : 0;
    let exp = 0;
    while (c >= 48 && c <= 57) {
      exp++;
      c = ++i < n ? t.charCodeAt(i) : 0;
    }
    if (exp === 0) return false;
  }
  return i === n;
}
const FORTRAN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)[dD][+-]?\d+$/;

/**
 * Parse a decimal number strictly (no hex, no empty string → 0); Fortran `D` exponents accepted.
 * Returns null when the token is not a number at all.
 */
export function parseNumber(token: string): number | null {
  if (isPlainDecimal(token)) return Number(token);
  const t = token.trim();
  if (NUMBER.test(t)) return Number(t);
  if (FORTRAN_NUMBER.test(t)) return Number(t.replace(/[dD]/, 'e'));
  if (/^[+-]?(nan|inf|infinity)$/i.test(t)) return Number.NaN;
  return null;
}

/** Parse an integer token strictly (`+1`, `-2`, `0`); null otherwise. */
export function parseInteger(token: string): number | null {
  const t = token.trim();
  return /^[+-]?\d+$/.test(t) ? Number(t) : null;
}

/**
 * Check a coordinate: finite and |x| ≤ {@link MAX_ABS_COORDINATE} Å.
 * @throws FrameError naming the atom (1-based) and the offending text.
 */
export function checkCoordinate(value: number, raw: string, atom: number, line: number | null): number {
  if (!Number.isFinite(value)) throw new FrameError(line, `atom ${atom}: coordinate ${quote(raw)} is not a finite number`);
  if (Math.abs(value) > MAX_ABS_COORDINATE) {
    throw new FrameError(line, `atom ${atom}: coordinate ${quote(raw)} is out of range (|x| > 1e6 Å)`);
  }
  return value;
}

/**
 * An element symbol or atomic number as written in a file → canonical symbol.
 * @throws FrameError "unknown element" (with a hint for the isotope labels D and T).
 */
export function elementOf(raw: string | number, atom: number, line: number | null): string {
  const s = normalizeElement(raw);
  if (s != null) return s;
  const t = String(raw).trim();
  const hint = /^[dt]$/i.test(t) ? ' (isotope labels are not supported; write H)' : '';
  throw new FrameError(line, `atom ${atom}: unknown element ${quote(t, 12)}${hint}`);
}

/** Parse one atom from an element token and three coordinate tokens. @throws FrameError. */
export function atomFrom(
  elementToken: string | number,
  xs: string,
  ys: string,
  zs: string,
  atom: number,
  line: number | null,
): AtomJson {
  const element = elementOf(elementToken, atom, line);
  return { element, x: coordinateFrom(xs, atom, line), y: coordinateFrom(ys, atom, line), z: coordinateFrom(zs, atom, line) };
}

function coordinateFrom(raw: string, atom: number, line: number | null): number {
  const v = parseNumber(raw);
  if (v == null) throw new FrameError(line, `atom ${atom}: coordinate ${quote(raw)} is not a number`);
  return checkCoordinate(v, raw, atom, line);
}

/**
 * The whitespace-separated fields of a line, like `line.trim().split(/\s+/)` (an empty line
 * gives [''] as that does), by a scan of the characters for the common ASCII case — the atom
 * lines of large files are read this way.
 */
export function splitFields(line: string): string[] {
  const out: string[] = [];
  let start = -1;
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c > 127) return line.trim().split(/\s+/);
    const space = c === 32 || (c >= 9 && c <= 13);
    if (space) {
      if (start >= 0) {
        out.push(line.slice(start, i));
        start = -1;
      }
    } else if (start < 0) start = i;
  }
  if (start >= 0) out.push(line.slice(start));
  if (out.length === 0) out.push('');
  return out;
}

/** Too-many-atoms message, shared so every format words it the same. */
export function tooManyAtoms(count: number, max: number): string {
  return `${count.toLocaleString('en-US')} atoms exceeds the limit of ${max.toLocaleString('en-US')} per structure`;
}

/** A charge value from a file: an integer (`-1`, `+2`, `0`, also `1.0`). @throws FrameError. */
export function chargeFrom(raw: string | number, line: number | null): number {
  const v = typeof raw === 'number' ? raw : parseNumber(raw);
  if (v == null || !Number.isInteger(v) || Math.abs(v) > 1000) {
    throw new FrameError(line, `charge ${quote(String(raw), 20)} is not an integer`);
  }
  return v;
}

/** A spin multiplicity from a file: an integer ≥ 1. @throws FrameError. */
export function multiplicityFrom(raw: string | number, line: number | null): number {
  const v = typeof raw === 'number' ? raw : parseNumber(raw);
  if (v == null || !Number.isInteger(v) || v < 1 || v > 1000) {
    throw new FrameError(line, `multiplicity ${quote(String(raw), 20)} is not an integer ≥ 1`);
  }
  return v;
}

/** Trim a title for use as a structure name; null when empty. */
export function cleanName(raw: string | null | undefined): string | null {
  if (raw == null) return null;
  const t = raw.replace(/[\u0000-\u001f\u007f]/g, ' ').replace(/\s+/g, ' ').trim();
  if (t === '') return null;
  return t.length > 200 ? t.slice(0, 200) : t;
}
