import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { repoRoot, resolveStackDirs } from '../../server/ops/paths';
import { dropDatabase, withDatabase } from '../../server/ops/postgres';
import { startStack, testPorts } from '../../server/ops/stack';

declare module 'vitest' {
  export interface ProvidedContext {
    /** Base URL of the app under test, e.g. http://127.0.0.1:4480. */
    appUrl: string;
    /** The fake sign-in provider. */
    oauthUrl: string;
    /** The fake mail inbox's HTTP reader (GET/DELETE /messages). */
    mailboxUrl: string;
    /** Where screenshots go. */
    artifactsDir: string;
  }
}

/**
 * Starts the whole app for the browser tests through the same code as `npm start`
 * (server/ops/stack.ts): build if stale, migrate, seed the demo data, API, worker, fakes.
 *
 * Under `npm test` (DATABASE_URL/REDIS_URL point at the throwaway test services) it gets its own
 * fresh database on that server and its own queue prefix. Run alone without them
 * (`npx vitest run --project e2e`), it starts its own PostgreSQL and Redis under .test-data/e2e.
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const ports = testPorts();
  const suffix = randomBytes(3).toString('hex');
  const external = Boolean(process.env.DATABASE_URL && process.env.REDIS_URL);
  const databaseName = `pf_e2e_${suffix}`;
  const databaseUrl = external ? withDatabase(process.env.DATABASE_URL!, databaseName) : `postgres://postgres@127.0.0.1:${ports.postgres}/${databaseName}`;
  const redisUrl = external ? process.env.REDIS_URL! : `redis://127.0.0.1:${ports.redis}`;
  const dirs = await resolveStackDirs(join('.test-data', 'e2e'));
  const log = (line: string) => process.stdout.write(`[e2e stack] ${line}\n`);

  const stack = await startStack({
    dirs,
    ports,
    databaseUrl,
    redisUrl,
    external,
    seed: true,
    build: true,
    throwaway: true,
    env: { NODE_ENV: 'test', DEV_MAILBOX: 'true', QUEUE_PREFIX: `pf-e2e-${suffix}`, LOG_LEVEL: 'info' },
    output: 'files',
    log,
  });
  project.provide('appUrl', stack.urls.app);
  project.provide('oauthUrl', stack.urls.oauth);
  project.provide('mailboxUrl', stack.urls.mailbox);
  project.provide('artifactsDir', join(process.env.PF_TEST_DATA ?? join(repoRoot, '.test-data'), 'artifacts'));

  return async () => {
    await stack.stop();
    if (external) await dropDatabase(databaseUrl, databaseName).catch(() => undefined);
  };
}
