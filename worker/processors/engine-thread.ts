import { snapStructureStorable, type SnapTaskInput, type SnapTaskStorableOutput } from '../../server/modules/batches/snap-structure';

/** Runs inside an engine thread (see thread-pool.ts): one snap per message, the result as JSON text. */
export function handleTask(input: SnapTaskInput): SnapTaskStorableOutput {
  return snapStructureStorable(input);
}
