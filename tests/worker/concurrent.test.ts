import { afterAll, beforeAll, expect, it } from 'vitest';
import { startProcessors } from '../../worker/processors/index';
import { buildTestApp, type TestApp } from '../support/app';
import { createTestDatabase, type TestDatabase } from '../support/db';
import { allRows, DEMO_FILES, get, member, upload, waitForBatch } from '../server/batches/support';

/*
 * Two users in two workspaces upload at the same moment, with one worker: both batches complete
 * and nothing is mixed — each batch holds exactly its own files' structures and results, each
 * submitter gets one notice about their own batch, and neither can see the other's batch.
 */

let db: TestDatabase;
let t: TestApp;
let processors: { close(): Promise<void> };

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  processors = await startProcessors(t.deps, { sweepIntervalMs: 1000 });
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await db?.drop();
});

it('runs two batches uploaded at once by two users to completion, each with its own structures', async () => {
  const alice = await member(db.dataSource, 'chemist');
  const bob = await member(db.dataSource, 'owner');
  const aliceFiles = DEMO_FILES.filter((f) => f.name === 'fragments.xyz' || f.name === 'clusters.qcschema.json');
  const bobFiles = DEMO_FILES.filter((f) => f.name === 'complexes.sdf' || f.name === 'ligands.xyz');
  const [a, b] = await Promise.all([
    upload(t, alice, aliceFiles, { name: 'Alice', settings: JSON.stringify({ tolerance: 0.1 }) }),
    upload(t, bob, bobFiles, { name: 'Bob', settings: JSON.stringify({ tolerance: 0.05, outputFormats: ['xyz'] }) }),
  ]);
  expect([a.status, b.status]).toEqual([201, 201]);
  const [doneA, doneB] = await Promise.all([waitForBatch(t, alice, a.body.id, 90_000), waitForBatch(t, bob, b.body.id, 90_000)]);
  expect(doneA).toMatchObject({ status: 'done', counts: { total: 16, done: 16, error: 0 } });
  expect(doneB).toMatchObject({ status: 'done', counts: { total: 21, done: 20, error: 1 } });

  const rowsA = await allRows(t, alice, a.body.id);
  const rowsB = await allRows(t, bob, b.body.id);
  expect(new Set(rowsA.map((r) => r.sourceFile))).toEqual(new Set(['fragments.xyz', 'clusters.qcschema.json']));
  expect(new Set(rowsB.map((r) => r.sourceFile))).toEqual(new Set(['complexes.sdf', 'ligands.xyz']));
  // Each structure's result belongs to its own input (same name, same settings as its batch).
  for (const [who, rows, tolerance] of [[alice, rowsA, 0.1], [bob, rowsB, 0.05]] as const) {
    for (const r of rows.filter((x) => x.status === 'done')) {
      const d = (await get(t, who, `/api/structures/${r.id}`)).body;
      expect(d.result.name).toBe(r.name);
      expect(d.result.tolerance).toBe(tolerance);
      expect(d.result.atoms).toHaveLength(d.inputAtoms.length);
      expect(d.result.atoms.map((x: { element: string }) => x.element)).toEqual(d.inputAtoms.map((x: { element: string }) => x.element));
    }
  }
  expect(t.mail.filter((m) => m.to === alice.user.email).map((m) => m.subject)).toEqual([expect.stringContaining('"Alice"')]);
  expect(t.mail.filter((m) => m.to === bob.user.email).map((m) => m.subject)).toEqual([expect.stringContaining('"Bob"')]);
  expect((await get(t, alice, `/api/batches/${b.body.id}`)).status).toBe(404);
  expect((await get(t, bob, `/api/batches/${a.body.id}`)).status).toBe(404);
});
