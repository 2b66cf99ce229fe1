import { performance } from 'node:perf_hooks';
import { UnrecoverableError, type Job } from 'bullmq';
import type { Logger } from '../../server/logger';
import type { StructureTimings } from '../../server/modules/batches/entity';
import type { BatchRepository } from '../../server/modules/batches/repository';
import type { SnapTaskInput, SnapTaskStorableOutput } from '../../server/modules/batches/snap-structure';
import type { BatchQueue, SnapJobData } from '../../server/queue/batch-queue';
import { ThreadLostError, type ThreadPool } from './thread-pool';

export interface SnapProcessorDeps {
  repo: BatchRepository;
  queue: BatchQueue;
  pool: ThreadPool<SnapTaskInput, SnapTaskStorableOutput>;
  logger: Logger;
}

/**
 * Refreshes a batch's counts after results land, at most once per `intervalMs` per batch, always
 * once more after the last result (trailing edge), so the final refresh — the one that finishes
 * the batch — sees every result. Jobs don't wait for it: a thousand results make a few dozen
 * refreshes instead of a thousand. A failed refresh (database away) is retried on the same
 * rhythm; if the process dies first, the sweeper finishes the batch.
 */
export function createBatchRefresher(refreshOnce: (batchId: string) => Promise<void>, options: { intervalMs: number; logger: Logger }) {
  const states = new Map<string, { running: Promise<void> | null; dirty: boolean; last: number; timer: NodeJS.Timeout | null }>();
  let closed = false;

  const run = async (batchId: string) => {
    const s = states.get(batchId)!;
    s.dirty = false;
    s.last = Date.now();
    s.running = refreshOnce(batchId).catch((err) => {
      s.dirty = true;
      options.logger.warn({ batchId, err: (err as Error).message }, 'batch refresh failed; retrying');
    });
    await s.running;
    s.running = null;
    if (s.dirty && !closed) schedule(batchId);
    else if (!s.dirty) states.delete(batchId);
  };

  const schedule = (batchId: string) => {
    let s = states.get(batchId);
    if (!s) {
      s = { running: null, dirty: false, last: 0, timer: null };
      states.set(batchId, s);
    }
    if (s.running || s.timer) {
      s.dirty = true;
      return;
    }
    const state = s;
    state.timer = setTimeout(() => {
      state.timer = null;
      void run(batchId);
    }, Math.max(0, state.last + options.intervalMs - Date.now()));
  };

  return {
    schedule,
    /** Runs every pending refresh now and waits for them (shutdown). */
    async flush() {
      closed = true;
      await Promise.all(
        [...states.entries()].map(async ([batchId, s]) => {
          if (s.timer) clearTimeout(s.timer);
          s.timer = null;
          await s.running;
          await refreshOnce(batchId).catch(() => undefined);
        }),
      );
      states.clear();
    },
  };
}

/** What a snap job returns (kept by BullMQ with the completed job): where its time went, ms. */
export interface SnapJobResult {
  outcome: string;
  ms?: { claim: number; poolWait: number; thread: number; store: number };
}

/**
 * The snap job: claim the structure (conditional update on its revision), run the engine in a
 * thread, store the result or the input's error. Safe to run twice: a second delivery finds the
 * structure no longer claimable and only refreshes the batch.
 *
 * Failure policy: bad input (an EngineError, or anything the engine throws — the same input fails
 * the same way) is stored as the structure's error and fails the job at once (UnrecoverableError).
 * The batch's counts are refreshed after the job, throttled (createBatchRefresher).
 * A lost database or Redis connection, or a crashed thread, throws and BullMQ retries with
 * back-off. A structure that runs out of memory or time is stored as an error too.
 */
export function createSnapProcessor(deps: SnapProcessorDeps, refreshIntervalMs = 300) {
  const { repo, queue, pool, logger } = deps;

  const refresher = createBatchRefresher(
    async (batchId) => {
      const state = await repo.refreshBatch(batchId);
      if (state?.needsNotice) await queue.enqueueNotify(batchId);
    },
    { intervalMs: refreshIntervalMs, logger },
  );
  const refresh = refresher.schedule;

  const processSnap = async function processSnap(job: Job<SnapJobData>): Promise<SnapJobResult> {
    const { structureId, revision } = job.data;
    const t0 = performance.now();
    const claimed = await repo.claimForSnap(structureId, revision);
    if (!claimed) {
      // Re-delivered after its result was stored, superseded by a re-snap, or cancelled. The
      // refresh may not have happened before the previous delivery died, so do it now.
      const state = await repo.structureState(structureId);
      if (state) refresh(state.batchId);
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

    let out: SnapTaskStorableOutput;
    const t1 = performance.now();
    try {
      out = await pool.run(task);
    } catch (e) {
      if (e instanceof ThreadLostError && e.reason !== 'crash') {
        await repo.storeFailure(structureId, revision, e.message, null);
        refresh(claimed.batchId);
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
      const t2 = performance.now();
      await repo.storeResult(structureId, revision, out, timings(out.writeMs));
      refresh(claimed.batchId);
      const threadMs = out.engineMs + out.writeMs;
      return { outcome: 'done', ms: { claim: claimMs, poolWait: Math.max(0, t2 - t1 - threadMs), thread: threadMs, store: performance.now() - t2 } };
    }
    if (out.code === 'internal') logger.error({ structureId, message: out.message }, 'engine failure on a structure');
    await repo.storeFailure(structureId, revision, out.message, timings(0));
    refresh(claimed.batchId);
    throw new UnrecoverableError(out.message);
  };
  return { process: processSnap, flush: refresher.flush };
}
