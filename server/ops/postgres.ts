import { chownSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import pg from 'pg';
import { isPortFree, isPortOpen, portInUseError } from './ports';
import { currentUserIsRoot, userExists } from './system';
import { OpsError, commandLineOf, isProcessAlive, run, waitFor } from './util';

/** The highest PostgreSQL server version installed under /usr/lib/postgresql (Debian layout). */
export function findPostgresBinDir(root = '/usr/lib/postgresql'): string {
  const versions = existsSync(root)
    ? readdirSync(root)
        .filter((v) => /^\d+$/.test(v) && existsSync(join(root, v, 'bin', 'pg_ctl')))
        .sort((a, b) => Number(b) - Number(a))
    : [];
  if (versions.length === 0) {
    throw new OpsError(`no PostgreSQL server found under ${root}`, 'install it with `apt-get install -y postgresql` (npm start does this when run as root)');
  }
  return join(root, versions[0], 'bin');
}

/** The first lines of postmaster.pid: pid, data directory, start time, port. */
export interface PostmasterLock {
  pid: number;
  port: number | undefined;
}

/** Parses postmaster.pid (null when missing or unreadable). */
export function readPostmasterLock(dataDir: string): PostmasterLock | null {
  try {
    const lines = readFileSync(join(dataDir, 'postmaster.pid'), 'utf8').split('\n');
    const pid = Number(lines[0]);
    if (!Number.isInteger(pid) || pid <= 0) return null;
    const port = Number(lines[3]);
    return { pid, port: Number.isInteger(port) && port > 0 ? port : undefined };
  } catch {
    return null;
  }
}

/**
 * A postmaster.pid whose process is gone (a killed run, a crashed machine) is stale: PostgreSQL
 * itself would refuse to start over it. A live pid that is not a postgres process is a recycled
 * pid, equally stale.
 */
export function isStalePostmasterLock(
  lock: PostmasterLock,
  alive: (pid: number) => boolean = isProcessAlive,
  cmdline: (pid: number) => string = commandLineOf,
): boolean {
  if (!alive(lock.pid)) return true;
  const cmd = cmdline(lock.pid);
  return cmd !== '' && !cmd.includes('postgres');
}

export interface PostgresOptions {
  /** Folder of the cluster's data (created and initialised when empty). */
  dataDir: string;
  /** Folder of the Unix socket and the server log (must be short: socket paths max ~100 chars). */
  runDir: string;
  port: number;
  /** Off for throwaway test clusters: faster, and nothing there must survive a crash. */
  fsync: boolean;
  log: (line: string) => void;
}

export interface RunningPostgres {
  /** Server URL without a database name. */
  url: string;
  /** True when an already running cluster of ours (from an earlier run) was taken over. */
  adopted: boolean;
  stop(): Promise<void>;
}

/** Runs a PostgreSQL program as `postgres` when we are root (it refuses root), else as ourselves. */
async function pgRun(binDir: string, program: string, args: string[]) {
  const file = join(binDir, program);
  return currentUserIsRoot() ? run('runuser', ['-u', 'postgres', '--', file, ...args]) : run(file, args);
}

function ensureOwnedDir(dir: string, mode: number) {
  mkdirSync(dir, { recursive: true, mode });
  if (currentUserIsRoot()) {
    const { uid, gid } = postgresIds();
    chownSync(dir, uid, gid);
  }
}

let ids: { uid: number; gid: number } | undefined;
function postgresIds() {
  if (!ids) {
    const line = readFileSync('/etc/passwd', 'utf8')
      .split('\n')
      .find((l) => l.startsWith('postgres:'));
    if (!line) throw new OpsError('the postgres system user does not exist', 'install Debian\'s postgresql package or `useradd --system postgres`');
    const [, , uid, gid] = line.split(':');
    ids = { uid: Number(uid), gid: Number(gid) };
  }
  return ids;
}

/**
 * Starts (or takes over) the project-local PostgreSQL cluster on 127.0.0.1:`port`. Creates
 * the cluster on first use (trust authentication for local connections: it listens on
 * loopback only). Removes a stale postmaster.pid left by a killed run.
 */
export async function ensurePostgres(opts: PostgresOptions): Promise<RunningPostgres> {
  const binDir = findPostgresBinDir();
  if (currentUserIsRoot() && !(await userExists('postgres'))) {
    throw new OpsError('the postgres system user does not exist', 'install Debian\'s postgresql package or run `useradd --system postgres`');
  }
  const url = `postgres://postgres@127.0.0.1:${opts.port}`;
  ensureOwnedDir(opts.runDir, 0o755);
  ensureOwnedDir(opts.dataDir, 0o700);
  if (currentUserIsRoot() && (await run('runuser', ['-u', 'postgres', '--', 'test', '-w', opts.dataDir])).code !== 0) {
    throw new OpsError(
      `the postgres user cannot write to ${opts.dataDir}`,
      'move the repository somewhere every user can traverse (not under a mode-700 home), or check the folder\'s owner and mode',
    );
  }

  if (!existsSync(join(opts.dataDir, 'PG_VERSION'))) {
    // A half-made cluster from an interrupted initdb: start over.
    for (const entry of readdirSync(opts.dataDir)) rmSync(join(opts.dataDir, entry), { recursive: true, force: true });
    opts.log(`creating a PostgreSQL cluster in ${opts.dataDir}`);
    const init = await pgRun(binDir, 'initdb', [
      '-D', opts.dataDir, '-U', 'postgres', '--auth=trust', '--encoding=UTF8', '--locale=C', ...(opts.fsync ? [] : ['--no-sync']),
    ]);
    if (init.code !== 0) throw new OpsError(`initdb failed: ${lastLine(init.stderr || init.stdout)}`, `see the message; the cluster folder is ${opts.dataDir}`);
  }

  const stop = async () => {
    const r = await pgRun(binDir, 'pg_ctl', ['stop', '-D', opts.dataDir, '-m', 'fast', '-w', '-t', '30']);
    if (r.code !== 0 && readPostmasterLock(opts.dataDir)) {
      const lock = readPostmasterLock(opts.dataDir);
      if (lock && isProcessAlive(lock.pid)) process.kill(lock.pid, 'SIGQUIT');
    }
  };

  const lock = readPostmasterLock(opts.dataDir);
  if (lock) {
    if (isStalePostmasterLock(lock)) {
      opts.log(`removing a stale PostgreSQL lock file (pid ${lock.pid} is gone; an earlier run was killed)`);
      rmSync(join(opts.dataDir, 'postmaster.pid'), { force: true });
    } else if (lock.port === opts.port && (await isPortOpen(opts.port))) {
      opts.log(`PostgreSQL already running on 127.0.0.1:${opts.port} (pid ${lock.pid}, from an earlier start): reusing it`);
      await waitUntilAccepting(url, 30_000, opts);
      return { url, adopted: true, stop };
    } else {
      opts.log(`PostgreSQL of this folder runs on another port (${lock.port}); restarting it on ${opts.port}`);
      await stop();
    }
  }

  if (!(await isPortFree(opts.port))) throw portInUseError(opts.port, 'PostgreSQL', 'DATABASE_URL');
  const serverOptions = `-h 127.0.0.1 -p ${opts.port} -k ${opts.runDir}${opts.fsync ? '' : ' -F'}`;
  const logFile = join(opts.runDir, 'postgresql.log');
  const start = await pgRun(binDir, 'pg_ctl', ['start', '-D', opts.dataDir, '-l', logFile, '-w', '-t', '60', '-o', serverOptions]);
  if (start.code !== 0) {
    throw new OpsError(`PostgreSQL did not start: ${lastLine(readTail(logFile) || start.stderr || start.stdout)}`, `its log is ${logFile}`);
  }
  await waitUntilAccepting(url, 30_000, opts);
  return { url, adopted: false, stop };
}

async function waitUntilAccepting(url: string, timeoutMs: number, opts: PostgresOptions) {
  const ok = await waitFor(async () => {
    const client = new pg.Client({ connectionString: `${url}/postgres`, connectionTimeoutMillis: 2000 });
    try {
      await client.connect();
      await client.query('SELECT 1');
      return true;
    } catch {
      return false;
    } finally {
      await client.end().catch(() => undefined);
    }
  }, timeoutMs, 300);
  if (!ok) throw new OpsError(`PostgreSQL on 127.0.0.1:${opts.port} does not accept connections`, `see ${join(opts.runDir, 'postgresql.log')}`);
}

/** Creates the database when missing (`CREATE DATABASE` cannot run inside a transaction or IF NOT EXISTS). */
export async function ensureDatabase(serverUrl: string, name: string): Promise<void> {
  if (!/^[A-Za-z0-9_-]+$/.test(name)) throw new OpsError(`unusable database name "${name}" in DATABASE_URL`, 'use letters, digits, _ and -');
  const client = new pg.Client({ connectionString: withDatabase(serverUrl, 'postgres') });
  await client.connect();
  try {
    const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (found.rowCount === 0) await client.query(`CREATE DATABASE "${name}"`);
  } finally {
    await client.end();
  }
}

/** Drops a database (terminating its connections). */
export async function dropDatabase(serverUrl: string, name: string): Promise<void> {
  const client = new pg.Client({ connectionString: withDatabase(serverUrl, 'postgres') });
  await client.connect();
  try {
    await client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  } finally {
    await client.end();
  }
}

/** The same server URL pointing at another database. */
export function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

/** Stops a cluster left running in `dataDir` by an earlier (killed) run; used before wiping test data. */
export async function stopLeftoverPostgres(dataDir: string): Promise<void> {
  const lock = readPostmasterLock(dataDir);
  if (!lock || isStalePostmasterLock(lock)) return;
  let binDir: string;
  try {
    binDir = findPostgresBinDir();
  } catch {
    process.kill(lock.pid, 'SIGQUIT');
    return;
  }
  const r = await pgRun(binDir, 'pg_ctl', ['stop', '-D', dataDir, '-m', 'immediate', '-w', '-t', '20']);
  if (r.code !== 0 && isProcessAlive(lock.pid)) process.kill(lock.pid, 'SIGKILL');
}

function readTail(file: string): string {
  try {
    return readFileSync(file, 'utf8').trim().split('\n').slice(-3).join(' ');
  } catch {
    return '';
  }
}

function lastLine(text: string): string {
  return text.trim().split('\n').filter(Boolean).slice(-1)[0] ?? 'no output';
}
