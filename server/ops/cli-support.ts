import { OpsError } from './util';

/** Orchestrator output: one line, marked so it stands out from the children's logs. */
export const say = (line: string) => process.stdout.write(`▸ ${line}\n`);

/** Prints an error as one line (a stack trace only with PF_DEBUG=1). */
export function reportError(err: unknown): void {
  if (err instanceof OpsError) {
    process.stderr.write(`✗ ${err.oneLine()}\n`);
    return;
  }
  const e = err as Error;
  process.stderr.write(`✗ ${e?.message ?? String(err)}${process.env.PF_DEBUG ? `\n${e?.stack ?? ''}` : ' (PF_DEBUG=1 shows the stack trace)'}\n`);
}

/**
 * Runs `onStop` once on SIGINT/SIGTERM/SIGHUP. Ctrl-C reaches us twice (from the terminal and
 * forwarded by bootstrap.mjs), so repeats within a second count as one; a later repeat forces
 * `onForce` (someone is pressing Ctrl-C again because the stop hangs).
 */
export function onStopSignals(onStop: (signal: NodeJS.Signals) => void, onForce: () => void): void {
  let first = 0;
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    process.on(signal, () => {
      const now = Date.now();
      if (first === 0) {
        first = now;
        onStop(signal);
      } else if (now - first > 1000) {
        onForce();
      }
    });
  }
}
