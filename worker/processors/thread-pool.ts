import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { Logger } from '../../server/logger';

/** A task failed inside the thread: the error thrown by the task function, rebuilt. */
export class ThreadTaskError extends Error {
  constructor(
    readonly errorName: string,
    message: string,
    readonly code: string | undefined,
  ) {
    super(message);
    this.name = 'ThreadTaskError';
  }
}

/** The thread died (crash, out of memory) or took too long; the task did not finish. */
export class ThreadLostError extends Error {
  constructor(
    message: string,
    readonly reason: 'crash' | 'out-of-memory' | 'timeout',
  ) {
    super(message);
    this.name = 'ThreadLostError';
  }
}

export interface ThreadPool<I, O> {
  readonly size: number;
  run(input: I): Promise<O>;
  close(): Promise<void>;
}

export interface ThreadPoolOptions {
  /** Module with `export function handleTask(input): output | Promise<output>`. */
  entry: URL;
  size: number;
  /** A task running longer is abandoned and its thread replaced. */
  timeoutMs: number;
  /** tsconfig.json for tsx's path aliases (default: the one in the current directory). */
  tsconfig?: string;
  /**
   * Tasks handed to a thread ahead of time (default 2): the next one is already in the thread's
   * inbox when it finishes, so a busy main event loop can't leave the thread idle.
   */
  prefetch?: number;
  /** Heap cap per thread, so one monstrous input can't take the whole process down. */
  maxHeapMb?: number;
  logger: Logger;
}

interface Pending<I, O> {
  input: I;
  resolve(value: O): void;
  reject(error: Error): void;
}

interface Slot<I, O> {
  worker: Worker;
  ready: boolean;
  /** Handed to the thread, in order; the first is running, the others wait in its inbox. */
  tasks: (Pending<I, O> & { id: number })[];
  /** Times the running task only. */
  timer: NodeJS.Timeout | null;
}

/*
 * The threads run TypeScript: they register tsx's loader themselves, because Node 20 does not
 * carry the parent's `--import tsx` into worker threads (and under vitest there is no such flag).
 * This works the same under `tsx`, vitest and a plain `node --import tsx`.
 */
// The ESM entry of tsx's API (its CommonJS twin can't register the ESM hooks from a thread).
const tsxApi = (() => {
  const packageJson = createRequire(import.meta.url).resolve('tsx/package.json');
  const exportsMap = JSON.parse(readFileSync(packageJson, 'utf8')).exports['./esm/api'].import.default as string;
  return pathToFileURL(join(dirname(packageJson), exportsMap)).href;
})();
const bootstrap = (entry: string, tsconfig: string | undefined) => `
const { parentPort } = require('node:worker_threads');
import(${JSON.stringify(tsxApi)})
  .then((tsx) => { tsx.register(${tsconfig ? `{ tsconfig: ${JSON.stringify(tsconfig)} }` : ''}); return import(${JSON.stringify(entry)}); })
  .then((mod) => {
    parentPort.on('message', async ({ id, input }) => {
      try {
        const value = await mod.handleTask(input);
        parentPort.postMessage({ id, ok: true, value });
      } catch (e) {
        parentPort.postMessage({ id, ok: false, error: { name: e?.name ?? 'Error', message: String(e?.message ?? e), code: e?.code } });
      }
    });
    parentPort.postMessage({ ready: true });
  })
  .catch((e) => { setImmediate(() => { throw e; }); });
`;

/**
 * A small fixed pool of worker threads for CPU-bound work (the engine), so the worker's event
 * loop stays free for BullMQ's lock renewals and the database. Tasks queue FIFO; a thread that
 * dies or times out is replaced and its task rejected with ThreadLostError.
 */
export function createThreadPool<I, O>(options: ThreadPoolOptions): ThreadPool<I, O> {
  const queue: Pending<I, O>[] = [];
  const slots: Slot<I, O>[] = [];
  const prefetch = options.prefetch ?? 2;
  let nextId = 1;
  let closed = false;

  const armTimer = (slot: Slot<I, O>) => {
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = null;
    const head = slot.tasks[0];
    if (!head) return;
    slot.timer = setTimeout(() => {
      if (slot.tasks[0] !== head) return;
      slot.tasks.shift();
      head.reject(new ThreadLostError(`The engine took longer than ${Math.round(options.timeoutMs / 1000)} s`, 'timeout'));
      // The tasks behind it never started: give them to the other threads.
      queue.unshift(...slot.tasks.splice(0));
      void slot.worker.terminate();
    }, options.timeoutMs);
  };

  const spawn = (): Slot<I, O> => {
    const worker = new Worker(bootstrap(options.entry.href, options.tsconfig), {
      eval: true,
      resourceLimits: options.maxHeapMb ? { maxOldGenerationSizeMb: options.maxHeapMb } : undefined,
    });
    const slot: Slot<I, O> = { worker, ready: false, tasks: [], timer: null };
    worker.on('message', (msg: { ready?: true; id?: number; ok?: boolean; value?: O; error?: { name: string; message: string; code?: string } }) => {
      if (msg.ready) {
        slot.ready = true;
        pump();
        return;
      }
      const index = slot.tasks.findIndex((t) => t.id === msg.id);
      if (index < 0) return;
      const [task] = slot.tasks.splice(index, 1);
      if (msg.ok) task.resolve(msg.value as O);
      else task.reject(new ThreadTaskError(msg.error!.name, msg.error!.message, msg.error!.code));
      armTimer(slot);
      pump();
    });
    let lastError: (Error & { code?: string }) | null = null;
    worker.on('error', (e: Error & { code?: string }) => {
      lastError = e;
    });
    worker.on('exit', (code) => {
      const index = slots.indexOf(slot);
      if (index >= 0) slots.splice(index, 1);
      if (slot.timer) clearTimeout(slot.timer);
      const [running, ...waiting] = slot.tasks.splice(0);
      if (running) {
        const oom = lastError?.code === 'ERR_WORKER_OUT_OF_MEMORY';
        running.reject(
          new ThreadLostError(
            oom ? 'The engine ran out of memory on this structure' : `Engine thread exited (code ${code}): ${lastError?.message ?? 'no error'}`,
            oom ? 'out-of-memory' : 'crash',
          ),
        );
      } else if (lastError && !closed) {
        options.logger.error({ err: lastError }, 'engine thread failed to start');
      }
      if (closed) {
        for (const t of waiting) t.reject(new Error('The engine pool is closed'));
        return;
      }
      queue.unshift(...waiting);
      // A thread that can't even start (broken import) would respawn in a tight loop: back off.
      setTimeout(() => {
        if (!closed && slots.length < options.size) {
          slots.push(spawn());
          pump();
        }
      }, slot.ready ? 0 : 1000).unref();
    });
    return slot;
  };

  /** Keeps every ready thread's inbox `prefetch` deep, least loaded thread first. */
  const pump = () => {
    while (queue.length > 0) {
      let best: Slot<I, O> | null = null;
      for (const slot of slots) {
        if (slot.ready && slot.tasks.length < prefetch && (!best || slot.tasks.length < best.tasks.length)) best = slot;
      }
      if (!best) return;
      const pending = queue.shift()!;
      const task = { ...pending, id: nextId++ };
      best.tasks.push(task);
      best.worker.postMessage({ id: task.id, input: pending.input });
      if (best.tasks.length === 1) armTimer(best);
    }
  };

  for (let i = 0; i < options.size; i++) slots.push(spawn());

  return {
    size: options.size,
    run(input) {
      if (closed) return Promise.reject(new Error('The engine pool is closed'));
      return new Promise<O>((resolve, reject) => {
        queue.push({ input, resolve, reject });
        pump();
      });
    },
    async close() {
      closed = true;
      for (const pending of queue.splice(0)) pending.reject(new Error('The engine pool is closed'));
      await Promise.all(slots.map((s) => s.worker.terminate()));
    },
  };
}
