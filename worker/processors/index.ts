import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker, type Job } from 'bullmq';
import { Redis } from 'ioredis';
import type { DataSource } from 'typeorm';
import type { Config } from '../../server/config';
import type { Logger } from '../../server/logger';
import type { Mailer } from '../../server/mail/mailer';
import { createBatchRepository } from '../../server/modules/batches/repository';
import type { SnapTaskInput, SnapTaskStorableOutput } from '../../server/modules/batches/snap-structure';
import { BATCH_QUEUE_NAME, createBatchQueue, type NotifyJobData, type SnapJobData } from '../../server/queue/batch-queue';
import { createNotifyProcessor } from './notify';
import { createSnapProcessor } from './snap';
import { startSweeper } from './sweeper';
import { createThreadPool } from './thread-pool';

/** What the worker process hands to the processors (worker/index.ts builds the real ones). */
export interface ProcessorDeps {
  config: Config;
  logger: Logger;
  dataSource: DataSource;
  /** Plain Redis commands; BullMQ workers open their own blocking connections. */
  redis: Redis;
  mailer: Mailer;
}

/**
 * Jobs in hand per engine thread: while one structure is in the engine, the others are being
 * claimed or stored, so a thread never waits for the database.
 */
const JOBS_PER_THREAD = 4;

/** Knobs for tests and benchmarks; production uses the defaults. */
export interface ProcessorOptions {
  /** Engine threads (default WORKER_CONCURRENCY, else the number of cores). */
  threads?: number;
  /** BullMQ lock of an active job, ms (default 30 s): how soon a dead worker's job is taken over. */
  lockDuration?: number;
  /** How often stalled jobs are looked for, ms (default 30 s). */
  stalledInterval?: number;
  sweepIntervalMs?: number;
  staleMs?: number;
  /** A single structure taking longer is stored as an error (default 5 min). */
  engineTimeoutMs?: number;
}

/**
 * Starts the batch pipeline's BullMQ worker (snap and notify jobs), the engine thread pool and
 * the sweeper. Engine threads default to one per core (WORKER_CONCURRENCY overrides); BullMQ runs
 * JOBS_PER_THREAD jobs per thread at once so a thread always has the next structure ready while
 * earlier results are being stored. `close()` stops taking jobs, lets the ones in hand finish, then stops
 * the threads.
 */
export async function startProcessors(deps: ProcessorDeps, options: ProcessorOptions = {}): Promise<{ close(): Promise<void> }> {
  const { config, logger } = deps;
  const threads = options.threads ?? config.WORKER_CONCURRENCY ?? Math.max(1, availableParallelism());
  const repo = createBatchRepository(deps.dataSource);
  const queue = createBatchQueue({ connection: deps.redis, prefix: config.QUEUE_PREFIX });
  const pool = createThreadPool<SnapTaskInput, SnapTaskStorableOutput>({
    entry: new URL('./engine-thread.ts', import.meta.url),
    tsconfig: fileURLToPath(new URL('../../tsconfig.json', import.meta.url)),
    size: threads,
    timeoutMs: options.engineTimeoutMs ?? 5 * 60_000,
    maxHeapMb: 2048,
    logger,
  });
  const snap = createSnapProcessor({ repo, queue, pool, logger });
  const notify = createNotifyProcessor({ repo, mailer: deps.mailer, config, logger });

  // BullMQ needs its own connection with unlimited retries (it blocks on BRPOPLPUSH-style calls
  // and must ride out a Redis restart rather than give up).
  const connection = new Redis(config.REDIS_URL, { maxRetriesPerRequest: null, enableReadyCheck: false });
  connection.on('error', (err) => logger.warn({ err: err.message }, 'worker redis connection problem'));

  const worker = new Worker(
    BATCH_QUEUE_NAME,
    async (job: Job) => {
      if (job.name === 'snap') return snap.process(job as Job<SnapJobData>);
      if (job.name === 'notify') return notify(job as Job<NotifyJobData>);
      throw new Error(`Unknown job ${job.name}`);
    },
    {
      connection,
      prefix: config.QUEUE_PREFIX,
      concurrency: threads * JOBS_PER_THREAD,
      lockDuration: options.lockDuration ?? 30_000,
      stalledInterval: options.stalledInterval ?? 30_000,
      maxStalledCount: 3,
    },
  );
  worker.on('error', (err) => logger.warn({ err: err.message }, 'worker error'));
  worker.on('failed', (job, err) => {
    if (!job) return;
    const final = err.name === 'UnrecoverableError' || job.attemptsMade >= (job.opts.attempts ?? 1);
    if (final) {
      logger.info({ jobId: job.id, reason: err.message }, 'job failed');
      if (job.name === 'snap' && err.name !== 'UnrecoverableError') {
        // Retries exhausted on a transient fault: record it so the batch can finish (the sweeper
        // does the same later if the database is still away now).
        const data = job.data as SnapJobData;
        void repo
          .storeFailure(data.structureId, data.revision, `Could not be processed after ${job.attemptsMade} attempts: ${err.message}`, null)
          .then(async () => {
            const state = await repo.structureState(data.structureId);
            const batch = state ? await repo.refreshBatch(state.batchId) : null;
            if (state && batch?.needsNotice) await queue.enqueueNotify(state.batchId);
          })
          .catch(() => undefined);
      }
    } else {
      logger.warn({ jobId: job.id, attempt: job.attemptsMade, reason: err.message }, 'job failed; will retry');
    }
  });

  const sweeper = startSweeper({ repo, queue, logger }, { intervalMs: options.sweepIntervalMs ?? 30_000, staleMs: options.staleMs ?? 120_000 });
  await worker.waitUntilReady();
  logger.info({ threads, concurrency: threads * JOBS_PER_THREAD, prefix: config.QUEUE_PREFIX }, 'batch processors started');

  return {
    async close() {
      await sweeper.stop();
      await worker.close();
      await snap.flush();
      await pool.close();
      await queue.close();
      connection.disconnect();
    },
  };
}
