// The worker process: builds its dependencies, starts the queue processors and the heartbeat
// that /api/health reads, and on SIGTERM finishes (or releases) the job in hand before exiting.
import { Redis } from 'ioredis';
import { createDataSource } from '../server/db/data-source';
import { createLogger } from '../server/logger';
import { createMailer } from '../server/mail/mailer';
import { newWorkerId, startHeartbeat, type Heartbeat } from '../server/modules/health/heartbeat';
import { installShutdown } from '../server/ops/graceful-shutdown';
import { describeStartupError, loadConfigOrExit } from '../server/ops/startup-errors';
import { startProcessors } from './processors/index';

const SHUTDOWN_DEADLINE_MS = 10_000;

const config = loadConfigOrExit();
const logger = createLogger(config, 'worker');
const dataSource = createDataSource(config.DATABASE_URL);
const redis = new Redis(config.REDIS_URL, { lazyConnect: true, maxRetriesPerRequest: 2 });
redis.on('error', (err) => logger.warn({ err: err.message }, 'redis connection problem'));
const workerId = newWorkerId();

let processors: { close(): Promise<void> } | undefined;
let heartbeat: Heartbeat | undefined;
try {
  await dataSource.initialize();
  await redis.connect();
  processors = await startProcessors({ config, logger, dataSource, redis, mailer: createMailer(config) });
  // Beat only once the processors run: a live heartbeat promises that jobs get picked up.
  heartbeat = await startHeartbeat({
    redis,
    prefix: config.QUEUE_PREFIX,
    workerId,
    onError: (err) => logger.warn({ err: (err as Error).message }, 'heartbeat not written'),
  });
} catch (err) {
  logger.fatal(describeStartupError(err, config), 'the worker could not start');
  await Promise.allSettled([processors?.close(), dataSource.isInitialized ? dataSource.destroy() : undefined, redis.quit()]);
  process.exit(1);
}
logger.info({ workerId, prefix: config.QUEUE_PREFIX }, 'worker ready');

installShutdown({
  logger,
  deadlineMs: SHUTDOWN_DEADLINE_MS,
  announce: 'shutting down: finishing the job in hand',
  // BullMQ hands a job whose lock lapses back to the queue, so another worker picks it up.
  deadlineMessage: 'the job in hand did not finish before the deadline; exiting, it will be retried',
  async stop() {
    await heartbeat?.stop();
    await processors?.close();
    await Promise.allSettled([dataSource.destroy(), redis.quit()]);
  },
});
