import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { OpsError, commandLineOf, isProcessAlive, waitFor } from './util';

/** What a running `npm start` records about itself. */
export interface LockInfo {
  pid: number;
  /** Its launchers (bootstrap, the npm shell, npm): if one is gone, the run was abandoned. */
  launchers: number[];
  url?: string;
  startedAt: string;
}

/**
 * - held: a live run owns it;
 * - abandoned: the owner lives but a launcher was killed (it is on its way down, or stuck);
 * - stale: the owner is gone (killed with SIGKILL, machine restarted).
 */
export type LockVerdict = 'held' | 'abandoned' | 'stale';

export function judgeLock(
  info: LockInfo,
  alive: (pid: number) => boolean = isProcessAlive,
  cmdline: (pid: number) => string = commandLineOf,
): LockVerdict {
  if (!alive(info.pid)) return 'stale';
  const cmd = cmdline(info.pid);
  if (cmd !== '' && !cmd.includes('server/ops/')) return 'stale'; // a recycled pid
  return info.launchers.every(alive) ? 'held' : 'abandoned';
}

export function readLock(file: string): LockInfo | null {
  try {
    const info = JSON.parse(readFileSync(file, 'utf8')) as LockInfo;
    return Number.isInteger(info.pid) ? { ...info, launchers: info.launchers ?? [] } : null;
  } catch {
    return null;
  }
}

/** The launcher pids passed down by bootstrap.mjs. */
export function launcherPids(env: NodeJS.ProcessEnv = process.env): number[] {
  return (env.PF_LAUNCHER_PIDS ?? '')
    .split(',')
    .map(Number)
    .filter((p) => Number.isInteger(p) && p > 1);
}

/**
 * Takes the lock file of one stack (atomically: exclusive create). A live holder means "already
 * running" (an OpsError naming it); an abandoned one is asked to stop and waited for; a stale
 * file is removed. Returns a function that updates the recorded URL and one that releases.
 */
export async function acquireLock(
  file: string,
  what: string,
  log: (line: string) => void,
): Promise<{ update(url: string): void; release(): void }> {
  mkdirSync(dirname(file), { recursive: true });
  const mine: LockInfo = { pid: process.pid, launchers: launcherPids(), startedAt: new Date().toISOString() };
  for (let attempt = 0; attempt < 5; attempt++) {
    try {
      writeFileSync(file, JSON.stringify(mine), { flag: 'wx' });
      return {
        update(url) {
          writeFileSync(file, JSON.stringify({ ...mine, url }));
        },
        release() {
          if (readLock(file)?.pid === process.pid) rmSync(file, { force: true });
        },
      };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
    }
    const holder = readLock(file);
    if (!holder) {
      rmSync(file, { force: true });
      continue;
    }
    const verdict = judgeLock(holder);
    if (verdict === 'held') {
      throw new OpsError(
        `${what} is already running (pid ${holder.pid}${holder.url ? `, ${holder.url}` : ''})`,
        `use that one, or stop it (Ctrl-C in its terminal, or \`kill ${holder.pid}\`) and try again`,
      );
    }
    if (verdict === 'abandoned') {
      log(`an earlier ${what} (pid ${holder.pid}) lost its terminal; waiting for it to stop`);
      try {
        process.kill(holder.pid, 'SIGTERM');
      } catch {
        // already gone
      }
      if (!(await waitFor(() => !isProcessAlive(holder.pid), 30_000, 200))) {
        process.kill(holder.pid, 'SIGKILL');
      }
    } else {
      log(`removing the lock of an earlier ${what} that was killed (pid ${holder.pid})`);
    }
    rmSync(file, { force: true });
  }
  throw new OpsError(`could not take the lock file ${file}`, 'another start is racing this one; try again');
}
