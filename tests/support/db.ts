import { randomBytes } from 'node:crypto';
import pg from 'pg';
import type { DataSource } from 'typeorm';
import { createDataSource } from '../../server/db/data-source';

/** A throwaway database with every migration applied; `drop()` removes it. */
export interface TestDatabase {
  url: string;
  dataSource: DataSource;
  drop(): Promise<void>;
}

function adminUrl(): string {
  const base = process.env.DATABASE_URL;
  if (!base) throw new Error('DATABASE_URL is not set: run the tests through `npm test`, or export it');
  const url = new URL(base);
  url.pathname = '/postgres';
  return url.toString();
}

/**
 * Creates a fresh database on the server of DATABASE_URL (one per test file keeps files
 * independent), runs the migrations, and returns an initialised DataSource.
 */
export async function createTestDatabase(): Promise<TestDatabase> {
  const name = `pf_t_${Date.now().toString(36)}_${randomBytes(3).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl() });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE "${name}"`);
  } finally {
    await admin.end();
  }
  const url = new URL(process.env.DATABASE_URL!);
  url.pathname = `/${name}`;
  const dataSource = createDataSource(url.toString());
  await dataSource.initialize();
  await dataSource.runMigrations({ transaction: 'each' });
  return {
    url: url.toString(),
    dataSource,
    async drop() {
      if (dataSource.isInitialized) await dataSource.destroy();
      const c = new pg.Client({ connectionString: adminUrl() });
      await c.connect();
      try {
        await c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
      } finally {
        await c.end();
      }
    },
  };
}
