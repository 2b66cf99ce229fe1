import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, type TestDatabase } from '../support/db';

describe('throwaway test databases', () => {
  let db: TestDatabase;
  beforeAll(async () => {
    db = await createTestDatabase();
  });
  afterAll(async () => {
    await db.drop();
  });

  it('applies every migration, so the identity tables exist', async () => {
    const rows: { table_name: string }[] = await db.dataSource.query(
      `SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY table_name`,
    );
    expect(rows.map((r) => r.table_name)).toEqual(
      expect.arrayContaining(['api_tokens', 'memberships', 'migrations', 'users', 'workspaces']),
    );
  });
});
