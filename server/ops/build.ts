import { spawn } from 'node:child_process';
import { existsSync, readdirSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { OpsError } from './util';

/** The inputs of the browser build: a change in any of them makes the build stale. */
export const buildInputs = ['src', 'shared', 'index.html', 'vite.config.ts', 'package-lock.json', 'tsconfig.json'];

export const stampName = '.build-stamp';

/** Newest modification time (ms) of a file or of any file below a folder; 0 when missing. */
export function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of readdirSync(path, { withFileTypes: true })) {
    if (entry.name === 'node_modules' || entry.name.startsWith('.')) continue;
    newest = Math.max(newest, newestMtime(join(path, entry.name)));
  }
  return newest;
}

/** Why the build must run ('missing' or 'stale'), or null when dist is up to date. */
export function buildNeeded(root: string, outDir: string): 'missing' | 'stale' | null {
  const stamp = join(outDir, stampName);
  if (!existsSync(stamp) || !existsSync(join(outDir, 'index.html'))) return 'missing';
  const built = statSync(stamp).mtimeMs;
  return buildInputs.some((p) => newestMtime(join(root, p)) > built) ? 'stale' : null;
}

/**
 * Runs `vite build` into `outDir` and stamps it with the time the build STARTED, so an edit
 * made during the build still counts as newer next time.
 */
export async function buildWeb(root: string, outDir: string, log: (line: string) => void): Promise<void> {
  const started = new Date();
  const output: string[] = [];
  const code = await new Promise<number>((resolve) => {
    const child = spawn(process.execPath, [join(root, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', outDir, '--emptyOutDir', '--logLevel', 'warn'], {
      cwd: root,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const keep = (d: Buffer) => output.push(d.toString());
    child.stdout.on('data', keep);
    child.stderr.on('data', keep);
    child.once('exit', (c) => resolve(c ?? 1));
    child.once('error', () => resolve(1));
  });
  if (code !== 0) {
    const text = output.join('').trim();
    log(text.split('\n').slice(-25).join('\n'));
    throw new OpsError('the browser build (vite build) failed', 'see the error above; fix it in src/ and start again');
  }
  const stamp = join(outDir, stampName);
  writeFileSync(stamp, `${started.toISOString()}\n`);
  utimesSync(stamp, started, started);
}
