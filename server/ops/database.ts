import { createDataSource } from '../db/data-source';

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

    // Loaded only when seeding (they pull in the engine and the demo files).
    const { seedDemoWorkspace } = await import('../modules/workspaces/seed');
    const demo = await seedDemoWorkspace(dataSource);
    opts.log('seeded the demo workspace and its accounts');
    const { seedDemoBatch } = await import('../modules/batches/seed');
    await seedDemoBatch({ dataSource, workspaceId: demo.workspaceId, userId: demo.users.chemist });
    opts.log('seeded a finished demo batch');
    return { migrations: ran.map((m) => m.name), seeded: true };
  } finally {
    await dataSource.destroy();
  }
}
