import { createDataSource } from './data-source';

/** Data source for the TypeORM CLI (`npm run migration:generate`, `migration:run`). */
export default createDataSource(process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:55432/pointfold');
