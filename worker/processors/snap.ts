import { performance } from 'node:perf_hooks';
import { UnrecoverableError, type Job } from 'bullmq';
import type { Logger } from '../../server/logger';
import type { StructureTimings } from '../../server/modules/batches/entity';
import type { BatchRepository } from '../../server/modules/batches/repository';
import type { SnapTaskInput, SnapTaskOutput } from '../../server/modules/batches/snap-structure';
import type { BatchQueue, SnapJobData } from '../../server/queue/batch-queue';
import { ThreadLostError, type ThreadPool } from './thread-pool';

export interface SnapProcessorDeps {
  repo: BatchRepository;
  queue: BatchQueue;
  pool: ThreadPool<SnapTaskInput, SnapTaskOutput>;
  logger: Logger;
}

/**
 * Coalesces batch refreshes: at most one runs per batch at a time, and callers arriving while
 * one runs share the next, which starts after it and so sees their writes. Each caller's promise
 * settles only after a refresh that began after its own write: a job is acknowledged only once
 * its batch's counts (and possibly its completion) are stored.
 */
export function createBatchRefresher(refreshOnce: (batchId: string) => Promise<void>) {
  const states = new Map<string, { running: Promise<void> | null; next: Promise<void> | null }>();
  const refresh = (batchId: string): Promise<void> => {
    let state = states.get(batchId);
    if (!state) {
      state = { running: null, next: null };
      states.set(batchId, state);
    }
    const s = state;
    if (!s.running) {
      s.running = refreshOnce(batchId).finally(() => {
        s.running = null;
        if (!s.next) states.delete(batchId);
      });
      return s.running;
    }
    if (!s.next) {
      s.next = s.running
        .catch(() => undefined)
        .then(() => {
          s.next = null;
          return refresh(batchId);
        });
    }
    return s.next;
  };
  return refresh;
}

/**
 * The snap job: claim the structure (conditional update on its revision), run the engine in a
 * thread, store the result or the input's error, refresh the batch. Safe to run twice: a second
 * delivery finds the structure no longer claimable and only refreshes the batch.
 *
 * Failure policy: bad input (an EngineError, or anything the engine throws — the same input fails
 * the same way) is stored as the structure's error and fails the job at once (UnrecoverableError).
 * A lost database or Redis connection, or a crashed thread, throws and BullMQ retries with
 * back-off. A structure that runs out of memory or time is stored as an error too.
 */
export function createSnapProcessor(deps: SnapProcessorDeps) {
  const { repo, queue, pool, logger } = deps;

  const refresh = createBatchRefresher(async (batchId) => {
    const state = await repo.refreshBatch(batchId);
    if (state?.needsNotice) await queue.enqueueNotify(batchId);
  });

  return async function processSnap(job: Job<SnapJobData>): Promise<{ outcome: string; engineMs?: number }> {
    const { structureId, revision } = job.data;
    const t0 = performance.now();
    const claimed = await repo.claimForSnap(structureId, revision);
    if (!claimed) {
      // Re-delivered after its result was stored, superseded by a re-snap, or cancelled. The
      // refresh may not have happened before the previous delivery died, so do it now.
      const state = await repo.structureState(structureId);
      if (state) await refresh(state.batchId);
      return { outcome: `skipped (${state ? `${state.status}, revision ${state.revision}` : 'structure deleted'})` };
    }
    const claimMs = performance.now() - t0;
    const settings = claimed.target ? { ...claimed.settings, target: claimed.target } : claimed.settings;
    const task: SnapTaskInput = {
      molecule: {
        name: claimed.name,
        sourceFile: claimed.sourceFile,
        frameIndex: claimed.frameIndex,
        atoms: claimed.inputAtoms,
        charge: claimed.charge,
        multiplicity: claimed.multiplicity,
      },
      settings,
    };

    let out: SnapTaskOutput;
    try {
      out = await pool.run(task);
    } catch (e) {
      if (e instanceof ThreadLostError && e.reason !== 'crash') {
        await repo.storeFailure(structureId, revision, e.message, null);
        await refresh(claimed.batchId);
        throw new UnrecoverableError(e.message);
      }
      throw e; // a crashed thread: transient, retried
    }

    const timings = (writeMs: number): StructureTimings => ({
      queueMs: Math.max(0, claimed.queueMs),
      engineMs: out.engineMs,
      writeMs,
      dbMs: claimMs,
    });
    if (out.ok) {
      await repo.storeResult(structureId, revision, out.result, out.outputs as Record<string, string>, timings(out.writeMs));
      await refresh(claimed.batchId);
      return { outcome: 'done', engineMs: out.engineMs };
    }
    if (out.code === 'internal') logger.error({ structureId, message: out.message }, 'engine failure on a structure');
    await repo.storeFailure(structureId, revision, out.message, timings(0));
    await refresh(claimed.batchId);
    throw new UnrecoverableError(out.message);
  };
}
