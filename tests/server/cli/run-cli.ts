import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The repository root, and the launcher `npm run pointfold` starts (package.json). */
export const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
export const LAUNCHER = join(ROOT, 'server/cli/launch.mjs');
export const SAMPLES = join(ROOT, 'tests/shared/formats/samples');

/** What a command printed and how it ended. */
export interface Run {
  status: number | null;
  stdout: string;
  stderr: string;
}

/**
 * Runs `node <launcher> ...args` from the repository root, the way `npm run pointfold` does, to
 * its end. The launcher's own variables (PF_CLI_CACHE, PF_CLI_NO_BUNDLE, PF_DEBUG) come only from
 * `env`, never from the environment the tests run in.
 */
export function runLauncher(args: string[], env: Record<string, string> = {}, launcher = LAUNCHER): Promise<Run> {
  const base = Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.startsWith('PF_')));
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [launcher, ...args], { cwd: ROOT, env: { ...base, ...env } });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString('utf8')));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString('utf8')));
    child.on('error', reject);
    child.on('close', (status) => resolve({ status, stdout, stderr }));
  });
}

/** The launcher's PF_DEBUG lines in `stderr`, and the rest. */
export function splitDebug(stderr: string): { debug: string[]; rest: string } {
  const lines = stderr.split('\n');
  return {
    debug: lines.filter((l) => l.startsWith('pointfold launcher: ')),
    rest: lines.filter((l) => !l.startsWith('pointfold launcher: ')).join('\n'),
  };
}
