import { hostname } from 'node:os';
import type { Redis } from 'ioredis';

/**
 * Worker liveness through Redis: every worker process refreshes its own key with a TTL; the key
 * expires by itself when the worker dies, so "some key exists" means "some worker is alive".
 * Keys live under the queue prefix, so test runs sharing one Redis don't see each other's workers.
 */
export const HEARTBEAT_EVERY_MS = 5_000;
export const HEARTBEAT_TTL_MS = 15_000;

export function heartbeatKey(prefix: string, workerId: string): string {
  return `${prefix}:heartbeat:worker:${workerId}`;
}

/** An id that names the machine and process, readable in `redis-cli keys`. */
export function newWorkerId(): string {
  return `${hostname()}:${process.pid}`;
}

/** Number of workers whose heartbeat key has not expired. */
export async function liveWorkerCount(redis: Redis, prefix: string): Promise<number> {
  let cursor = '0';
  let count = 0;
  do {
    const [next, keys] = await redis.scan(cursor, 'MATCH', heartbeatKey(prefix, '*'), 'COUNT', 200);
    cursor = next;
    count += keys.length;
  } while (cursor !== '0');
  return count;
}

export interface Heartbeat {
  /** Stops beating and deletes the key, so health reports the worker gone at once. */
  stop(): Promise<void>;
}

/** Writes the heartbeat now and every `everyMs`; a failed write is reported and retried next beat. */
export async function startHeartbeat(opts: {
  redis: Redis;
  prefix: string;
  workerId: string;
  everyMs?: number;
  ttlMs?: number;
  onError?: (err: unknown) => void;
}): Promise<Heartbeat> {
  const key = heartbeatKey(opts.prefix, opts.workerId);
  const ttl = opts.ttlMs ?? HEARTBEAT_TTL_MS;
  const beat = () => opts.redis.set(key, new Date().toISOString(), 'PX', ttl);
  await beat();
  const timer = setInterval(() => {
    beat().catch((err) => opts.onError?.(err));
  }, opts.everyMs ?? HEARTBEAT_EVERY_MS);
  timer.unref();
  return {
    async stop() {
      clearInterval(timer);
      await opts.redis.del(key).catch(() => undefined);
    },
  };
}
