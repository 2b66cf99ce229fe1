import type { Logger } from '../../server/logger';
import type { BatchRepository } from '../../server/modules/batches/repository';
import { snapJobId, type BatchQueue } from '../../server/queue/batch-queue';

export interface SweeperOptions {
  /** How often to sweep, ms. */
  intervalMs: number;
  /** A pending structure untouched this long may have lost its job, ms. */
  staleMs: number;
}

/**
 * Repairs what a crash between two steps can leave behind; every step is idempotent, so any
 * number of workers may sweep at once:
 * - pending structures whose job is gone (Redis lost its data, the upload's enqueue failed) are
 *   queued again under the same deterministic id (a no-op while BullMQ still holds the job);
 *   those whose job failed for good (retries exhausted) are marked as errors;
 * - live batches with nothing pending are finished, and finished ones not yet announced get
 *   their notice queued.
 */
export function startSweeper(deps: { repo: BatchRepository; queue: BatchQueue; logger: Logger }, options: SweeperOptions) {
  const { repo, queue, logger } = deps;
  let running: Promise<void> | null = null;
  let stopped = false;

  async function sweep() {
    const stale = await repo.staleStructures(options.staleMs, 500);
    const missing: { structureId: string; revision: number }[] = [];
    for (const s of stale) {
      const job = { structureId: s.id, revision: s.revision };
      const state = await queue.queue.getJobState(snapJobId(job));
      if (state === 'unknown') missing.push(job);
      else if (state === 'failed') {
        const failed = await queue.queue.getJob(snapJobId(job));
        const reason = failed?.failedReason ?? 'unknown error';
        await repo.storeFailure(s.id, s.revision, `Could not be processed after ${failed?.attemptsMade ?? 'several'} attempts: ${reason}`, null);
      }
    }
    if (missing.length > 0) {
      logger.warn({ count: missing.length }, 'sweeper: re-queueing structures whose jobs were lost');
      await queue.enqueueSnaps(missing);
    }
    for (const batchId of await repo.batchesToReconcile()) {
      const state = await repo.refreshBatch(batchId);
      if (state?.needsNotice) await queue.enqueueNotify(batchId);
    }
  }

  const timer = setInterval(() => {
    if (running || stopped) return;
    running = sweep()
      .catch((err) => logger.warn({ err: (err as Error).message }, 'sweep failed; next time'))
      .finally(() => {
        running = null;
      });
  }, options.intervalMs);
  timer.unref();

  return {
    /** Runs one sweep now (tests, start-up). */
    async sweepNow() {
      await sweep();
    },
    async stop() {
      stopped = true;
      clearInterval(timer);
      await running;
    },
  };
}
