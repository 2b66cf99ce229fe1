import type { Logger } from '../logger';
import { watchParent } from './parent-watch';

/** How a long-running process (API, worker) stops. */
export interface ShutdownPlan {
  logger: Logger;
  /** After this long the process exits with status 1, whatever is still open. */
  deadlineMs: number;
  /** Logged when shutdown starts. */
  announce: string;
  /** Logged when the deadline passes. */
  deadlineMessage: string;
  /** Closes what the process holds, in order; errors are the caller's to settle. */
  stop: () => Promise<void>;
}

/**
 * Stops the process once on SIGTERM, SIGINT or the loss of its `npm start` parent: logs, runs
 * `stop` under a deadline, then exits 0 (1 if the deadline passes first).
 */
export function installShutdown(plan: ShutdownPlan): void {
  let stopping = false;
  const shutdown = async (reason: string) => {
    if (stopping) return;
    stopping = true;
    plan.logger.info({ reason }, plan.announce);
    const deadline = setTimeout(() => {
      plan.logger.error(plan.deadlineMessage);
      process.exit(1);
    }, plan.deadlineMs);
    deadline.unref();
    await plan.stop();
    plan.logger.info('stopped');
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
  watchParent(() => void shutdown('parent process exited'));
}
