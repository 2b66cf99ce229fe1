import { closeSync, openSync, readSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { allBytes, type ByteSource } from '@shared/formats/common';
import { iterateStructures } from '@shared/formats/read';
import type { MoleculeInput, ParseFailure } from '@shared/formats/types';
import { DomainError } from '../errors';
import { isZip, readZip } from '../lib/zip-reader';

/** One structure of the inputs, in input order: read, or a located failure. */
export type InputItem =
  | {
      ok: true;
      molecule: MoleculeInput;
      /** Frames in its file; 0 when the file is streamed (see {@link streamInputs}). */
      frameCount: number;
    }
  | { ok: false; error: ParseFailure };

/** Largest single input file the CLI reads (bytes); larger ones are refused with a message. */
export const MAX_INPUT_BYTES = 512 * 1024 * 1024;

/**
 * Every structure of the given files, in order. A ZIP (by its signature or `.zip`) is unpacked
 * with the limits of zip-reader and each entry read as `<archive>/<entry>`. Never throws for bad
 * input: an unreadable file or archive becomes one failure.
 *
 * The frames of a file are read and parsed only as they are consumed, so a long multi-frame file
 * is never held in memory whole, as bytes, text or parsed atoms; then `frameCount` is 0. With
 * `frameCounts`, each file is parsed whole first and its items carry the number of frames
 * (output file names need it). An archive is read into memory whole.
 */
export async function* streamInputs(
  paths: readonly string[],
  options: { maxAtoms?: number; frameCounts?: boolean } = {},
): AsyncGenerator<InputItem, void, undefined> {
  const readOptions = { maxAtoms: options.maxAtoms };
  function* fromFile(label: string, content: Uint8Array | ByteSource): Generator<InputItem, void, undefined> {
    const frames = iterateStructures(label, content, readOptions);
    const counted = options.frameCounts ? [...frames] : null;
    const frameCount = counted ? counted.length : 0;
    for (const r of counted ?? frames) yield r.ok ? { ok: true, molecule: r.molecule, frameCount } : r;
  }
  for (const path of paths) {
    const fileFailure = (message: string): InputItem => ({ ok: false, error: { file: path, frame: 0, line: null, message } });
    const cannotRead = (e: unknown) => {
      const code = (e as NodeJS.ErrnoException).code;
      return fileFailure(code === 'ENOENT' ? 'no such file' : code === 'EACCES' ? 'permission denied' : `cannot read (${(e as Error).message})`);
    };
    let fd: number;
    let size: number;
    try {
      const st = statSync(path);
      if (st.isDirectory()) {
        yield fileFailure('is a directory (give the files, or a ZIP of them)');
        continue;
      }
      if (st.size > MAX_INPUT_BYTES) {
        yield fileFailure(`the file is ${Math.round(st.size / 2 ** 20)} MiB; the limit is ${MAX_INPUT_BYTES / 2 ** 20} MiB`);
        continue;
      }
      fd = openSync(path, 'r');
      size = st.size;
    } catch (e) {
      yield cannotRead(e);
      continue;
    }
    try {
      const source = fileSource(fd, size);
      if (isZip(source.read(0, 4)) || /\.zip$/i.test(path)) {
        let entries: Awaited<ReturnType<typeof readZip>>;
        try {
          const bytes = allBytes(source);
          entries = await readZip(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length), { label: basename(path) });
        } catch (e) {
          if (!(e instanceof DomainError)) throw e;
          // The message starts with the archive's base name; report it against the path given.
          yield fileFailure(e.message.replace(/^[^:]*: /, ''));
          continue;
        }
        if (entries.length === 0) yield fileFailure('the ZIP archive holds no files');
        for (const entry of entries) yield* fromFile(`${path}/${entry.name}`, entry.content);
        continue;
      }
      yield* fromFile(path, source);
    } catch (e) {
      // The file could be opened but not read (an I/O error, a file truncated while read).
      if (typeof (e as NodeJS.ErrnoException).code !== 'string') throw e;
      yield cannotRead(e);
    } finally {
      closeSync(fd);
    }
  }
}

/**
 * A file read by position through one reused buffer: a long multi-frame file is read as its
 * frames are processed, never held in memory whole (readers take it as a ByteSource). Its size
 * is the size when it was opened.
 */
function fileSource(fd: number, size: number): ByteSource {
  let buffer = Buffer.allocUnsafe(0);
  return {
    size,
    read(position: number, length: number): Uint8Array {
      if (buffer.length < length) buffer = Buffer.allocUnsafe(length);
      let n = 0;
      while (n < length) {
        const k = readSync(fd, buffer, n, length - n, position + n);
        if (k === 0) break;
        n += k;
      }
      return buffer.subarray(0, n);
    },
  };
}
