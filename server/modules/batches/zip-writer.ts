import { Readable, type Writable } from 'node:stream';
import { ZipArchive } from 'archiver';
import type { OutputFormat } from '@shared/contracts/settings';
import { OUTPUT_EXTENSIONS, outputFileName, renderTemplate } from '@shared/formats';
import type { Logger } from '../../logger';
import type { Batch, Structure } from './entity';
import { MANIFEST_TAIL, manifestEntry, manifestHead, SUMMARY_HEADER, summaryRow } from './manifest';
import { writeChecked } from './service';

export interface BatchZipSource {
  batch: Batch;
  workspaceSlug: string;
  /** Structures after `afterSeq` in upload order, at most `limit`. */
  page(afterSeq: number, limit: number): Promise<Structure[]>;
  logger: Logger;
  /** Export templates the batch was uploaded with (its own copies): one rendered deck per structure each. */
  templates?: readonly { name: string; fileExtension: string; body: string }[];
}

const PAGE = 200;
/** Entries handed to archiver but not yet written: the bound on what waits in memory. */
const MAX_IN_FLIGHT = 256;

/** `name` or, when taken, `name (2)` etc. before the extension(s). */
function uniqueName(taken: Set<string>, name: string): string {
  let candidate = name;
  const dot = name.indexOf('.') > 0 ? name.indexOf('.') : name.length;
  for (let n = 2; taken.has(candidate.toLowerCase()); n++) candidate = `${name.slice(0, dot)} (${n})${name.slice(dot)}`;
  taken.add(candidate.toLowerCase());
  return candidate;
}

/**
 * Streams a batch's ZIP into `out`: the cleaned files in the batch's output formats (named after
 * their inputs), then manifest.json and summary.csv. Structures are read a page at a time and the
 * manifest is produced while it is zipped, so memory stays flat for large batches. The files were
 * written and read back by the worker (write-back check); a format missing from the stored
 * outputs is written and checked here. Resolves when the archive is complete, rejects on error
 * (the caller destroys the response: a truncated ZIP must not look whole).
 */
export async function writeBatchZip(out: Writable, source: BatchZipSource): Promise<{ files: number; bytes: number }> {
  const { batch } = source;
  const formats = batch.settings.outputFormats as OutputFormat[];
  const templates = source.templates ?? [];
  const archive = new ZipArchive({ zlib: { level: 6 } });
  let processed = 0;
  let appended = 0;
  let failed: Error | null = null;
  let aborted = false;
  let wake: (() => void) | null = null;
  archive.on('entry', () => {
    processed++;
    wake?.();
  });
  archive.on('error', (e) => {
    failed = e;
    wake?.();
  });
  archive.on('warning', (e) => source.logger.warn({ err: e, batchId: batch.id }, 'zip warning'));
  out.on('close', () => {
    aborted = true;
    wake?.();
  });
  archive.pipe(out);

  const drained = () =>
    new Promise<void>((resolve) => {
      const check = () => {
        if (failed || aborted || appended - processed < MAX_IN_FLIGHT) {
          wake = null;
          resolve();
        } else wake = check;
      };
      check();
    });

  const taken = new Set(['manifest.json', 'summary.csv']);
  const outputFiles = new Map<string, string[]>();
  const writeErrors = new Map<string, string[]>();

  // Pass 1: the cleaned files.
  for (let after = -1; ; ) {
    const page = await source.page(after, PAGE);
    if (page.length === 0) break;
    after = page[page.length - 1].seq;
    for (const s of page) {
      if (s.status !== 'done' || !s.result) continue;
      const names: string[] = [];
      for (const format of formats) {
        let text = s.outputs?.[format];
        if (text === undefined) {
          try {
            text = writeChecked(format, s.result);
          } catch (e) {
            writeErrors.set(s.id, [...(writeErrors.get(s.id) ?? []), `${format}: ${(e as Error).message}`]);
            continue;
          }
        }
        const name = uniqueName(taken, outputFileName(s.sourceFile, s.frameIndex, s.frameCount, format));
        archive.append(text, { name });
        appended++;
        names.push(name);
      }
      if (templates.length > 0) {
        // `<structure base name>.<extension>`: the cleaned files' stem, so a deck sits beside its geometry.
        const xyzName = outputFileName(s.sourceFile, s.frameIndex, s.frameCount, 'xyz');
        const stem = xyzName.slice(0, xyzName.length - OUTPUT_EXTENSIONS.xyz.length);
        for (const t of templates) {
          const name = uniqueName(taken, `${stem}.${t.fileExtension}`);
          archive.append(renderTemplate(t.body, s.result), { name });
          appended++;
          names.push(name);
        }
      }
      outputFiles.set(s.id, names);
    }
    await drained();
    if (failed) throw failed;
    if (aborted) return { files: appended, bytes: archive.pointer() };
  }

  // Pass 2 and 3: manifest.json and summary.csv, generated while archiver reads them.
  const pages = async function* (render: (s: Structure, first: boolean) => string) {
    let first = true;
    for (let after = -1; !aborted; ) {
      const page = await source.page(after, PAGE);
      if (page.length === 0) return;
      after = page[page.length - 1].seq;
      yield page.map((s) => {
        const text = render(s, first);
        first = false;
        return text;
      }).join('');
    }
  };
  archive.append(
    Readable.from(
      (async function* () {
        yield manifestHead(batch, source.workspaceSlug, templates);
        yield* pages((s, first) => (first ? '' : ',\n') + '    ' + JSON.stringify(manifestEntry(batch, s, outputFiles.get(s.id) ?? [], writeErrors.get(s.id))));
        yield MANIFEST_TAIL;
      })(),
    ),
    { name: 'manifest.json' },
  );
  archive.append(
    Readable.from(
      (async function* () {
        yield SUMMARY_HEADER;
        yield* pages((s) => summaryRow(s, outputFiles.get(s.id) ?? []));
      })(),
    ),
    { name: 'summary.csv' },
  );
  appended += 2;
  await archive.finalize();
  if (failed) throw failed;
  return { files: appended, bytes: archive.pointer() };
}
