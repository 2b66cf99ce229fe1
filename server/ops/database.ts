import type { DataSource } from 'typeorm';
import { createDataSource } from '../db/data-source';
import { importOptional } from './optional-import';

type SeedWorkspace = (dataSource: DataSource) => Promise<{ workspaceId: string; users: Record<'owner' | 'chemist' | 'reviewer', string> }>;
type SeedBatch = (deps: { dataSource: DataSource; workspaceId: string; userId: string }) => Promise<void>;

export interface PrepareResult {
  migrations: string[];
  seeded: boolean;
}

/**
 * Runs every pending TypeORM migration (never `synchronize`) and, when `seed` is set and the
 * database has no users yet, seeds the demo workspace with its accounts and one finished batch.
 */
export async function migrateAndSeed(opts: { databaseUrl: string; seed: boolean; log: (line: string) => void }): Promise<PrepareResult> {
  const dataSource = createDataSource(opts.databaseUrl);
  await dataSource.initialize();
  try {
    const ran = await dataSource.runMigrations({ transaction: 'each' });
    if (ran.length > 0) opts.log(`applied ${ran.length} migration(s): ${ran.map((m) => m.name).join(', ')}`);
    if (!opts.seed) return { migrations: ran.map((m) => m.name), seeded: false };
    const [{ count }] = (await dataSource.query('SELECT count(*)::int AS count FROM users')) as { count: number }[];
    if (count > 0) return { migrations: ran.map((m) => m.name), seeded: false };

    const warn = (line: string) => opts.log(`warning: ${line}`);
    const seedDemoWorkspace = await importOptional<SeedWorkspace>(new URL('../modules/workspaces/seed.ts', import.meta.url), 'seedDemoWorkspace', warn);
    if (!seedDemoWorkspace) return { migrations: ran.map((m) => m.name), seeded: false };
    const demo = await seedDemoWorkspace(dataSource);
    opts.log('seeded the demo workspace and its accounts');
    const seedDemoBatch = await importOptional<SeedBatch>(new URL('../modules/batches/seed.ts', import.meta.url), 'seedDemoBatch', warn);
    if (seedDemoBatch) {
      await seedDemoBatch({ dataSource, workspaceId: demo.workspaceId, userId: demo.users.chemist });
      opts.log('seeded a finished demo batch');
    }
    return { migrations: ran.map((m) => m.name), seeded: true };
  } finally {
    await dataSource.destroy();
  }
}
