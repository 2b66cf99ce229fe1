import { writeSync } from 'node:fs';

/** Helpers for what the CLI prints: aligned tables, numbers, buffered stdout. */

/** A column of {@link renderTable}: header, and whether to right-align (numbers). */
export interface Column {
  header: string;
  right?: boolean;
}

/** An aligned plain-text table (two spaces between columns, a dashed rule under the header). */
export function renderTable(columns: Column[], rows: string[][]): string {
  const width = columns.map((c, i) => Math.max(c.header.length, ...rows.map((r) => [...(r[i] ?? '')].length)));
  const cell = (text: string, i: number) => {
    const padding = ' '.repeat(width[i] - [...text].length);
    return columns[i].right ? padding + text : text + padding;
  };
  const line = (cells: string[]) => cells.map(cell).join('  ').trimEnd();
  return [line(columns.map((c) => c.header)), line(width.map((w) => '-'.repeat(w))), ...rows.map(line)].join('\n');
}

/** A length in Å for a table: `0`, `3.2e-4`, `0.0123`, `1.25`. */
export function formatLength(v: number): string {
  if (v === 0) return '0';
  if (!Number.isFinite(v)) return String(v);
  return Math.abs(v) < 0.01 ? v.toExponential(1) : v.toPrecision(3);
}

/** A CSM value (0–100) for a table. */
export function formatCsm(v: number): string {
  if (v === 0) return '0';
  return v < 0.01 ? v.toExponential(1) : v.toPrecision(3);
}

/** Group order for a table: `∞` for the linear groups (order 0 in the JSON). */
export function formatOrder(order: number): string {
  return order === 0 ? '∞' : String(order);
}

/**
 * Buffered writes to a file descriptor (stdout by default). Writes are synchronous so that
 * output is complete before the process exits, and batched so that 10⁴ small writes cost little.
 * Each text is encoded straight into one reused byte buffer: joining tens of megabytes of JSON
 * into a single string first (with a few non-ASCII symbols such as σ and ∞ it becomes a
 * two-byte string) cost more than producing the JSON.
 */
export class BufferedOut {
  private buf = Buffer.allocUnsafe(1 << 20);
  private used = 0;

  constructor(private readonly fd = 1) {}

  write(text: string): void {
    // UTF-8 needs at most 3 bytes per UTF-16 code unit.
    if (this.used + 3 * text.length > this.buf.length) {
      this.flush();
      if (3 * text.length > this.buf.length) {
        this.writeAll(Buffer.from(text, 'utf8'));
        return;
      }
    }
    this.used += this.buf.write(text, this.used, 'utf8');
  }

  flush(): void {
    if (this.used === 0) return;
    this.writeAll(this.buf.subarray(0, this.used));
    this.used = 0;
  }

  private writeAll(bytes: Buffer): void {
    let off = 0;
    while (off < bytes.length) {
      try {
        off += writeSync(this.fd, bytes, off);
      } catch (e) {
        const code = (e as NodeJS.ErrnoException).code;
        if (code === 'EPIPE') throw new OutputClosed();
        // A non-blocking pipe that is full: wait for the reader and retry.
        if (code !== 'EAGAIN') throw e;
        Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 5);
      }
    }
  }
}

/**
 * The reader of the output has gone (EPIPE), as in `pointfold snap … --json | head`: the command
 * stops there, with no message and exit status 141 (128 + SIGPIPE, what a shell reports for a
 * program that a closed pipe stopped), not as an internal error.
 */
export class OutputClosed extends Error {
  constructor() {
    super('the reader of the output has gone (broken pipe)');
  }
}

/** Exit status after {@link OutputClosed}. */
export const EXIT_OUTPUT_CLOSED = 141;

/** One line on stderr. */
export function printError(message: string): void {
  process.stderr.write(`${message.replace(/\s*\n\s*/g, ' ')}\n`);
}

/**
 * Progress on stderr for long runs (the inputs stream in, so the total is not known ahead), only
 * when stderr is a terminal (scripts and pipes stay clean) and from the 200th structure on.
 * Returns a function to call with the count done; call `done()` to clear the line.
 */
export function progress(label: string): { tick: (n: number) => void; done: () => void } {
  const show = process.stderr.isTTY === true;
  let last = 0;
  return {
    tick: (n) => {
      if (!show || n < 200) return;
      const now = Date.now();
      if (now - last < 200) return;
      last = now;
      process.stderr.write(`\r${label}: ${n} structures done`);
    },
    done: () => {
      if (show && last > 0) process.stderr.write('\r\u001b[2K');
    },
  };
}
