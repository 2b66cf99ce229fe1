import { createHash } from 'node:crypto';
import { existsSync, rmSync } from 'node:fs';
import { join, relative } from 'node:path';
import { buildNeeded, buildWeb } from './build';
import { migrateAndSeed } from './database';
import { repoRoot, type StackDirs } from './paths';
import { assertPortsFree, isPortOpen } from './ports';
import { ensureDatabase, ensurePostgres, type RunningPostgres } from './postgres';
import { killRecordedChildren, lastWords, spawnManaged, writeChildRecords, type ManagedProcess } from './processes';
import { ensureRedis, type RunningRedis } from './redis';
import { OpsError, isLoopbackHost, portOf, waitFor } from './util';

/** The ports one stack listens on (all on 127.0.0.1). */
export interface StackPorts {
  app: number;
  oauth: number;
  smtp: number;
  mailbox: number;
  postgres: number;
  redis: number;
}

/** `npm start` (docs/system plan). */
export const START_PORTS: StackPorts = { app: 4380, oauth: 4381, smtp: 4325, mailbox: 4326, postgres: 4332, redis: 4379 };
/** `npm test`: separate, so tests can run while `npm start` serves. */
export const TEST_PORTS: StackPorts = { app: 4480, oauth: 4481, smtp: 4425, mailbox: 4426, postgres: 4442, redis: 4479 };

/** The test ports, all shifted by PF_TEST_PORT_BASE − 4400 (two test runs on one machine). */
export function testPorts(env: NodeJS.ProcessEnv = process.env): StackPorts {
  const base = env.PF_TEST_PORT_BASE ? Number(env.PF_TEST_PORT_BASE) : 4400;
  if (!Number.isInteger(base) || base < 1024 || base > 65_000) {
    throw new OpsError(`PF_TEST_PORT_BASE=${env.PF_TEST_PORT_BASE} is not a usable port base`, 'use a whole number between 1024 and 65000, e.g. 5400');
  }
  const shift = base - 4400;
  return Object.fromEntries(Object.entries(TEST_PORTS).map(([k, v]) => [k, v + shift])) as unknown as StackPorts;
}

export interface StackOptions {
  dirs: StackDirs;
  ports: StackPorts;
  /** Full URLs (with the database name). When their host is loopback and `external` is false, we run the servers. */
  databaseUrl: string;
  redisUrl: string;
  /** Use databaseUrl/redisUrl as they are; start neither PostgreSQL nor Redis. */
  external: boolean;
  /** Seed the demo workspace, accounts and batch into an empty database. */
  seed: boolean;
  /** Run `vite build` when dist is missing or older than its sources. */
  build: boolean;
  /** Throwaway data: no fsync, no queue persistence. */
  throwaway: boolean;
  /** Extra environment for the API, worker and fakes (NODE_ENV, QUEUE_PREFIX, LOG_LEVEL, …). */
  env: NodeJS.ProcessEnv;
  /** Child output always goes to stateDir/logs/<name>.log; 'console' also prints it, prefixed. */
  output: 'console' | 'files';
  log: (line: string) => void;
}

export interface StackUrls {
  app: string;
  oauth: string;
  mailbox: string;
  database: string;
  redis: string;
}

export interface Stack {
  /** Brings everything up; resolves once /api/health reports database, queue and worker up. */
  start(): Promise<StackUrls>;
  /** Stops what this stack started or took over, in reverse order. Safe to call at any time, repeatedly. */
  stop(): Promise<void>;
  /** Resolves with a message when a child process dies on its own after start. */
  crashed: Promise<string>;
}

/** The local services a stack would start: the ones on loopback, unless told they are external. */
export function localServices(opts: Pick<StackOptions, 'databaseUrl' | 'redisUrl' | 'external'>) {
  return {
    postgres: !opts.external && isLoopbackHost(new URL(opts.databaseUrl).hostname),
    redis: !opts.external && isLoopbackHost(new URL(opts.redisUrl).hostname),
  };
}

/** Unix socket paths are limited to ~107 bytes; a deep clone falls back to a short /tmp path. */
function socketDir(serviceDir: string, port: number): string {
  const preferred = join(serviceDir, 'run');
  if (`${preferred}/.s.PGSQL.${port}`.length <= 100) return preferred;
  return join('/tmp', `pointfold-${createHash('sha256').update(serviceDir).digest('hex').slice(0, 12)}`);
}

/** Creates a stack; nothing runs until `start()`. */
export function createStack(opts: StackOptions): Stack {
  const local = localServices(opts);
  const recordFile = join(opts.dirs.stateDir, 'run', 'children.json');
  let postgres: RunningPostgres | undefined;
  let redis: RunningRedis | undefined;
  const children: ManagedProcess[] = [];
  let stopping: Promise<void> | undefined;
  let reportCrash: (message: string) => void = () => {};
  const crashed = new Promise<string>((resolve) => {
    reportCrash = resolve;
  });

  const checkpoint = () => {
    if (stopping) throw new OpsError('start-up interrupted');
  };

  const childEnv = (): NodeJS.ProcessEnv => ({
    ...process.env,
    ...opts.env,
    HOST: '127.0.0.1',
    PORT: String(opts.ports.app),
    DATABASE_URL: opts.databaseUrl,
    REDIS_URL: opts.redisUrl,
    OAUTH_BASE_URL: `http://127.0.0.1:${opts.ports.oauth}`,
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(opts.ports.smtp),
    DEV_MAILBOX_URL: `http://127.0.0.1:${opts.ports.mailbox}`,
    WEB_DIST: join(repoRoot, 'dist', 'web'),
  });

  const spawnChild = (name: string, script: string) => {
    const child = spawnManaged({
      name,
      script,
      cwd: repoRoot,
      env: childEnv(),
      logFile: join(opts.dirs.stateDir, 'logs', `${name}.log`),
      echo: opts.output === 'console',
    });
    children.push(child);
    writeChildRecords(recordFile, children.map((c) => ({ name: c.name, pid: c.pid, marker: c.script })));
    void child.exited.then(({ code, signal }) => {
      if (!stopping) reportCrash(`the ${name} process exited on its own (${signal ?? `code ${code}`}): ${lastWords(child.tail())}`);
    });
    return child;
  };

  /** Waits for a child to listen on a port, failing fast (with its last words) if it dies first. */
  const waitListening = async (child: ManagedProcess, port: number, timeoutMs: number) => {
    let dead = false;
    void child.exited.then(() => {
      dead = true;
    });
    const ok = await waitFor(async () => dead || Boolean(stopping) || (await isPortOpen(port)), timeoutMs, 200);
    checkpoint();
    if (dead || !ok) {
      throw new OpsError(`the ${child.name} process did not come up on port ${port}: ${lastWords(child.tail())}`, logHint(child.name));
    }
  };

  const logHint = (name: string) => `its log is ${relative(process.cwd(), join(opts.dirs.stateDir, 'logs', `${name}.log`))}`;

  async function start(): Promise<StackUrls> {
    const appPorts = [
      { port: opts.ports.app, what: 'the app', variable: 'PORT' },
      { port: opts.ports.oauth, what: 'the fake sign-in provider', variable: 'OAUTH_BASE_URL' },
      { port: opts.ports.smtp, what: 'the fake mail server', variable: 'SMTP_PORT' },
      { port: opts.ports.mailbox, what: 'the fake mailbox reader', variable: 'DEV_MAILBOX_URL' },
    ];
    // Leftovers of a run that was killed outright (its children noticed and should be gone,
    // but a stuck one would hold the ports).
    const killed = await killRecordedChildren(recordFile);
    if (killed.length > 0) opts.log(`stopped leftover processes of an earlier run: ${killed.join(', ')}`);
    await assertPortsFree(appPorts);

    if (local.postgres) {
      if (opts.dirs.relocated) opts.log(`the postgres user cannot reach the repository folder, so the database lives in ${opts.dirs.serviceDir}`);
      postgres = await ensurePostgres({
        dataDir: join(opts.dirs.serviceDir, 'pg'),
        runDir: socketDir(opts.dirs.serviceDir, opts.ports.postgres),
        port: portOf(opts.databaseUrl, 5432),
        fsync: !opts.throwaway,
        log: opts.log,
      });
    }
    checkpoint();
    const databaseName = new URL(opts.databaseUrl).pathname.slice(1);
    try {
      await ensureDatabase(opts.databaseUrl, databaseName);
    } catch (err) {
      // An external server may not let us create databases; the migrations below then say what is wrong.
      if (local.postgres) throw err;
      opts.log(`warning: could not check or create the database "${databaseName}": ${(err as Error).message}`);
    }
    checkpoint();
    if (local.redis) {
      redis = await ensureRedis({ dir: join(opts.dirs.serviceDir, 'redis'), port: portOf(opts.redisUrl, 6379), persist: !opts.throwaway, log: opts.log });
    }
    checkpoint();

    await migrateAndSeed({ databaseUrl: opts.databaseUrl, seed: opts.seed, log: opts.log });
    checkpoint();

    const distDir = join(repoRoot, 'dist', 'web');
    if (opts.build) {
      const why = buildNeeded(repoRoot, distDir);
      if (why) {
        opts.log(why === 'missing' ? 'building the browser app (vite build) …' : 'sources changed since the last build: rebuilding the browser app …');
        await buildWeb(repoRoot, distDir, opts.log);
      }
    }
    checkpoint();
    if (!existsSync(join(distDir, 'index.html'))) opts.log('warning: no browser build in dist/web; the API serves /api only');

    const fakes = spawnChild('fakes', 'server/ops/fakes-process.ts');
    await waitListening(fakes, opts.ports.mailbox, 60_000);
    if (existsSync(join(repoRoot, 'server/fakes/oauth-provider.ts'))) await waitListening(fakes, opts.ports.oauth, 30_000);
    const api = spawnChild('api', 'server/index.ts');
    const worker = spawnChild('worker', 'worker/index.ts');
    await waitListening(api, opts.ports.app, 90_000);

    const appUrl = `http://127.0.0.1:${opts.ports.app}`;
    let last = '';
    let workerDead = false;
    void worker.exited.then(() => {
      workerDead = true;
    });
    const healthy = await waitFor(async () => {
      if (workerDead || stopping) return true;
      try {
        const res = await fetch(`${appUrl}/api/health`);
        last = await res.text();
        return res.ok;
      } catch (err) {
        last = String(err);
        return false;
      }
    }, 90_000, 300);
    checkpoint();
    if (workerDead) throw new OpsError(`the worker process exited during start-up: ${lastWords(worker.tail())}`, logHint('worker'));
    if (!healthy) throw new OpsError(`the app did not report healthy within 90 s (last answer: ${last})`, logHint('api'));
    return {
      app: appUrl,
      oauth: `http://127.0.0.1:${opts.ports.oauth}`,
      mailbox: `http://127.0.0.1:${opts.ports.mailbox}`,
      database: opts.databaseUrl,
      redis: opts.redisUrl,
    };
  }

  async function stopAll(): Promise<void> {
    // The API and worker first (they finish in-flight work against the database and queue), then the services.
    await Promise.all(children.map((c) => c.stop(12_000)));
    rmSync(recordFile, { force: true });
    await Promise.allSettled([redis?.stop(), postgres?.stop()]);
  }

  return {
    start,
    stop() {
      stopping ??= stopAll();
      return stopping;
    },
    crashed,
  };
}

/** Starts a whole stack (see createStack); on failure stops whatever had come up, then throws. */
export async function startStack(opts: StackOptions): Promise<{ urls: StackUrls; stop(): Promise<void>; crashed: Promise<string> }> {
  const stack = createStack(opts);
  try {
    const urls = await stack.start();
    return { urls, stop: stack.stop, crashed: stack.crashed };
  } catch (err) {
    await stack.stop();
    throw err;
  }
}
