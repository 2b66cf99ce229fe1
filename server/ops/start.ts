// `npm start`: brings the whole system up on this machine (see README.md) and keeps it running
// until Ctrl-C. Reached through bootstrap.mjs, which has installed the npm packages.
import { join } from 'node:path';
import { loadConfig } from '../config';
import { onStopSignals, reportError, say } from './cli-support';
import { acquireLock } from './lock';
import { resolveStackDirs } from './paths';
import { createStack, localServices, type StackOptions } from './stack';
import { ensureDebianPackages, ensurePostgresUser } from './system';
import { OpsError, portOf } from './util';
import { watchParent } from './parent-watch';

const env = { NODE_ENV: 'development', DEV_MAILBOX: 'true', ...process.env };
let stopStack: (() => Promise<void>) | undefined;
let releaseLock: (() => void) | undefined;
let exiting = false;

async function exit(code: number, why?: string) {
  if (exiting) return;
  exiting = true;
  if (why) say(why);
  try {
    await stopStack?.();
  } catch (err) {
    reportError(err);
    code = code || 1;
  }
  releaseLock?.();
  if (stopStack) say('stopped');
  process.exit(code);
}

onStopSignals(
  (signal) => void exit(0, `${signal === 'SIGINT' ? 'Ctrl-C' : signal}: stopping everything …`),
  () => {
    say('forced stop');
    releaseLock?.();
    process.exit(130);
  },
);
// bootstrap.mjs passes its own pid as PF_PARENT_PID's equivalent: if it dies, we stop.
watchParent(() => void exit(1, 'the launching process is gone: stopping everything …'), { PF_PARENT_PID: String(process.ppid) });
process.on('uncaughtException', (err) => {
  reportError(err);
  void exit(1);
});
process.on('unhandledRejection', (err) => {
  reportError(err);
  void exit(1);
});

async function main() {
  let config;
  try {
    config = loadConfig(env);
  } catch (err) {
    throw new OpsError((err as Error).message, 'fix the variable(s) named and start again');
  }
  const options = {
    databaseUrl: config.DATABASE_URL,
    redisUrl: config.REDIS_URL,
    external: config.PF_EXTERNAL_SERVICES,
  };
  const local = localServices(options);
  const packages = [...(local.postgres ? ['postgresql'] : []), ...(local.redis ? ['redis-server'] : [])];
  await ensureDebianPackages(packages, say);
  if (local.postgres) await ensurePostgresUser(say);
  const dirs = await resolveStackDirs('.data');
  const lock = await acquireLock(join(dirs.stateDir, 'start.lock'), 'npm start', say);
  releaseLock = lock.release;

  const stackOptions: StackOptions = {
    ...options,
    dirs,
    ports: {
      app: config.PORT,
      oauth: portOf(config.OAUTH_BASE_URL, 80),
      smtp: config.SMTP_PORT,
      mailbox: portOf(config.DEV_MAILBOX_URL, 80),
      postgres: portOf(config.DATABASE_URL, 5432),
      redis: portOf(config.REDIS_URL, 6379),
    },
    seed: true,
    build: true,
    throwaway: false,
    env: { NODE_ENV: config.NODE_ENV, DEV_MAILBOX: env.DEV_MAILBOX, QUEUE_PREFIX: config.QUEUE_PREFIX, LOG_LEVEL: config.LOG_LEVEL },
    output: 'console',
    log: say,
  };
  const stack = createStack(stackOptions);
  stopStack = stack.stop;
  const urls = await stack.start();
  lock.update(urls.app);

  process.stdout.write(
    [
      '',
      'Pointfold is running. Open:',
      '',
      urls.app,
      '',
      'Sign in with a demo account: press "Sign in with GitHub"; here that opens a local stand-in',
      'for GitHub\'s sign-in page, which lists the demo accounts. Pick one:',
      '  owner@example.org      owner of the demo workspace (manages members, invitations, defaults)',
      '  chemist@example.org    chemist (uploads batches, downloads results)',
      '  reviewer@example.org   reviewer (reads and signs off, cannot upload)',
      `Mail the app sends (invitations, batch notices): owners read it in the app; raw: ${urls.mailbox}/messages`,
      'Ctrl-C stops everything (app, worker, fakes, PostgreSQL, Redis).',
      '',
    ].join('\n') + '\n',
  );
  const crash = await stack.crashed;
  await exit(1, `${crash}; stopping everything …`);
}

main().catch((err) => {
  if (exiting) return;
  reportError(err);
  void exit(1);
});
