import type { Redis } from 'ioredis';
import type { DataSource } from 'typeorm';
import type { Config } from '../../server/config';
import type { Logger } from '../../server/logger';
import type { Mailer } from '../../server/mail/mailer';

/** What the worker process hands to the processors (worker/index.ts builds the real ones). */
export interface ProcessorDeps {
  config: Config;
  logger: Logger;
  dataSource: DataSource;
  /** Plain Redis commands; BullMQ workers open their own blocking connections. */
  redis: Redis;
  mailer: Mailer;
}

/**
 * Starts the BullMQ workers of the batch pipeline (snap jobs, batch-finished notices).
 * Interim: the processors land in the next commits; this fixes the signature that
 * worker/index.ts calls.
 */
export async function startProcessors(deps: ProcessorDeps): Promise<{ close(): Promise<void> }> {
  deps.logger.warn('batch processors are not wired yet');
  return { async close() {} };
}
