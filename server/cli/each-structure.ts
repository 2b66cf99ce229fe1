import { isEngineError } from '@shared/engine';
import { formatParseFailure } from '@shared/formats/types';
import type { InputItem } from './load-inputs';
import { EXIT_BAD_INPUT, EXIT_OK } from './options';
import { type BufferedOut, printError, progress } from './output';

/** A structure that was read. */
export type LoadedStructure = Extract<InputItem, { ok: true }>;
/** One entry of `{"structures": [...]}`. */
export type Entry = Record<string, unknown>;
/** An entry, and for a failed structure the bare reason (for tables; the entry has the located line). */
export interface Outcome {
  entry: Entry;
  failure: string | null;
}

/**
 * The loop every structure command shares. Runs `handle` on each structure in input order (as
 * the inputs stream in), with a progress line on stderr. A frame that could not be read, or that
 * the engine refuses (EngineError), is printed on stderr as one located line, becomes
 * `{ name, inputFile, frameIndex, error }` and makes the exit status 1; the other structures go
 * on. Any other error propagates. With `json`, the entries stream to `out` as
 * `{"structures":[...]}` and no outcome is kept (large batches stay out of memory); otherwise the
 * outcomes come back in input order for a table.
 */
export async function eachStructure(
  command: string,
  items: AsyncIterable<InputItem>,
  json: boolean,
  out: BufferedOut,
  handle: (item: LoadedStructure) => Entry,
): Promise<{ status: number; outcomes: Outcome[] }> {
  const bar = progress(command);
  const outcomes: Outcome[] = [];
  let status = EXIT_OK;
  if (json) out.write('{"structures":[');
  let k = 0;
  for await (const item of items) {
    bar.tick(k);
    let outcome: Outcome;
    if (!item.ok) {
      const message = formatParseFailure(item.error);
      printError(message);
      status = EXIT_BAD_INPUT;
      const entry = { name: `${item.error.file}#${item.error.frame + 1}`, inputFile: item.error.file, frameIndex: item.error.frame, error: message };
      outcome = { entry, failure: item.error.message };
    } else {
      const m = item.molecule;
      try {
        outcome = { entry: handle(item), failure: null };
      } catch (e) {
        if (!isEngineError(e)) throw e;
        const message = formatParseFailure({ file: m.sourceFile, frame: m.frameIndex, line: null, message: e.message });
        printError(message);
        status = EXIT_BAD_INPUT;
        outcome = { entry: { name: m.name, inputFile: m.sourceFile, frameIndex: m.frameIndex, error: message }, failure: e.message };
      }
    }
    if (json) {
      // Written as two pieces: joining them would copy the entry's JSON once more.
      out.write(k > 0 ? ',\n' : '\n');
      out.write(JSON.stringify(outcome.entry));
    }
    else outcomes.push(outcome);
    k++;
  }
  bar.done();
  if (json) out.write('\n]}\n');
  return { status, outcomes };
}
