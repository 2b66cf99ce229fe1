import { snapStructure, type SnapTaskInput, type SnapTaskOutput } from '../../server/modules/batches/snap-structure';

/** Runs inside an engine thread (see thread-pool.ts): one snap per message. */
export function handleTask(input: SnapTaskInput): SnapTaskOutput {
  return snapStructure(input);
}
