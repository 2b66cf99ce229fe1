import { readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { readStructures } from '@shared/formats/read';
import type { MoleculeInput, ParseFailure } from '@shared/formats/types';
import { DomainError } from '../errors';
import { isZip, readZip } from '../lib/zip-reader';

/** One structure of the inputs, in input order: read, or a located failure. */
export type InputItem =
  | { ok: true; molecule: MoleculeInput; /** frames in its file */ frameCount: number }
  | { ok: false; error: ParseFailure };

/** Largest single input file the CLI reads (bytes); larger ones are refused with a message. */
export const MAX_INPUT_BYTES = 512 * 1024 * 1024;

/**
 * Read every structure of the given files, in order. A ZIP (by its signature or `.zip`) is
 * unpacked with the limits of zip-reader and each entry read as `<archive>/<entry>`. Never
 * throws for bad input: an unreadable file or archive becomes one failure.
 */
export async function loadInputs(paths: readonly string[], options: { maxAtoms?: number } = {}): Promise<InputItem[]> {
  const items: InputItem[] = [];
  const addFile = (label: string, content: Uint8Array) => {
    const rs = readStructures(label, content, options);
    for (const r of rs) items.push(r.ok ? { ok: true, molecule: r.molecule, frameCount: rs.length } : r);
  };
  for (const path of paths) {
    const fileFailure = (message: string) => items.push({ ok: false, error: { file: path, frame: 0, line: null, message } });
    let content: Buffer;
    try {
      const st = statSync(path);
      if (st.isDirectory()) {
        fileFailure('is a directory (give the files, or a ZIP of them)');
        continue;
      }
      if (st.size > MAX_INPUT_BYTES) {
        fileFailure(`the file is ${Math.round(st.size / 2 ** 20)} MiB; the limit is ${MAX_INPUT_BYTES / 2 ** 20} MiB`);
        continue;
      }
      content = readFileSync(path);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      fileFailure(code === 'ENOENT' ? 'no such file' : code === 'EACCES' ? 'permission denied' : `cannot read (${(e as Error).message})`);
      continue;
    }
    if (isZip(content) || /\.zip$/i.test(path)) {
      try {
        const entries = await readZip(content, { label: basename(path) });
        if (entries.length === 0) fileFailure('the ZIP archive holds no files');
        for (const entry of entries) addFile(`${path}/${entry.name}`, entry.content);
      } catch (e) {
        if (!(e instanceof DomainError)) throw e;
        // The message starts with the archive's base name; report it against the path given.
        fileFailure(e.message.replace(/^[^:]*: /, ''));
      }
      continue;
    }
    addFile(path, content);
  }
  return items;
}
