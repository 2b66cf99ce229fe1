import { createHash } from 'node:crypto';
import type { Batch, Structure } from './entity';
import { effectiveSettings } from './service';

/**
 * manifest.json and summary.csv of a batch download. A manifest entry carries the same fields as
 * `pointfold snap --json` prints for a structure, without `atoms` (the cleaned files hold them),
 * plus where it came from (`inputFile`, `frameIndex`, `inputSha256`), what was written
 * (`outputFiles`, paths inside the ZIP) and with which settings.
 */

/** Manifest format version: bump when a field changes meaning. */
export const MANIFEST_VERSION = 1;

export function manifestEntry(batch: Pick<Batch, 'settings'>, s: Structure, outputFiles: readonly string[], writeErrors: readonly string[] = []) {
  const provenance = {
    status: s.status,
    inputFile: s.sourceFile,
    frameIndex: s.frameIndex,
    inputSha256: s.inputSha256,
    outputFiles,
    settings: effectiveSettings(batch, s),
    review: s.review,
    ...(writeErrors.length > 0 ? { writeErrors } : {}),
  };
  if (s.status === 'done' && s.result) {
    const { atoms: _atoms, ...result } = s.result;
    return { ...result, ...provenance };
  }
  return { name: s.name, ...provenance, error: s.error };
}

/** The head of manifest.json (everything before the structures). */
export function manifestHead(batch: Batch, slug: string, templates: readonly { name: string; fileExtension: string; body: string }[] = []): string {
  const head = {
    pointfoldManifest: MANIFEST_VERSION,
    batch: {
      id: batch.id,
      name: batch.name,
      workspace: slug,
      status: batch.status,
      createdAt: batch.createdAt.toISOString(),
      finishedAt: batch.finishedAt?.toISOString() ?? null,
      settings: batch.settings,
      files: batch.files,
      // Only when the batch has any, so manifests of batches without templates stay as they were.
      ...(templates.length > 0 ? { exportTemplates: templates.map((t) => ({ name: t.name, fileExtension: t.fileExtension, bodySha256: createHash('sha256').update(t.body).digest('hex') })) } : {}),
    },
    generatedAt: new Date().toISOString(),
  };
  const json = JSON.stringify(head, null, 2);
  // Re-open the object to append "structures": [...] as a stream.
  return `${json.slice(0, json.lastIndexOf('}')).trimEnd()},\n  "structures": [\n`;
}

export const MANIFEST_TAIL = '\n  ]\n}\n';

export const SUMMARY_COLUMNS = [
  'name',
  'inputFile',
  'frameIndex',
  'status',
  'formula',
  'perceivedGroup',
  'pointGroup',
  'order',
  'computationalSubgroup',
  'tolerance',
  'symmetryRmsdBefore',
  'symmetryRmsdAfter',
  'displacementRmsd',
  'maxDisplacement',
  'csm',
  'flags',
  'review',
  'error',
  'outputFiles',
] as const;

/**
 * One CSV field (RFC 4180 quoting). Text starting with = + - @ or a tab is prefixed with `'` so a
 * spreadsheet does not run it as a formula (common practice, OWASP "CSV injection"); numbers are
 * written as they are.
 */
export function csvField(value: unknown): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let text = String(value);
  if (/^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function summaryRow(s: Structure, outputFiles: readonly string[]): string {
  const r = s.status === 'done' ? s.result : null;
  const values: Record<(typeof SUMMARY_COLUMNS)[number], unknown> = {
    name: s.name,
    inputFile: s.sourceFile,
    frameIndex: s.frameIndex,
    status: s.status,
    formula: s.formula,
    perceivedGroup: r?.perceivedGroup,
    pointGroup: r?.pointGroup,
    order: r?.order,
    computationalSubgroup: r?.computationalSubgroup,
    tolerance: r?.tolerance,
    symmetryRmsdBefore: r?.symmetryRmsdBefore,
    symmetryRmsdAfter: r?.symmetryRmsdAfter,
    displacementRmsd: r?.displacementRmsd,
    maxDisplacement: r?.maxDisplacement,
    csm: r?.csm,
    flags: (r?.flags ?? []).join(' '),
    review: s.review,
    error: s.error,
    outputFiles: outputFiles.join(' '),
  };
  return SUMMARY_COLUMNS.map((c) => csvField(values[c])).join(',') + '\r\n';
}

export const SUMMARY_HEADER = SUMMARY_COLUMNS.join(',') + '\r\n';
