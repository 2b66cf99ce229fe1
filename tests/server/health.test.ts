import { readFileSync } from 'node:fs';
import { Redis } from 'ioredis';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createLogger } from '../../server/logger';
import { createMailer } from '../../server/mail/mailer';
import { checkHealth } from '../../server/modules/health/router';
import { heartbeatKey } from '../../server/modules/health/heartbeat';
import { createTestDatabase, type TestDatabase } from '../support/db';

const version = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version;

describe('GET /api/health', () => {
  let db: TestDatabase;
  let redis: Redis;
  const prefix = `pf-health-${process.pid}-${Date.now().toString(36)}`;
  const config = loadConfig({ ...process.env, QUEUE_PREFIX: prefix, LOG_LEVEL: 'silent', WEB_DIST: '/nonexistent' });

  beforeAll(async () => {
    db = await createTestDatabase();
    redis = new Redis(process.env.REDIS_URL ?? '', { maxRetriesPerRequest: 1 });
  });
  afterAll(async () => {
    await redis?.del(heartbeatKey(prefix, 'test-worker'));
    redis?.disconnect();
    await db?.drop();
  });

  const app = () =>
    createApp({ config, logger: createLogger(config, 'test'), dataSource: db.dataSource, redis, mailer: createMailer(config) });

  it('reports the worker down (503, degraded) while no worker heartbeat exists', async () => {
    await redis.del(heartbeatKey(prefix, 'test-worker'));
    const res = await request(app()).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body).toEqual({ status: 'degraded', version, database: true, queue: true, worker: false });
  });

  it('reports everything up (200, ok) once a worker heartbeat key exists', async () => {
    await redis.set(heartbeatKey(prefix, 'test-worker'), 'now', 'PX', 10_000);
    const res = await request(app()).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', version, database: true, queue: true, worker: true });
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('does not count heartbeats of another queue prefix (another test run or deployment)', async () => {
    await redis.del(heartbeatKey(prefix, 'test-worker'));
    await redis.set(heartbeatKey(`${prefix}-other`, 'w'), 'now', 'PX', 10_000);
    const health = await checkHealth({ dataSource: db.dataSource, redis, config });
    expect(health.worker).toBe(false);
    await redis.del(heartbeatKey(`${prefix}-other`, 'w'));
  });

  it('reports the queue (and so the worker) down, quickly, when Redis does not answer', async () => {
    // A closed port: ioredis keeps retrying and would queue commands forever; health must not hang.
    const dead = new Redis({ host: '127.0.0.1', port: 1, lazyConnect: true, enableOfflineQueue: true, retryStrategy: () => 200 });
    dead.on('error', () => undefined);
    void dead.connect().catch(() => undefined);
    const started = Date.now();
    const health = await checkHealth({ dataSource: db.dataSource, redis: dead, config }, 500);
    dead.disconnect();
    expect(health).toMatchObject({ status: 'degraded', database: true, queue: false, worker: false });
    expect(Date.now() - started).toBeLessThan(3000);
  });

  it('reports the database down when its connection is gone', async () => {
    const other = await createTestDatabase();
    await other.dataSource.destroy();
    const health = await checkHealth({ dataSource: other.dataSource, redis, config });
    await other.drop();
    expect(health).toMatchObject({ status: 'degraded', database: false, queue: true });
  });
});
