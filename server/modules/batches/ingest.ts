import { createHash, randomUUID } from 'node:crypto';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import yauzl from 'yauzl';
import { detectFormat, readStructures } from '@shared/formats/read';
import { formatParseFailure } from '@shared/formats/types';
import { DomainError } from '../../errors';
import { isZip, readZip, sanitizeEntryName } from '../../lib/zip-reader';
import type { BatchFile } from './entity';
import type { NewStructure } from './repository';

/** Upload limits (server/config.ts: UPLOAD_*, ZIP_*). */
export interface IngestLimits {
  maxStructures: number;
  maxAtoms: number;
  zipMaxEntries: number;
  zipMaxUncompressedBytes: number;
  zipMaxRatio: number;
}

/** One uploaded file: its name as sent by the client (a label only) and its bytes. */
export interface UploadedFile {
  name: string;
  bytes: Buffer;
}

export interface IngestResult {
  files: BatchFile[];
  structures: NewStructure[];
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** Display form of a client-supplied name: no directories climbing out, no control characters. */
export function displayName(raw: string, fallback: string): string {
  return (sanitizeEntryName(raw) || fallback).slice(0, 1000);
}

/**
 * Entries of an archive whose raw path is unsafe (`..` segments, absolute, drive letters): the
 * archive reader shows them under a cleaned name, but a path-traversal entry is a hostile or
 * broken archive, so its structures are refused with a clear message instead of being quietly
 * renamed. Reads the central directory only.
 */
function unsafeEntryNames(bytes: Buffer): Promise<Map<string, string>> {
  return new Promise((resolve) => {
    const unsafe = new Map<string, string>();
    yauzl.fromBuffer(bytes, { lazyEntries: true, decodeStrings: false, autoClose: true }, (err, zip) => {
      if (err || !zip) return resolve(unsafe); // readZip reports the damage itself
      zip.on('error', () => resolve(unsafe));
      zip.on('end', () => resolve(unsafe));
      zip.on('entry', (entry: yauzl.Entry) => {
        const raw = yauzl.getFileNameLowLevel(entry.generalPurposeBitFlag, entry.fileNameRaw, entry.extraFields, false);
        const parts = raw.replace(/\\/g, '/').split('/');
        if (parts.includes('..') || raw.startsWith('/') || raw.startsWith('\\') || /^[A-Za-z]:/.test(raw)) {
          unsafe.set(sanitizeEntryName(raw), raw);
        }
        zip.readEntry();
      });
      zip.readEntry();
    });
  });
}

/**
 * Turns the uploaded files (ZIP archives expanded, within limits) into the batch's file list and
 * structures. Unreadable frames become structures in the `error` state with a located one-line
 * message, and the rest goes on; only limits that protect the service (a ZIP bomb, too many
 * structures) refuse the whole upload, with a DomainError.
 */
export async function ingestUploads(uploads: readonly UploadedFile[], limits: IngestLimits): Promise<IngestResult> {
  if (uploads.length === 0) throw new DomainError('bad-request', 'The upload holds no files: attach structure files or a ZIP archive');
  const files: BatchFile[] = [];
  const structures: NewStructure[] = [];
  let unzippedBytes = 0;

  const addError = (file: string, sha: string, message: string, frameIndex = 0, frameCount = 1) => {
    structures.push({
      id: randomUUID(),
      seq: structures.length,
      sourceFile: file,
      frameIndex,
      frameCount,
      name: `${file}#${frameIndex + 1}`.slice(0, 500),
      inputAtoms: [],
      atomCount: 0,
      charge: null,
      multiplicity: null,
      inputSha256: sha,
      status: 'error',
      error: message,
    });
  };

  const addFile = (name: string, bytes: Buffer) => {
    const sha = sha256(bytes);
    const results = readStructures(name, bytes, { maxAtoms: limits.maxAtoms });
    const head = bytes.subarray(0, 4096).toString('utf8');
    const readable = results.some((r) => r.ok);
    files.push({ name, sha256: sha, bytes: bytes.length, format: readable ? detectFormat(name, head) : null, structures: results.length });
    for (const r of results) {
      if (!r.ok) {
        addError(name, sha, formatParseFailure(r.error), r.error.frame, results.length);
        continue;
      }
      const m = r.molecule;
      structures.push({
        id: randomUUID(),
        seq: structures.length,
        sourceFile: name,
        frameIndex: m.frameIndex,
        frameCount: results.length,
        name: (m.name || `${name}#${m.frameIndex + 1}`).slice(0, 500),
        inputAtoms: m.atoms,
        atomCount: m.atoms.length,
        charge: m.charge,
        multiplicity: m.multiplicity,
        inputSha256: sha,
        status: 'queued',
        error: null,
      });
    }
    if (structures.length > limits.maxStructures) {
      throw new DomainError(
        'too-large',
        `The upload holds more than ${limits.maxStructures.toLocaleString('en-US')} structures, the limit per batch: split it into several batches`,
      );
    }
  };

  for (const [i, upload] of uploads.entries()) {
    const name = displayName(upload.name, `file-${i + 1}`);
    if (isZip(upload.bytes) || /\.zip$/i.test(name)) {
      const unsafe = await unsafeEntryNames(upload.bytes);
      const entries = await readZip(upload.bytes, {
        label: name,
        maxEntries: limits.zipMaxEntries,
        maxTotalBytes: Math.max(0, limits.zipMaxUncompressedBytes - unzippedBytes),
        maxRatio: limits.zipMaxRatio,
      });
      for (const entry of entries) {
        unzippedBytes += entry.content.length;
        const shown = `${name}/${entry.name}`;
        const raw = unsafe.get(entry.name);
        if (raw !== undefined) {
          files.push({ name: shown, sha256: sha256(entry.content), bytes: entry.content.length, format: null, structures: 1 });
          addError(shown, sha256(entry.content), `${name}: entry '${raw.slice(0, 80)}' has an unsafe path (absolute or climbing out with '..'); it was not read`);
          continue;
        }
        addFile(shown, entry.content);
        await yieldToEventLoop(); // parsing is CPU work: let other requests through between files
      }
    } else {
      addFile(name, upload.bytes);
      await yieldToEventLoop();
    }
  }
  return { files, structures };
}
