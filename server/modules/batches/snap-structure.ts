import { performance } from 'node:perf_hooks';
import type { OutputFormat, SnapSettings } from '@shared/contracts/settings';
import type { StructureResult } from '@shared/contracts/structure';
import { EngineError, snap } from '@shared/engine';
import { verifyWritten, writeStructure } from '@shared/formats';
import type { MoleculeInput } from '@shared/formats/types';

/** One structure to snap: its input and the complete settings (the target already resolved). */
export interface SnapTaskInput {
  molecule: MoleculeInput;
  settings: SnapSettings;
}

export type SnapTaskOutput =
  | {
      ok: true;
      result: StructureResult;
      /** The cleaned file in each of `settings.outputFormats`, each read back and re-perceived. */
      outputs: Partial<Record<OutputFormat, string>>;
      engineMs: number;
      writeMs: number;
    }
  | {
      ok: false;
      /** EngineError code, or 'internal' for a failure of ours. */
      code: string;
      message: string;
      engineMs: number;
    };

/**
 * Snaps one structure and writes its output files, each through the write-back check. Pure CPU
 * work: the worker runs it in a thread, the demo seed inline. Never throws for a structure:
 * everything the engine throws is deterministic (the same input fails the same way), so
 * retrying would not help — the failure is returned and the caller stores it.
 */
export function snapStructure(input: SnapTaskInput): SnapTaskOutput {
  const t0 = performance.now();
  let result: StructureResult;
  try {
    result = snap(input.molecule, input.settings);
  } catch (e) {
    return failure(e, performance.now() - t0);
  }
  const t1 = performance.now();
  const outputs: Partial<Record<OutputFormat, string>> = {};
  try {
    for (const format of input.settings.outputFormats) {
      const text = writeStructure(format, result);
      verifyWritten(format, text, result);
      outputs[format] = text;
    }
  } catch (e) {
    const f = failure(e, t1 - t0);
    return { ...f, message: `Writing the cleaned file failed its read-back check: ${f.message}` };
  }
  return { ok: true, result, outputs, engineMs: t1 - t0, writeMs: performance.now() - t1 };
}

/** The scalar columns of a result (what the structure table filters and sorts on). */
export interface ResultColumns {
  formula: string;
  perceivedGroup: string;
  pointGroup: string;
  order: number;
  computationalSubgroup: string;
  symmetryRmsdBefore: number;
  symmetryRmsdAfter: number;
  displacementRmsd: number;
  maxDisplacement: number;
  csm: number;
  flags: string[];
  engineVersion: string;
}

/** A result ready to store: its columns, and the result and outputs already as JSON text. */
export interface StorableResult {
  columns: ResultColumns;
  resultJson: string;
  outputsJson: string;
}

export function storable(result: StructureResult, outputs: Partial<Record<OutputFormat, string>>): StorableResult {
  return {
    columns: {
      formula: result.formula,
      perceivedGroup: result.perceivedGroup,
      pointGroup: result.pointGroup,
      order: result.order,
      computationalSubgroup: result.computationalSubgroup,
      symmetryRmsdBefore: result.symmetryRmsdBefore,
      symmetryRmsdAfter: result.symmetryRmsdAfter,
      displacementRmsd: result.displacementRmsd,
      maxDisplacement: result.maxDisplacement,
      csm: result.csm,
      flags: result.flags,
      engineVersion: result.engineVersion,
    },
    resultJson: JSON.stringify(result),
    outputsJson: JSON.stringify(outputs),
  };
}

export type SnapTaskStorableOutput =
  | ({ ok: true; engineMs: number; writeMs: number } & StorableResult)
  | Extract<SnapTaskOutput, { ok: false }>;

/**
 * {@link snapStructure} with the result serialised where it was computed (an engine thread): the
 * worker's main thread then hands plain strings to PostgreSQL instead of copying a large object
 * across threads and stringifying it on the event loop that also serves the queue.
 */
export function snapStructureStorable(input: SnapTaskInput): SnapTaskStorableOutput {
  const out = snapStructure(input);
  if (!out.ok) return out;
  return { ok: true, engineMs: out.engineMs, writeMs: out.writeMs, ...storable(out.result, out.outputs) };
}

function failure(e: unknown, engineMs: number): Extract<SnapTaskOutput, { ok: false }> {
  if (e instanceof EngineError) return { ok: false, code: e.code, message: e.message, engineMs };
  const message = e instanceof Error ? e.message : String(e);
  return { ok: false, code: 'internal', message: `The engine failed on this structure (${message})`, engineMs };
}
