import { readFileSync } from 'node:fs';
import { Router } from 'express';
import type * as z from 'zod';
import type { healthSchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { liveWorkerCount } from './heartbeat';

type Health = z.infer<typeof healthSchema>;

const packageJson = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as { version: string };

/** Resolves to the check's answer, or false when it throws or takes longer than `ms` (a hung connection). */
async function within(ms: number, check: () => Promise<boolean>): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<boolean>((resolve) => {
    timer = setTimeout(() => resolve(false), ms);
  });
  try {
    return await Promise.race([check().catch(() => false), late]);
  } finally {
    clearTimeout(timer);
  }
}

/** Reads the state of the app's dependencies; each check is bounded so health answers quickly even when one hangs. */
export async function checkHealth(deps: Pick<AppDeps, 'dataSource' | 'redis' | 'config'>, timeoutMs = 2000): Promise<Health> {
  const [database, queue] = await Promise.all([
    within(timeoutMs, async () => {
      if (!deps.dataSource.isInitialized) return false;
      await deps.dataSource.query('SELECT 1');
      return true;
    }),
    within(timeoutMs, async () => (await deps.redis.ping()) === 'PONG'),
  ]);
  const worker = queue && (await within(timeoutMs, async () => (await liveWorkerCount(deps.redis, deps.config.QUEUE_PREFIX)) > 0));
  return { status: database && queue && worker ? 'ok' : 'degraded', version: packageJson.version, database, queue, worker };
}

/**
 * `GET /api/health` (public): the app version and whether PostgreSQL, Redis and at least one
 * worker are reachable. 200 when all are, 503 otherwise, so a load balancer or script can act on
 * the status alone.
 */
export function createHealthRouter(deps: Pick<AppDeps, 'dataSource' | 'redis' | 'config'>): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    const health = await checkHealth(deps);
    res.status(health.status === 'ok' ? 200 : 503).set('cache-control', 'no-store').json(health);
  });
  return router;
}
