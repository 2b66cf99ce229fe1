import { loadConfig, type Config } from '../config';

/**
 * Turns the usual start-up failures of the API and the worker into one sentence with the fix,
 * instead of a stack trace: an unreachable database or Redis, a port in use.
 */
export function describeStartupError(err: unknown, config: Pick<Config, 'DATABASE_URL' | 'REDIS_URL' | 'HOST' | 'PORT'>): { problem: string; fix: string } {
  const e = err as NodeJS.ErrnoException & { address?: string; port?: number };
  const redacted = (url: string) => url.replace(/\/\/([^:@/]+):[^@/]+@/, '//$1:***@');
  const text = String(e?.message ?? err);
  if (e?.code === 'EADDRINUSE') {
    return { problem: `port ${config.PORT} on ${config.HOST} is already in use`, fix: 'stop whatever listens there or set PORT to another port' };
  }
  if (/ECONNREFUSED|ENOTFOUND|EAI_AGAIN|timeout/i.test(text) && text.includes(String(new URL(config.REDIS_URL).port || '6379'))) {
    return { problem: `cannot reach Redis at ${redacted(config.REDIS_URL)} (${text})`, fix: 'start Redis or correct REDIS_URL' };
  }
  if (/ECONNREFUSED|ENOTFOUND|EAI_AGAIN|timeout|database .* does not exist|password authentication/i.test(text)) {
    return { problem: `cannot reach PostgreSQL at ${redacted(config.DATABASE_URL)} (${text})`, fix: 'start PostgreSQL or correct DATABASE_URL' };
  }
  return { problem: text, fix: 'see the log above' };
}

/** Loads the configuration, or prints its one-line error and exits 1 (no stack trace). */
export function loadConfigOrExit(env: NodeJS.ProcessEnv = process.env): Config {
  try {
    return loadConfig(env);
  } catch (err) {
    console.error((err as Error).message);
    process.exit(1);
  }
}
