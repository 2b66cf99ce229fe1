/**
 * Reading text from bytes a window at a time (LineReader over bytes or a ByteSource, checkText,
 * headText) must give exactly what decoding the whole file first gives. The references are outside these
 * helpers: UTF-8 as Node's Buffer encodes it and a fatal TextDecoder decodes it whole (WHATWG
 * Encoding standard), String.prototype.trim for "blank" (ECMA-262 white space), and the lines as
 * String.prototype.split cuts the decoded text at CRLF, LF and lone CR. Windows of 1–7 bytes
 * force every split: inside CRLF, inside multi-byte characters (2, 3 and 4 bytes), inside the
 * byte-order mark.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkText, decodeText, headText, LineReader, TEXT_WINDOW_BYTES, type ByteSource } from '@shared/formats/common';
import { iterateStructures, readStructures } from '@shared/formats/read';

const utf8 = (text: string) => new Uint8Array(Buffer.from(text, 'utf8'));

/**
 * Bytes read as a file is (a ByteSource): each read lands in one buffer that the next read
 * overwrites, so a reader that kept a piece instead of decoding it at once would see other bytes.
 */
function fileLike(bytes: Uint8Array): ByteSource {
  const buffer = new Uint8Array(bytes.length + 8);
  return {
    size: bytes.length,
    read(position, length) {
      const n = Math.max(0, Math.min(length, bytes.length - position));
      buffer.fill(0x78); // 'x' where the previous piece was
      buffer.set(bytes.subarray(position, position + n));
      return buffer.subarray(0, n);
    },
  };
}

/** Pieces of text that meet every case of the line splitter and the decoder. */
const piece = fc.constantFrom('\n', '\r\n', '\r', ' ', '\t', '3', 'C 0.5 -1.25 2', 'é', 'σv', 'C∞v', '😀', '\u00a0', '\u2028', 'x', '\ufeff');

/** What a reader does next: read a line, peek, un-read after a read, skip some, ask if the rest is blank. */
const step = fc.constantFrom('next', 'next', 'next', 'peek', 'back', 'skip2', 'blank');

/** The steps done on a line reader: what each returned, and the line number after it. */
function drive(r: Pick<LineReader, 'next' | 'peek' | 'back' | 'skip' | 'restIsBlank' | 'lineNo'>, steps: readonly string[]): unknown[] {
  const out: unknown[] = [];
  let canBack = false;
  for (const s of steps) {
    if (s === 'next') {
      const line = r.next();
      canBack = line !== null;
      out.push(['next', line, r.lineNo]);
    } else if (s === 'peek') {
      out.push(['peek', r.peek(), r.lineNo]);
      canBack = false;
    } else if (s === 'back' && canBack) {
      r.back();
      canBack = false;
      out.push(['back', r.lineNo]);
    } else if (s === 'skip2') {
      out.push(['skip', r.skip(2), r.lineNo]);
      canBack = false;
    } else if (s === 'blank') {
      out.push(['blank', r.restIsBlank()]);
    }
  }
  // Then read the rest.
  for (let line = r.next(); line !== null; line = r.next()) out.push(['rest', line, r.lineNo]);
  return out;
}

/**
 * The same reader as a model over String.prototype.split: lines end at CRLF, LF or a lone CR,
 * and a line end at the very end of the text ends the last line (no empty line after it).
 */
function modelReader(text: string) {
  const lines = text.split(/\r\n|\n|\r/);
  if (lines[lines.length - 1] === '') lines.pop();
  const m = {
    lineNo: 0,
    next: () => (m.lineNo < lines.length ? lines[m.lineNo++] : null),
    peek: () => (m.lineNo < lines.length ? lines[m.lineNo] : null),
    back: () => {
      m.lineNo--;
    },
    skip: (n: number) => {
      const k = Math.min(n, lines.length - m.lineNo);
      m.lineNo += k;
      return k;
    },
    restIsBlank: () => lines.slice(m.lineNo).join('\n').trim() === '',
  };
  return m;
}

describe('LineReader over bytes', () => {
  it('reads the lines of the decoded text (split at CRLF, LF, CR), for any window size', () => {
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 40 }), fc.array(step, { maxLength: 30 }), fc.integer({ min: 1, max: 7 }), fc.boolean(), (parts, steps, windowBytes, bom) => {
        const body = parts.join('');
        const bytes = utf8((bom ? '\ufeff' : '') + body);
        const decoded = decodeText(bytes);
        expect(decoded.ok).toBe(true);
        if (!decoded.ok) return;
        const expected = drive(modelReader(decoded.text), steps);
        expect(drive(new LineReader(bytes, windowBytes), steps)).toEqual(expected);
        expect(drive(new LineReader(fileLike(bytes), windowBytes), steps)).toEqual(expected);
        expect(drive(new LineReader(decoded.text), steps)).toEqual(expected);
      }),
      { seed: 4242, numRuns: 600 },
    );
  });

  it('keeps a line that runs over many windows whole', () => {
    const long = `${'C 0.5 -1.25 2 '.repeat(40)}é`;
    const r = new LineReader(utf8(`3\r\n${long}\r\nlast`), 5);
    expect([r.next(), r.next(), r.next(), r.next()]).toEqual(['3', long, 'last', null]);
  });
});

describe('checkText and headText', () => {
  const bytesOf = fc.oneof(
    fc.array(piece, { maxLength: 30 }).map((p) => utf8(p.join(''))),
    // raw bytes: invalid sequences, lone continuation bytes, truncated characters, NUL
    fc.uint8Array({ maxLength: 24 }),
    fc.array(piece, { maxLength: 10 }).map((p) => {
      const b = utf8(p.join(''));
      return b.subarray(0, Math.max(0, b.length - 1)); // may cut a multi-byte character
    }),
  );

  it('decide as decoding the whole file does (valid, NUL, invalid UTF-8, blank)', () => {
    fc.assert(
      fc.property(bytesOf, fc.integer({ min: 1, max: 7 }), (bytes, windowBytes) => {
        const whole = decodeText(bytes);
        const checked = checkText(bytes, windowBytes);
        expect(checkText(fileLike(bytes), windowBytes)).toEqual(checked);
        if (!whole.ok) {
          expect(checked).toEqual({ ok: false, message: whole.message });
          return;
        }
        expect(checked).toEqual({ ok: true, blank: whole.text.trim() === '' });
        const head = headText(bytes, windowBytes);
        expect(headText(fileLike(bytes), windowBytes)).toBe(head);
        expect(whole.text.startsWith(head)).toBe(true);
        // At least the first window's characters (a character cut by its end comes with the next).
        expect(utf8(head).length).toBeGreaterThanOrEqual(Math.min(windowBytes, utf8(whole.text).length) - 3);
      }),
      { seed: 99, numRuns: 800 },
    );
  });

  it('reports the same messages for the usual cases', () => {
    expect(checkText(utf8('3\nwater\nO 0 0 0\u0000'))).toEqual({ ok: false, message: 'not a text file (it contains NUL bytes)' });
    expect(checkText(new Uint8Array([0x33, 0x0a, 0xff, 0xfe]))).toEqual({ ok: false, message: 'not a text file (it is not valid UTF-8)' });
    expect(checkText(utf8('\ufeff \r\n\t\n'))).toEqual({ ok: true, blank: true });
    expect(headText(utf8('\ufeff3\n'))).toBe('3\n');
  });
});

describe('readStructures on bytes', () => {
  /** A multi-frame XYZ file of several windows, with damaged frames and a 2-byte character across the first window boundary. */
  function bigXyz(): string {
    const frames: string[] = [];
    const frame = (i: number, comment: string) =>
      `5\n${comment}\nC ${(i * 0.001).toFixed(6)} 0 0\nH 0.63 0.63 0.63\nH -0.63 -0.63 0.63\nH -0.63 0.63 -0.63\nH 0.63 -0.63 -0.63\n`;
    let text = '';
    for (let i = 0; text.length < TEXT_WINDOW_BYTES - 200; i++) text += frame(i, `methane ${i}`);
    // Pad a comment so that its 'é' starts on the last byte of the first window (ASCII so far).
    const pad = TEXT_WINDOW_BYTES - 1 - (text.length + 2);
    text += frame(-1, `${'x'.repeat(pad)}é charge=0`);
    expect(Buffer.byteLength(text.slice(0, text.indexOf('é')))).toBe(TEXT_WINDOW_BYTES - 1);
    frames.push(text);
    for (let i = 0; i < 2000; i++) {
      if (i % 97 === 5) frames.push('4\nshort frame\nC 0 0 0\n\n');
      else if (i % 131 === 7) frames.push('two\nnot a count\n');
      else frames.push(frame(i, i % 2 ? `σ-frame ${i}` : `frame ${i}`).replace(/\n/g, i % 3 ? '\n' : '\r\n'));
    }
    return frames.join('');
  }

  it('gives what reading the decoded text gives, frame for frame', () => {
    const text = bigXyz();
    const bytes = utf8(text);
    expect(bytes.length).toBeGreaterThan(3 * TEXT_WINDOW_BYTES);
    for (const name of ['big.xyz', 'big.extxyz', 'no-extension']) {
      const fromBytes = readStructures(name, bytes);
      expect(fromBytes).toEqual(readStructures(name, text));
      expect([...iterateStructures(name, fileLike(bytes))]).toEqual(fromBytes);
      expect(fromBytes.filter((r) => !r.ok).length).toBeGreaterThan(10);
      expect(fromBytes.filter((r) => r.ok).length).toBeGreaterThan(1900);
    }
  });

  it('decodes files of the other formats whole, as before', () => {
    // An SD file whose first '$$$$' lies beyond what format detection reads first (60 atoms):
    // without an extension it is told from a single molfile only by the whole text.
    const atom = (i: number) => `${(i * 0.9).toFixed(4).padStart(10)}    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0\n`;
    const record = (n: number) => `\n  test\n\n${String(n).padStart(3)}  0  0  0  0  0  0  0  0  0999 V2000\n${Array.from({ length: n }, (_, i) => atom(i)).join('')}M  END\n$$$$\n`;
    const sdf = record(60) + record(1);
    expect(sdf.indexOf('$$$$')).toBeGreaterThan(4096);
    for (const name of ['x', 'x.sdf']) {
      expect(readStructures(name, utf8(sdf))).toEqual(readStructures(name, sdf));
      expect([...iterateStructures(name, fileLike(utf8(sdf)))]).toEqual(readStructures(name, sdf));
      expect(readStructures(name, utf8(sdf)).filter((r) => r.ok)).toHaveLength(2);
    }
  });
});
