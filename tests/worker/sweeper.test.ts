import { Queue } from 'bullmq';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { BATCH_QUEUE_NAME } from '../../server/queue/batch-queue';
import { startProcessors } from '../../worker/processors/index';
import { buildTestApp, type TestApp } from '../support/app';
import { createTestDatabase, type TestDatabase } from '../support/db';
import { DEMO_FILES, member, upload, waitForBatch } from '../server/batches/support';

/*
 * Jobs lost from Redis (a Redis that restarted without persistence, or an upload whose enqueue
 * failed): the structures are safe in PostgreSQL, and the worker's sweeper queues them again, so
 * the batch still completes.
 */

let db: TestDatabase;
let t: TestApp;
let processors: { close(): Promise<void> } | undefined;

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await db?.drop();
});

it('re-queues the structures of a batch whose jobs vanished from Redis, and completes it', async () => {
  const chemist = await member(db.dataSource, 'chemist');
  const res = await upload(t, chemist, DEMO_FILES.filter((f) => f.name === 'complexes.sdf'));
  expect(res.status).toBe(201);
  const queue = new Queue(BATCH_QUEUE_NAME, { connection: t.deps.redis, prefix: t.deps.config.QUEUE_PREFIX });
  expect(await queue.getJobCountByTypes('waiting')).toBe(9);
  await queue.obliterate({ force: true });
  expect(await queue.getJobCountByTypes('waiting')).toBe(0);

  processors = await startProcessors(t.deps, { sweepIntervalMs: 500, staleMs: 500 });
  const batch = await waitForBatch(t, chemist, res.body.id, 90_000);
  expect(batch).toMatchObject({ status: 'done', counts: { total: 9, done: 9 } });
  await queue.close();
});
