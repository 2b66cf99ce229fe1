import { Queue, type JobsOptions } from 'bullmq';
import type { Redis } from 'ioredis';

/** One BullMQ queue carries the batch pipeline: `snap` jobs (one per structure) and `notify` jobs. */
export const BATCH_QUEUE_NAME = 'batches';

/** A snap job names a structure and the revision it must compute; the input is read from PostgreSQL. */
export interface SnapJobData {
  structureId: string;
  revision: number;
}

/** Sends the batch-finished notice. */
export interface NotifyJobData {
  batchId: string;
}

/**
 * Deterministic job ids: re-adding the same (structure, revision) is a no-op while BullMQ still
 * holds the job, and a re-delivered or re-added job finds its result already stored and skips.
 * (BullMQ refuses ':' in custom ids, hence '-r'.)
 */
export const snapJobId = (job: SnapJobData): string => `${job.structureId}-r${job.revision}`;
export const notifyJobId = (batchId: string): string => `notify-${batchId}`;

/**
 * Retries for transient faults (database or Redis away, a thread lost): exponential back-off
 * from 1 s, about 4 minutes in all, so a restarted service has time to come back. Bad input is
 * failed at once by the processor (UnrecoverableError) and never retried.
 */
export const defaultJobOptions: JobsOptions = {
  attempts: 9,
  backoff: { type: 'exponential', delay: 1000, jitter: 0.3 },
  removeOnComplete: { age: 24 * 3600, count: 50_000 },
  removeOnFail: { age: 7 * 24 * 3600 },
};

/** The producer side, used by the API (and by the worker's sweeper to re-add lost jobs). */
export interface BatchQueue {
  enqueueSnaps(jobs: readonly SnapJobData[]): Promise<void>;
  /** Best effort: drops waiting jobs (a cancelled batch); running ones are skipped by the processor. */
  removeSnaps(jobs: readonly SnapJobData[]): Promise<void>;
  enqueueNotify(batchId: string): Promise<void>;
  /** True when Redis answers (health). */
  ping(): Promise<boolean>;
  close(): Promise<void>;
  readonly queue: Queue;
}

const CHUNK = 1000;

/**
 * Builds the producer on an existing ioredis connection (the app's `deps.redis`): a Queue issues
 * no blocking commands, so sharing is safe, and the connection's owner closes it.
 */
export function createBatchQueue(options: { connection: Redis; prefix: string }): BatchQueue {
  const queue = new Queue(BATCH_QUEUE_NAME, {
    connection: options.connection,
    prefix: options.prefix,
    defaultJobOptions,
  });
  // Errors surface on the calls; without a listener an 'error' event would crash the process.
  queue.on('error', () => undefined);
  return {
    queue,
    async enqueueSnaps(jobs) {
      for (let i = 0; i < jobs.length; i += CHUNK) {
        await queue.addBulk(
          jobs.slice(i, i + CHUNK).map((data) => ({ name: 'snap', data, opts: { jobId: snapJobId(data) } })),
        );
      }
    },
    async removeSnaps(jobs) {
      for (let i = 0; i < jobs.length; i += 200) {
        await Promise.all(jobs.slice(i, i + 200).map((j) => queue.remove(snapJobId(j)).catch(() => 0)));
      }
    },
    async enqueueNotify(batchId) {
      await queue.add('notify', { batchId } satisfies NotifyJobData, { jobId: notifyJobId(batchId) });
    },
    async ping() {
      try {
        return (await options.connection.ping()) === 'PONG';
      } catch {
        return false;
      }
    },
    async close() {
      await queue.close();
    },
  };
}
