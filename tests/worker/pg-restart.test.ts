import { execFileSync, type ChildProcess } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import pg from 'pg';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { createDataSource } from '../../server/db/data-source';
import { buildTestApp, type TestApp } from '../support/app';
import { member, upload, waitForBatch } from '../server/batches/support';
import { fragmentCopies, freePort, startWorkerProcess, states, stop, until, workerLogTail } from './support/harness';

/*
 * PostgreSQL restarted in the middle of a batch: statements that fail while it is away throw,
 * BullMQ retries those jobs with back-off, the pools reconnect, and the batch completes with one
 * result per structure. The test runs a private throwaway cluster (initdb as the postgres user in
 * /var/tmp, which that user can reach) so the shared server is never restarted.
 */

const PG_BIN = '/usr/lib/postgresql/15/bin';
const canRun = existsSync(join(PG_BIN, 'initdb')) && process.getuid?.() === 0;

let dir: string;
let port: number;
let ds: DataSource | undefined;
let t: TestApp | undefined;
let worker: ChildProcess | undefined;

const asPostgres = (cmd: string, args: string[]) => execFileSync('runuser', ['-u', 'postgres', '--', join(PG_BIN, cmd), ...args], { stdio: 'pipe' });
const pgCtl = (...args: string[]) => asPostgres('pg_ctl', ['-D', join(dir, 'data'), '-l', join(dir, 'log'), '-w', ...args]);

beforeAll(async () => {
  if (!canRun) {
    console.warn(`pg-restart test skipped: it needs root and ${PG_BIN}/initdb to run a private PostgreSQL cluster`);
    return;
  }
  dir = mkdtempSync('/var/tmp/pf-batches-pg-');
  chownSync(dir, Number(execFileSync('id', ['-u', 'postgres']).toString()), Number(execFileSync('id', ['-g', 'postgres']).toString()));
  port = await freePort();
  asPostgres('initdb', ['-D', join(dir, 'data'), '-A', 'trust', '-U', 'postgres', '--no-sync']);
  pgCtl('-o', `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off`, 'start');
  const admin = new pg.Client({ connectionString: `postgres://postgres@127.0.0.1:${port}/postgres` });
  await admin.connect();
  await admin.query('CREATE DATABASE pf_restart');
  await admin.end();
  ds = createDataSource(`postgres://postgres@127.0.0.1:${port}/pf_restart`);
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  t = await buildTestApp({ dataSource: ds });
}, 120_000);

afterAll(async () => {
  await stop(worker, 'SIGKILL');
  await t?.close();
  if (ds?.isInitialized) await ds.destroy();
  if (dir) {
    try {
      pgCtl('-m', 'immediate', 'stop');
    } catch {
      /* already down */
    }
    rmSync(dir, { recursive: true, force: true });
  }
});

it.skipIf(!canRun)('completes a batch across a PostgreSQL restart', async () => {
  const chemist = await member(ds!, 'chemist');
  const res = await upload(t!, chemist, fragmentCopies(6), { settings: JSON.stringify({ tolerance: 0.1 }) });
  expect(res.status).toBe(201);
  const id: string = res.body.id;
  const total = 6 * 15;
  worker = await startWorkerProcess({
    DATABASE_URL: `postgres://postgres@127.0.0.1:${port}/pf_restart`,
    REDIS_URL: t!.deps.config.REDIS_URL,
    QUEUE_PREFIX: t!.deps.config.QUEUE_PREFIX,
  });

  await until('some results', async () => ((await states(ds!, id)).done ?? 0) >= 10);
  const before = await states(ds!, id);
  pgCtl('-m', 'fast', 'stop');
  expect(before.done ?? 0, 'stopped before the end').toBeLessThan(total);
  await new Promise((r) => setTimeout(r, 2000)); // away for a while, with the worker mid-batch
  pgCtl('-o', `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off`, 'start');

  const batch = await waitForBatch(t!, chemist, id, 150_000).catch(async (e: Error) => {
    // Say where the structures are and what the worker last said: a stall here is rare and
    // otherwise leaves nothing to go on.
    throw new Error(`${e.message}\nstructures by state: ${JSON.stringify(await states(ds!, id))}\nworker log tail:\n${workerLogTail(worker)}`);
  });
  expect(batch.status).toBe('done');
  expect(batch.counts).toMatchObject({ total, done: total, error: 0 });
  const rows = await ds!.query(`SELECT count(*)::int AS n, count(result)::int AS with_result FROM structures WHERE batch_id = $1`, [id]);
  expect(rows[0]).toEqual({ n: total, with_result: total });
}, 200_000);
