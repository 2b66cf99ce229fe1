import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { entities } from './entities';
import { migrations } from './migrations';

/**
 * The one TypeORM DataSource factory. `synchronize` stays off: every schema change is a
 * migration listed in ./migrations/index.ts.
 */
export function createDataSource(databaseUrl: string): DataSource {
  return new DataSource({
    type: 'postgres',
    url: databaseUrl,
    entities,
    migrations,
    synchronize: false,
    migrationsRun: false,
    logging: ['error'],
    // keepAlive: a connection whose server vanished without closing it (a restart, a dropped
    // network) errors out instead of leaving a query waiting on it indefinitely.
    extra: { max: 10, connectionTimeoutMillis: 5000, keepAlive: true },
  });
}
