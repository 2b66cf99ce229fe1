import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import net from 'node:net';
import { join } from 'node:path';
import { isPortFree, portInUseError } from './ports';
import { OpsError, commandLineOf, isProcessAlive, run, sleep, waitFor } from './util';

export interface RedisOptions {
  /** Folder of the pid file, log and (when persistent) the append-only file. */
  dir: string;
  port: number;
  /** Keep the queue across restarts (append-only file); off for throwaway test data. */
  persist: boolean;
  log: (line: string) => void;
}

export interface RunningRedis {
  url: string;
  adopted: boolean;
  stop(): Promise<void>;
}

/** Sends PING over a raw socket; true on +PONG (no client library: no reconnect noise while waiting). */
export function pingRedis(port: number, host = '127.0.0.1', timeoutMs = 1000): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    let answer = '';
    const done = (ok: boolean) => {
      socket.destroy();
      resolve(ok);
    };
    socket.setTimeout(timeoutMs, () => done(false));
    socket.once('connect', () => socket.write('PING\r\n'));
    socket.on('data', (d) => {
      answer += d.toString();
      if (answer.includes('\r\n')) done(answer.startsWith('+PONG'));
    });
    socket.once('error', () => done(false));
  });
}

function readPid(pidFile: string): number | null {
  try {
    const pid = Number(readFileSync(pidFile, 'utf8').trim());
    return Number.isInteger(pid) && pid > 0 ? pid : null;
  } catch {
    return null;
  }
}

/** The pid of a live redis-server recorded in `dir`, or null (a stale pid file is removed). */
export function liveRedisPid(dir: string): number | null {
  const pidFile = join(dir, 'redis.pid');
  const pid = readPid(pidFile);
  if (pid === null) return null;
  if (isProcessAlive(pid) && commandLineOf(pid).includes('redis-server')) return pid;
  rmSync(pidFile, { force: true });
  return null;
}

async function stopPid(pid: number): Promise<void> {
  if (!isProcessAlive(pid)) return;
  process.kill(pid, 'SIGTERM');
  if (!(await waitFor(() => !isProcessAlive(pid), 10_000, 100))) process.kill(pid, 'SIGKILL');
}

/**
 * Starts (or takes over) the project-local Redis on 127.0.0.1:`port`, daemonised with its pid
 * file in `dir`, so a killed `npm start` leaves it for the next one to reuse.
 */
export async function ensureRedis(opts: RedisOptions): Promise<RunningRedis> {
  mkdirSync(opts.dir, { recursive: true, mode: 0o755 });
  const url = `redis://127.0.0.1:${opts.port}`;
  const existing = liveRedisPid(opts.dir);
  if (existing !== null) {
    if (await pingRedis(opts.port)) {
      opts.log(`Redis already running on 127.0.0.1:${opts.port} (pid ${existing}, from an earlier start): reusing it`);
      return { url, adopted: true, stop: () => stopPid(existing) };
    }
    opts.log(`Redis of this folder (pid ${existing}) does not answer on port ${opts.port}; restarting it`);
    await stopPid(existing);
  }
  if (!(await isPortFree(opts.port))) throw portInUseError(opts.port, 'Redis', 'REDIS_URL');
  if (!existsSync('/usr/bin/redis-server')) {
    throw new OpsError('redis-server is not installed', 'install it with `apt-get install -y redis-server` (npm start does this when run as root)');
  }
  const logFile = join(opts.dir, 'redis.log');
  const args = [
    '--bind', '127.0.0.1', '--port', String(opts.port), '--protected-mode', 'yes',
    '--daemonize', 'yes', '--pidfile', join(opts.dir, 'redis.pid'), '--logfile', logFile, '--dir', opts.dir,
    '--save', '', '--appendonly', opts.persist ? 'yes' : 'no',
  ];
  const r = await run('/usr/bin/redis-server', args);
  if (r.code !== 0) throw new OpsError(`Redis did not start: ${(r.stderr || r.stdout).trim().split('\n').pop()}`, `see ${logFile}`);
  if (!(await waitFor(() => pingRedis(opts.port), 20_000, 100))) {
    throw new OpsError(`Redis on 127.0.0.1:${opts.port} does not answer`, `see ${logFile}`);
  }
  // The pid file appears a moment after the daemon forks.
  let pid = liveRedisPid(opts.dir);
  for (let i = 0; pid === null && i < 20; i++) {
    await sleep(100);
    pid = liveRedisPid(opts.dir);
  }
  return {
    url,
    adopted: false,
    stop: async () => {
      const p = pid ?? liveRedisPid(opts.dir);
      if (p !== null) await stopPid(p);
    },
  };
}

/** Stops a Redis left running in `dir` by an earlier (killed) run. */
export async function stopLeftoverRedis(dir: string): Promise<void> {
  const pid = liveRedisPid(dir);
  if (pid !== null) await stopPid(pid);
}
