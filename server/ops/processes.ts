import { spawn } from 'node:child_process';
import { closeSync, mkdirSync, openSync, readFileSync, readSync, rmSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { commandLineOf, isProcessAlive, waitFor } from './util';

const levelNames: Record<number, string> = { 10: 'trace', 20: 'debug', 30: 'info', 40: 'warn', 50: 'ERROR', 60: 'FATAL' };
const noisyKeys = new Set(['level', 'time', 'pid', 'hostname', 'name', 'msg', 'v']);

/** Renders one pino JSON line as `info  message key=value …`; other lines pass through unchanged. */
export function formatLogLine(line: string): string {
  if (!line.startsWith('{')) return line;
  try {
    const entry = JSON.parse(line) as Record<string, unknown>;
    const level = levelNames[Number(entry.level)] ?? String(entry.level ?? '');
    const extras = Object.entries(entry)
      .filter(([k]) => !noisyKeys.has(k))
      .map(([k, v]) => {
        if (k === 'err' && v && typeof v === 'object') return `err=${JSON.stringify((v as { message?: string }).message ?? v)}`;
        return `${k}=${typeof v === 'string' ? v : JSON.stringify(v)}`;
      });
    return [level.padEnd(5), String(entry.msg ?? ''), ...extras].join(' ').trimEnd();
  } catch {
    return line;
  }
}

export interface ManagedProcess {
  name: string;
  pid: number;
  /** The entry point it runs (recorded to tell it from a recycled pid). */
  script: string;
  /** Resolves when the process has exited. */
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  /** The last lines it printed (for error messages). */
  tail(): string[];
  /** SIGTERM to its process group; SIGKILL after `deadlineMs`. */
  stop(deadlineMs?: number): Promise<void>;
}

/**
 * Follows a growing log file, handing each complete new line to `onLine`. Polling (not
 * fs.watch) keeps it simple and reliable on every file system.
 */
function followFile(path: string, onLine: (line: string) => void): { flush(): void; close(): void } {
  let offset = 0;
  let partial = '';
  const buffer = Buffer.alloc(64 * 1024);
  const fd = openSync(path, 'r');
  const flush = () => {
    for (;;) {
      const n = readSync(fd, buffer, 0, buffer.length, offset);
      if (n <= 0) break;
      offset += n;
      const lines = (partial + buffer.toString('utf8', 0, n)).split('\n');
      partial = lines.pop() ?? '';
      for (const line of lines) onLine(line);
    }
  };
  const timer = setInterval(flush, 150);
  timer.unref();
  return {
    flush,
    close() {
      clearInterval(timer);
      flush();
      if (partial) onLine(partial);
      closeSync(fd);
    },
  };
}

/**
 * Runs a TypeScript entry point as `node --import tsx FILE` in its own process group (so the
 * whole tree can be signalled, and Ctrl-C reaches it only through us). Its output goes to
 * `logFile`, which we follow and, with `echo`, print prefixed with its name: a file, unlike a
 * pipe, never blocks the child's writes when we are gone. The child learns our pid through
 * PF_PARENT_PID and exits by itself if we die without stopping it.
 */
export function spawnManaged(opts: { name: string; script: string; cwd: string; env: NodeJS.ProcessEnv; logFile: string; echo: boolean }): ManagedProcess {
  mkdirSync(dirname(opts.logFile), { recursive: true });
  const out = openSync(opts.logFile, 'w');
  const child = spawn(process.execPath, ['--import', 'tsx', opts.script], {
    cwd: opts.cwd,
    env: { ...opts.env, PF_PARENT_PID: String(process.pid) },
    detached: true,
    stdio: ['ignore', out, out],
  });
  closeSync(out);
  const recent: string[] = [];
  const prefix = `[${opts.name}]`.padEnd(9);
  const follower = followFile(opts.logFile, (line) => {
    recent.push(line);
    if (recent.length > 40) recent.shift();
    if (opts.echo) process.stdout.write(`${prefix} ${formatLogLine(line)}\n`);
  });
  let exitedYet = false;
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => {
    const done = (code: number | null, signal: NodeJS.Signals | null) => {
      if (exitedYet) return;
      exitedYet = true;
      follower.close();
      resolve({ code, signal });
    };
    child.once('exit', done);
    child.once('error', () => done(1, null));
  });
  const pid = child.pid ?? -1;
  return {
    name: opts.name,
    pid,
    script: opts.script,
    exited,
    tail: () => {
      follower.flush();
      return recent.slice();
    },
    async stop(deadlineMs = 12_000) {
      if (exitedYet || pid <= 0) return;
      signalGroup(pid, 'SIGTERM');
      const timer = new Promise<'late'>((r) => setTimeout(() => r('late'), deadlineMs).unref());
      if ((await Promise.race([exited, timer])) === 'late') {
        signalGroup(pid, 'SIGKILL');
        await exited;
      }
      // Anything the child left in its group (it never should) goes too.
      signalGroup(pid, 'SIGKILL');
    },
  };
}

/** The most telling line of a dead child's output: the last error message, else the last non-empty line. */
export function lastWords(lines: string[]): string {
  const text = lines.map((l) => formatLogLine(l).trim()).filter(Boolean);
  const error = [...text].reverse().find((l) => /(^|\s)(\w*Error\b|ERROR|FATAL)/.test(l) && !/^at /.test(l));
  return (error ?? text[text.length - 1] ?? 'no output').slice(0, 400);
}

/** Signals a whole process group; ignores a group that is already gone. */
export function signalGroup(pgid: number, signal: NodeJS.Signals): void {
  try {
    process.kill(-pgid, signal);
  } catch {
    // gone
  }
}

/**
 * The pids of the processes a stack started, written to a file so a later run can clean up
 * after one that was killed with SIGKILL (which no handler sees).
 */
export interface ChildRecord {
  name: string;
  pid: number;
  /** A piece of its command line, to tell it from a recycled pid. */
  marker: string;
}

export function writeChildRecords(file: string, records: ChildRecord[]): void {
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(file, JSON.stringify({ owner: process.pid, children: records }, null, 2));
}

/** Kills processes recorded by an earlier run that are still alive (and still ours). Returns their names. */
export async function killRecordedChildren(file: string): Promise<string[]> {
  let records: ChildRecord[] = [];
  try {
    records = (JSON.parse(readFileSync(file, 'utf8')) as { children: ChildRecord[] }).children ?? [];
  } catch {
    return [];
  }
  const alive = records.filter((r) => isProcessAlive(r.pid) && commandLineOf(r.pid).includes(r.marker));
  for (const r of alive) signalGroup(r.pid, 'SIGTERM');
  await waitFor(() => alive.every((r) => !isProcessAlive(r.pid)), 12_000, 100);
  for (const r of alive) signalGroup(r.pid, 'SIGKILL');
  rmSync(file, { force: true });
  return alive.map((r) => r.name);
}
