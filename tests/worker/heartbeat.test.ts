import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { heartbeatKey, liveWorkerCount, startHeartbeat } from '../../server/modules/health/heartbeat';

describe('worker heartbeat on the real Redis', () => {
  let redis: Redis;
  const prefix = `pf-hb-${process.pid}-${Date.now().toString(36)}`;
  beforeAll(() => {
    if (!process.env.REDIS_URL) throw new Error('REDIS_URL is not set: run through `npm test`, or export it');
    redis = new Redis(process.env.REDIS_URL);
  });
  afterAll(() => redis?.disconnect());

  it('writes a key with a TTL at once, counts it as a live worker, and deletes it on stop', async () => {
    const beat = await startHeartbeat({ redis, prefix, workerId: 'w1', everyMs: 50, ttlMs: 2000 });
    const ttl = await redis.pttl(heartbeatKey(prefix, 'w1'));
    expect(ttl).toBeGreaterThan(0);
    expect(ttl).toBeLessThanOrEqual(2000);
    expect(await liveWorkerCount(redis, prefix)).toBe(1);
    await beat.stop();
    expect(await redis.exists(heartbeatKey(prefix, 'w1'))).toBe(0);
    expect(await liveWorkerCount(redis, prefix)).toBe(0);
  });

  it('keeps refreshing the TTL while running, so the key outlives a single TTL', async () => {
    const beat = await startHeartbeat({ redis, prefix, workerId: 'w2', everyMs: 50, ttlMs: 300 });
    await new Promise((r) => setTimeout(r, 700));
    expect(await redis.exists(heartbeatKey(prefix, 'w2'))).toBe(1);
    await beat.stop();
  });

  it('lets the key expire by itself when the worker dies without stopping', async () => {
    await redis.set(heartbeatKey(prefix, 'dead'), 'x', 'PX', 150);
    expect(await liveWorkerCount(redis, prefix)).toBe(1);
    await new Promise((r) => setTimeout(r, 300));
    expect(await liveWorkerCount(redis, prefix)).toBe(0);
  });
});
