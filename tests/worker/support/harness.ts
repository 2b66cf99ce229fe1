import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { fileURLToPath } from 'node:url';
import type { DataSource } from 'typeorm';

const repoRoot = fileURLToPath(new URL('../../..', import.meta.url));

/** The last lines each worker process wrote (stdout and stderr), for failure messages. */
const workerLogs = new WeakMap<ChildProcess, string[]>();

/** The last `lines` lines a worker started by {@link startWorkerProcess} wrote, for a failure message. */
export function workerLogTail(child: ChildProcess | undefined, lines = 25): string {
  const log = child ? workerLogs.get(child) : undefined;
  return log && log.length > 0 ? log.slice(-lines).join('\n') : '(no worker output)';
}

/** Starts tests/worker/support/run-worker.ts in its own process; resolves once it is ready. */
export async function startWorkerProcess(env: Record<string, string>): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'tests/worker/support/run-worker.ts'], {
    cwd: repoRoot,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stderr = '';
  const log: string[] = [];
  workerLogs.set(child, log);
  const keep = (c: Buffer) => {
    for (const line of c.toString().split('\n')) if (line.trim() !== '') log.push(line.slice(0, 400));
    if (log.length > 400) log.splice(0, log.length - 200);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', (c: Buffer) => {
    stderr += c.toString();
    keep(c);
  });
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker did not start: ${stderr}`)), 30_000);
    child.stdout!.on('data', (c: Buffer) => {
      if (c.toString().includes('ready')) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`worker exited with ${code}: ${stderr}`));
    });
  });
  return child;
}

/** Stops a child process and waits for it. */
export async function stop(child: ChildProcess | undefined, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  if (!child || child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise((resolve) => child.once('exit', resolve));
  child.kill(signal);
  await exited;
}

/** A TCP port nobody listens on right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

/** Waits until `probe` returns a truthy value. */
export async function until<T>(what: string, probe: () => Promise<T>, timeoutMs = 60_000, everyMs = 200): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    try {
      const v = await probe();
      if (v) return v;
    } catch {
      /* the service may be restarting */
    }
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

/** Structures of a batch by state, straight from PostgreSQL. */
export async function states(ds: DataSource, batchId: string): Promise<Record<string, number>> {
  const rows: { status: string; n: number }[] = await ds.query(
    `SELECT status, count(*)::int AS n FROM structures WHERE batch_id = $1 GROUP BY status`,
    [batchId],
  );
  return Object.fromEntries(rows.map((r) => [r.status, r.n]));
}

/**
 * `copies` renamed copies of the demo's fragments.xyz (15 frames each): enough structures that a
 * worker can be stopped in the middle of the batch.
 */
export function fragmentCopies(copies: number): { name: string; bytes: Buffer }[] {
  const bytes = readFileSync(new URL('../../../examples/demo/fragments.xyz', import.meta.url));
  return Array.from({ length: copies }, (_, i) => ({ name: `fragments-${i + 1}.xyz`, bytes }));
}
