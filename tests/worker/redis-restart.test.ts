import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from '../support/app';
import { createTestDatabase, type TestDatabase } from '../support/db';
import { member, upload, waitForBatch } from '../server/batches/support';
import { fragmentCopies, freePort, startWorkerProcess, states, stop, until } from './support/harness';

/*
 * Redis restarted in the middle of a batch: the API's and the worker's connections reconnect,
 * the jobs in flight are re-delivered (their results already stored are skipped), and the batch
 * completes. The test runs its own throwaway redis-server (append-only file, fsync always, as a
 * queue's Redis should be configured) so the shared one is never touched.
 */

let db: TestDatabase;
let t: TestApp | undefined;
let redis: ChildProcess | undefined;
let worker: ChildProcess | undefined;
let dir: string;
let port: number;

async function startRedis(): Promise<ChildProcess> {
  const child = spawn('redis-server', ['--port', String(port), '--bind', '127.0.0.1', '--dir', dir, '--appendonly', 'yes', '--appendfsync', 'always', '--save', ''], {
    stdio: 'ignore',
  });
  const { Redis } = await import('ioredis');
  await until('redis up', async () => {
    const probe = new Redis(port, '127.0.0.1', { lazyConnect: true, maxRetriesPerRequest: 0, retryStrategy: () => null });
    probe.on('error', () => undefined);
    try {
      await probe.connect();
      return (await probe.ping()) === 'PONG';
    } finally {
      probe.disconnect();
    }
  });
  return child;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'pf-batches-redis-'));
  port = await freePort();
  redis = await startRedis();
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource, env: { REDIS_URL: `redis://127.0.0.1:${port}` } });
});

afterAll(async () => {
  await stop(worker, 'SIGKILL');
  await t?.close();
  await stop(redis);
  await db?.drop();
  rmSync(dir, { recursive: true, force: true });
});

it('completes a batch across a Redis restart', async () => {
  const chemist = await member(db.dataSource, 'chemist');
  const res = await upload(t!, chemist, fragmentCopies(6), { settings: JSON.stringify({ tolerance: 0.1 }) });
  expect(res.status).toBe(201);
  const id: string = res.body.id;
  const total = 6 * 15;
  worker = await startWorkerProcess({ DATABASE_URL: db.url, REDIS_URL: `redis://127.0.0.1:${port}`, QUEUE_PREFIX: t!.deps.config.QUEUE_PREFIX });

  await until('some results', async () => ((await states(db.dataSource, id)).done ?? 0) >= 10);
  await stop(redis, 'SIGKILL');
  const during = await states(db.dataSource, id);
  expect(during.done ?? 0).toBeLessThan(total);
  await new Promise((r) => setTimeout(r, 1500)); // down for a while, with the worker mid-batch
  redis = await startRedis();

  const batch = await waitForBatch(t!, chemist, id, 120_000);
  expect(batch.status).toBe('done');
  expect(batch.counts).toMatchObject({ total, done: total, error: 0 });
  expect(await states(db.dataSource, id)).toEqual({ done: total });
});
