import { pino, type Logger } from 'pino';
import type { Config } from './config';

/** Structured JSON logs (pino). One root logger per process; children carry context. */
export function createLogger(config: Pick<Config, 'LOG_LEVEL'>, name: string): Logger {
  return pino({ name, level: config.LOG_LEVEL });
}
export type { Logger };
