import { createHash } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { canUserReach, currentUserIsRoot } from './system';

/** The repository root (this file lives in server/ops/). */
export const repoRoot = resolve(fileURLToPath(new URL('.', import.meta.url)), '..', '..');

/**
 * Where one stack keeps its things. `stateDir` is always inside the repository (lock, logs,
 * artefacts); `serviceDir` holds the PostgreSQL cluster and Redis data and moves to /var/tmp
 * when the `postgres` user cannot reach the repository (a clone under mode-700 /root, say).
 */
export interface StackDirs {
  stateDir: string;
  serviceDir: string;
  /** True when serviceDir had to move out of the repository. */
  relocated: boolean;
}

/** /var/tmp/pointfold-<first 12 hex of sha256(repo path)>/<name>: stable for one clone, distinct for two. */
export function relocatedServiceDir(root: string, name: string): string {
  const hash = createHash('sha256').update(root).digest('hex').slice(0, 12);
  return join('/var/tmp', `pointfold-${hash}`, name);
}

/** The pure decision: inside the repository when reachable by the service user, else /var/tmp. */
export function chooseServiceDir(stateDir: string, root: string, name: string, reachable: boolean): StackDirs {
  return reachable
    ? { stateDir, serviceDir: stateDir, relocated: false }
    : { stateDir, serviceDir: relocatedServiceDir(root, name), relocated: true };
}

/**
 * Resolves the folders of a stack named `name` (`.data` for `npm start`, `.test-data` for
 * `npm test`). As root, PostgreSQL runs as `postgres`, which must be able to traverse every
 * directory down to its data folder; as another user it runs as that user.
 */
export async function resolveStackDirs(name: string, root = repoRoot): Promise<StackDirs> {
  const stateDir = join(root, name);
  mkdirSync(stateDir, { recursive: true, mode: 0o755 });
  const reachable = !currentUserIsRoot() || (await canUserReach('postgres', stateDir));
  return chooseServiceDir(stateDir, root, name.replace(/^\./, ''), reachable);
}
