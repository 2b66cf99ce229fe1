import { basename } from 'node:path';
import type * as Yauzl from 'yauzl';
import { DomainError } from '../errors';

/**
 * Reads ZIP archives of structure files (uploads, CLI arguments) with yauzl, streaming each entry
 * and enforcing limits so that a ZIP bomb is refused rather than expanded.
 *
 * Entry names are decoded (UTF-8 flag, Info-ZIP Unicode path field, else CP437, all by yauzl)
 * and sanitised for display only: they are never used as file-system paths by this module, and
 * `..`, absolute prefixes, drive letters and control characters are removed so that callers that
 * show or store them cannot be misled. Directories, `__MACOSX/` resource forks and `.DS_Store`
 * are skipped.
 */

/** Limits of {@link readZip}; every field is optional. */
export interface ZipLimits {
  /** Largest number of entries in the central directory (default 10,000). */
  maxEntries?: number;
  /** Largest total uncompressed size in bytes (default 256 MiB). */
  maxTotalBytes?: number;
  /** Largest uncompressed/compressed ratio of one entry (default 200), checked for entries over 1 MiB. */
  maxRatio?: number;
  /** Name used in messages when the source is a Buffer (default `archive.zip`). */
  label?: string;
}

/** One file of the archive. */
export interface ZipEntryContent {
  /** Sanitised entry path for display (`folder/file.xyz`), unique within the result. */
  name: string;
  content: Buffer;
}

export const DEFAULT_ZIP_LIMITS = {
  maxEntries: 10_000,
  maxTotalBytes: 256 * 1024 * 1024,
  maxRatio: 200,
} as const;

/** Entries smaller than this are not ratio-checked: small text files of spaces compress very well. */
const RATIO_CHECK_MIN_BYTES = 1024 * 1024;

/** True when the bytes start with a ZIP local-file or end-of-central-directory signature. */
export function isZip(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && ((bytes[2] === 3 && bytes[3] === 4) || (bytes[2] === 5 && bytes[3] === 6));
}

/** Make an entry name safe to display: no `..`, no absolute prefix, no control characters. */
export function sanitizeEntryName(raw: string): string {
  return raw
    .replace(/\\/g, '/')
    .replace(/[\u0000-\u001f\u007f]/g, '')
    .split('/')
    .map((part) => part.replace(/^[A-Za-z]:$/, '').trim())
    .filter((part) => part !== '' && part !== '.' && part !== '..')
    .join('/');
}

const mib = (n: number) => `${(n / (1024 * 1024)).toFixed(n < 10 * 1024 * 1024 ? 1 : 0)} MiB`;

/**
 * yauzl, loaded when the first archive is opened: the command line reads archives seldom, and
 * loading yauzl at start cost every run about 20 ms.
 */
let yauzlModule: Promise<typeof Yauzl> | null = null;
const loadYauzl = () => (yauzlModule ??= import('yauzl').then((m) => (m as { default?: typeof Yauzl }).default ?? m));

async function openZip(source: Buffer | string): Promise<{ zip: Yauzl.ZipFile; yauzl: typeof Yauzl }> {
  const yauzl = await loadYauzl();
  const options: Yauzl.Options = { lazyEntries: true, decodeStrings: false, validateEntrySizes: true, autoClose: true };
  const zip = await new Promise<Yauzl.ZipFile>((resolve, reject) => {
    const done = (err: Error | null, zip?: Yauzl.ZipFile) => (err || !zip ? reject(err ?? new Error('no archive')) : resolve(zip));
    if (typeof source === 'string') yauzl.open(source, options, done);
    else yauzl.fromBuffer(source, options, done);
  });
  return { zip, yauzl };
}

/**
 * Read every file of a ZIP archive into memory, within limits.
 * @throws DomainError 'too-large' when a limit is exceeded (too many entries, too many bytes,
 *   a compression ratio typical of a ZIP bomb); 'bad-request' when the archive is not a readable
 *   ZIP, is encrypted or uses an unsupported compression method. Messages are one line and start
 *   with the archive's name.
 */
export async function readZip(source: Buffer | string, limits: ZipLimits = {}): Promise<ZipEntryContent[]> {
  const maxEntries = limits.maxEntries ?? DEFAULT_ZIP_LIMITS.maxEntries;
  const maxTotal = limits.maxTotalBytes ?? DEFAULT_ZIP_LIMITS.maxTotalBytes;
  const maxRatio = limits.maxRatio ?? DEFAULT_ZIP_LIMITS.maxRatio;
  const label = typeof source === 'string' ? basename(source) : (limits.label ?? 'archive.zip');
  const fail = (code: 'too-large' | 'bad-request', message: string) => new DomainError(code, `${label}: ${message}`);

  let zip: Yauzl.ZipFile;
  let yauzl: typeof Yauzl;
  try {
    ({ zip, yauzl } = await openZip(source));
  } catch (e) {
    throw fail('bad-request', `not a readable ZIP archive (${(e as Error).message})`);
  }
  if (zip.entryCount > maxEntries) {
    zip.close();
    throw fail('too-large', `${zip.entryCount} entries exceeds the limit of ${maxEntries}`);
  }

  const out: ZipEntryContent[] = [];
  const seen = new Map<string, number>();
  let total = 0;

  return new Promise<ZipEntryContent[]>((resolve, reject) => {
    let settled = false;
    const stop = (err: Error) => {
      if (settled) return;
      settled = true;
      zip.close();
      reject(err);
    };
    zip.on('error', (e: Error) => stop(e instanceof DomainError ? e : fail('bad-request', `damaged ZIP archive (${e.message})`)));
    zip.on('end', () => {
      if (settled) return;
      settled = true;
      resolve(out);
    });
    zip.on('entry', (entry: Yauzl.Entry) => {
      if (settled) return;
      const raw = yauzl.getFileNameLowLevel(entry.generalPurposeBitFlag, entry.fileNameRaw, entry.extraFields, false);
      const isDir = raw.endsWith('/');
      const parts = raw.split('/');
      if (isDir || parts.includes('__MACOSX') || parts[parts.length - 1] === '.DS_Store') {
        zip.readEntry();
        return;
      }
      let name = sanitizeEntryName(raw) || `entry-${out.length + 1}`;
      const dup = seen.get(name) ?? 0;
      seen.set(name, dup + 1);
      if (dup > 0) name = `${name} (${dup + 1})`;
      const shown = `'${name.length > 60 ? `${name.slice(0, 60)}…` : name}'`;

      if (entry.isEncrypted()) return stop(fail('bad-request', `entry ${shown} is encrypted; encrypted archives are not supported`));
      if (!entry.canDecodeFileData()) {
        return stop(fail('bad-request', `entry ${shown} uses compression method ${entry.compressionMethod}; only stored and deflated entries are supported`));
      }
      if (total + entry.uncompressedSize > maxTotal) {
        return stop(fail('too-large', `the files expand to more than ${mib(maxTotal)} (limit); the archive is refused`));
      }
      if (entry.uncompressedSize > RATIO_CHECK_MIN_BYTES) {
        const ratio = entry.uncompressedSize / Math.max(entry.compressedSize, 1);
        if (ratio > maxRatio) {
          return stop(
            fail('too-large', `entry ${shown} expands ${Math.round(ratio)}× (limit ${maxRatio}×) to ${mib(entry.uncompressedSize)}; refused as a possible ZIP bomb`),
          );
        }
      }
      zip.openReadStream(entry, (err, stream) => {
        if (err || !stream) return stop(fail('bad-request', `entry ${shown} cannot be read (${err?.message ?? 'no data'})`));
        const chunks: Buffer[] = [];
        let bytes = 0;
        stream.on('data', (chunk: Buffer) => {
          bytes += chunk.length;
          // Declared sizes can lie; count what actually comes out too.
          if (total + bytes > maxTotal) {
            stream.destroy();
            stop(fail('too-large', `the files expand to more than ${mib(maxTotal)} (limit); the archive is refused`));
            return;
          }
          chunks.push(chunk);
        });
        stream.on('error', (e: Error) =>
          stop(
            /too many bytes/.test(e.message)
              ? fail('too-large', `entry ${shown} holds more data than its header declares; refused as a possible ZIP bomb`)
              : fail('bad-request', `entry ${shown} is damaged (${e.message})`),
          ),
        );
        stream.on('end', () => {
          if (settled) return;
          total += bytes;
          out.push({ name, content: Buffer.concat(chunks, bytes) });
          zip.readEntry();
        });
      });
    });
    zip.readEntry();
  });
}
