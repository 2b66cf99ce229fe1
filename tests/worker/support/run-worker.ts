// A worker process for the crash and restart tests: the real processors (worker/processors),
// with short locks and sweeps so that a killed worker's jobs are taken over within seconds.
// Configuration from the environment (DATABASE_URL, REDIS_URL, QUEUE_PREFIX); prints "ready".
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { loadConfig } from '../../../server/config';
import { createDataSource } from '../../../server/db/data-source';
import { startProcessors } from '../../../worker/processors/index';

const config = loadConfig({ ...process.env, LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn' });
const logger = pino({ level: config.LOG_LEVEL });
const dataSource = createDataSource(config.DATABASE_URL);
await dataSource.initialize();
const redis = new Redis(config.REDIS_URL, { maxRetriesPerRequest: 2 });
redis.on('error', () => undefined);
const processors = await startProcessors(
  { config, logger, dataSource, redis, mailer: { async send() {} } },
  { threads: Number(process.env.PF_TEST_THREADS ?? 1), lockDuration: 2000, stalledInterval: 1000, sweepIntervalMs: 1000, staleMs: 4000 },
);
process.stdout.write('ready\n');
process.on('SIGTERM', async () => {
  await processors.close();
  await dataSource.destroy();
  redis.disconnect();
  process.exit(0);
});
