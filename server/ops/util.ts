import { execFile, type ExecFileOptions } from 'node:child_process';
import { readFileSync } from 'node:fs';

/**
 * A problem with the machine or the environment that the person running `npm start` / `npm test`
 * can fix. Printed as one line (what went wrong, then the fix), never with a stack trace.
 */
export class OpsError extends Error {
  constructor(
    message: string,
    readonly fix?: string,
  ) {
    super(message);
    this.name = 'OpsError';
  }

  /** The one-line explanation printed to the terminal. */
  oneLine(): string {
    return this.fix ? `${this.message} — ${this.fix}` : this.message;
  }
}

/** True when a process with this pid exists (signal 0 checks without touching it). */
export function isProcessAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: it exists but belongs to someone else.
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** The command line of a live process ('' when unknown), to tell our process from a recycled pid. */
export function commandLineOf(pid: number): string {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').join(' ').trim();
  } catch {
    return '';
  }
}

/** The parent pid of a live process, or undefined. */
export function parentPidOf(pid: number): number | undefined {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Fields after the command name, which sits in parentheses and may contain spaces.
    const rest = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return Number(rest[1]);
  } catch {
    return undefined;
  }
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/** Polls `check` until it returns true or `timeoutMs` passes; returns the last answer. */
export async function waitFor(check: () => boolean | Promise<boolean>, timeoutMs: number, everyMs = 200): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (await check()) return true;
    if (Date.now() >= deadline) return false;
    await sleep(everyMs);
  }
}

export interface RunResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs a program without a shell; resolves with its exit code and output (never rejects on a non-zero exit). */
export function run(file: string, args: string[], options: ExecFileOptions = {}): Promise<RunResult> {
  return new Promise((resolve, reject) => {
    execFile(file, args, { maxBuffer: 32 * 1024 * 1024, ...options, encoding: 'utf8' }, (err, stdout, stderr) => {
      if (err && typeof (err as NodeJS.ErrnoException).code === 'string') {
        reject(err);
        return;
      }
      const code = err ? ((err as { code?: number }).code ?? 1) : 0;
      resolve({ code, stdout: String(stdout), stderr: String(stderr) });
    });
  });
}

/** True for 127.0.0.0/8, ::1 and localhost: services there are ours to start. */
export function isLoopbackHost(host: string): boolean {
  const h = host.replace(/^\[|\]$/g, '').toLowerCase();
  return h === 'localhost' || h === '::1' || /^127(\.\d{1,3}){3}$/.test(h);
}

/** The port of a URL, with the scheme's default when it has none. */
export function portOf(url: string, fallback: number): number {
  const u = new URL(url);
  return u.port ? Number(u.port) : fallback;
}
