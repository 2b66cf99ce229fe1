/**
 * For processes started by `npm start` or the browser tests (PF_PARENT_PID set): calls `onOrphaned`
 * once when that parent is gone. A parent killed with SIGKILL cannot stop its children, so the
 * children notice instead, and the ports are free for the next start. No-op without PF_PARENT_PID.
 */
export function watchParent(onOrphaned: () => void, env: NodeJS.ProcessEnv = process.env, everyMs = 1000): () => void {
  const expected = Number(env.PF_PARENT_PID);
  if (!Number.isInteger(expected) || expected <= 0) return () => {};
  const timer = setInterval(() => {
    if (process.ppid !== expected) {
      clearInterval(timer);
      onOrphaned();
    }
  }, everyMs);
  timer.unref();
  return () => clearInterval(timer);
}
