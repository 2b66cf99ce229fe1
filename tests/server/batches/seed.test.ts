import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_BATCH_NAME, seedDemoBatch } from '../../../server/modules/batches/seed';
import { seedDemoWorkspace } from '../../../server/modules/workspaces/seed';
import { createTestDatabase, type TestDatabase } from '../../support/db';

let db: TestDatabase;
beforeAll(async () => {
  db = await createTestDatabase();
});
afterAll(async () => {
  await db?.drop();
});

it('seeds one finished demo batch from examples/demo, once', async () => {
  const demo = await seedDemoWorkspace(db.dataSource);
  await seedDemoBatch({ dataSource: db.dataSource, workspaceId: demo.workspaceId, userId: demo.users.chemist });
  await seedDemoBatch({ dataSource: db.dataSource, workspaceId: demo.workspaceId, userId: demo.users.chemist });
  const batches = await db.dataSource.query(`SELECT * FROM batches WHERE workspace_id = $1`, [demo.workspaceId]);
  expect(batches).toHaveLength(1);
  const b = batches[0];
  expect(b).toMatchObject({ name: DEMO_BATCH_NAME, status: 'done', submitter_id: demo.users.chemist, total: 37, done_count: 36, error_count: 1, over_budget_count: 1, knife_edge_count: 2 });
  expect(b.notified_at).not.toBeNull();
  expect(b.settings.tolerance).toBe(0.1);
  const outputs = await db.dataSource.query(
    `SELECT count(*)::int AS n FROM structures WHERE batch_id = $1 AND outputs ?& array['xyz', 'qcschema', 'mol']`,
    [b.id],
  );
  expect(outputs[0].n).toBe(36);
}, 120_000);
