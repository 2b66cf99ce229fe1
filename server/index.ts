// The API process: builds its dependencies, listens, and shuts down gracefully on SIGTERM/SIGINT.
import type { Server } from 'node:http';
import { Redis } from 'ioredis';
import { createApp } from './app';
import { createDataSource } from './db/data-source';
import { createLogger } from './logger';
import { createMailer } from './mail/mailer';
import { installShutdown } from './ops/graceful-shutdown';
import { describeStartupError, loadConfigOrExit } from './ops/startup-errors';

const SHUTDOWN_DEADLINE_MS = 10_000;

const config = loadConfigOrExit();
const logger = createLogger(config, 'api');

const dataSource = createDataSource(config.DATABASE_URL);
const redis = new Redis(config.REDIS_URL, { lazyConnect: true, maxRetriesPerRequest: 2 });
redis.on('error', (err) => logger.warn({ err: err.message }, 'redis connection problem'));

let server: Server | undefined;
try {
  await dataSource.initialize();
  await redis.connect();
  const app = createApp({ config, logger, dataSource, redis, mailer: createMailer(config) });
  server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(config.PORT, config.HOST, () => resolve(s));
    s.once('error', reject);
  });
} catch (err) {
  logger.fatal(describeStartupError(err, config), 'the API could not start');
  await Promise.allSettled([dataSource.isInitialized ? dataSource.destroy() : undefined, redis.quit()]);
  process.exit(1);
}
logger.info({ url: `http://${config.HOST}:${config.PORT}` }, 'API listening');

installShutdown({
  logger,
  deadlineMs: SHUTDOWN_DEADLINE_MS,
  announce: 'shutting down',
  deadlineMessage: 'requests still open after the deadline; exiting anyway',
  async stop() {
    // Stop accepting, let requests in flight finish, drop idle keep-alive sockets.
    await new Promise<void>((resolve) => {
      server?.close(() => resolve());
      server?.closeIdleConnections();
    });
    await Promise.allSettled([dataSource.destroy(), redis.quit()]);
  },
});
