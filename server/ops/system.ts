import { existsSync, unlinkSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { OpsError, run } from './util';

export const currentUserIsRoot = () => process.getuid?.() === 0;

/** Debian packages that are not installed (dpkg's status is not "install ok installed"). */
export async function missingDebianPackages(names: string[]): Promise<string[]> {
  const missing: string[] = [];
  for (const name of names) {
    try {
      const r = await run('dpkg-query', ['-W', '-f=${Status}', name]);
      if (r.code !== 0 || !r.stdout.includes('install ok installed')) missing.push(name);
    } catch {
      missing.push(name);
    }
  }
  return missing;
}

/** What to say when packages are missing and we cannot install them; null when we can go ahead. */
export function installBlocker(missing: string[], isRoot: boolean, hasAptGet: boolean): OpsError | null {
  if (missing.length === 0) return null;
  const list = missing.join(' ');
  if (!hasAptGet) {
    return new OpsError(
      `the system packages ${list} are missing and apt-get is not available (this needs a Debian-like system)`,
      `install them with your package manager, or point DATABASE_URL and REDIS_URL at running servers (PF_EXTERNAL_SERVICES=1)`,
    );
  }
  if (!isRoot) {
    return new OpsError(`the system packages ${list} are missing and installing them needs root`, `run \`sudo apt-get install -y ${list}\` once, then try again`);
  }
  return null;
}

/**
 * Installs missing Debian packages (`apt-get update` once, then `apt-get install -y`). Service
 * start-up by the packages' own scripts is held back with a temporary policy-rc.d, so a fresh
 * machine does not end up with a second PostgreSQL and Redis running on the default ports.
 */
export async function ensureDebianPackages(names: string[], log: (line: string) => void): Promise<void> {
  const missing = await missingDebianPackages(names);
  const blocker = installBlocker(missing, currentUserIsRoot(), existsSync('/usr/bin/apt-get'));
  if (blocker) throw blocker;
  if (missing.length === 0) return;
  log(`installing Debian packages: ${missing.join(' ')} (apt-get; this takes a minute on a fresh machine)`);
  const policy = '/usr/sbin/policy-rc.d';
  const ownPolicy = !existsSync(policy);
  if (ownPolicy) writeFileSync(policy, '#!/bin/sh\n# written by Pointfold npm start/test while installing packages\nexit 101\n', { mode: 0o755 });
  try {
    const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
    const update = spawnSync('apt-get', ['update', '-q'], { stdio: 'inherit', env });
    if (update.status !== 0) throw new OpsError('apt-get update failed (see above)', 'check the network access to the Debian mirrors and try again');
    const install = spawnSync('apt-get', ['install', '-y', '-q', '--no-install-recommends', ...missing], { stdio: 'inherit', env });
    if (install.status !== 0) throw new OpsError(`apt-get install ${missing.join(' ')} failed (see above)`, 'fix the apt error shown and try again');
  } finally {
    if (ownPolicy) {
      try {
        unlinkSync(policy);
      } catch {
        // already gone
      }
    }
  }
}

/** True when `user` exists on this machine. */
export async function userExists(user: string): Promise<boolean> {
  try {
    return (await run('id', ['-u', user])).code === 0;
  } catch {
    return false;
  }
}

/** Creates the `postgres` system user when missing (the Debian package normally does). */
export async function ensurePostgresUser(log: (line: string) => void): Promise<void> {
  if (!currentUserIsRoot() || (await userExists('postgres'))) return;
  log('creating the postgres system user');
  const r = await run('useradd', ['--system', '--user-group', '--home-dir', '/var/lib/postgresql', '--shell', '/bin/bash', 'postgres']);
  if (r.code !== 0) throw new OpsError(`could not create the postgres user: ${r.stderr.trim()}`, 'create it with `useradd --system postgres` and try again');
}

/** True when `user` can traverse to and list `dir` (every parent needs the x bit for them). */
export async function canUserReach(user: string, dir: string): Promise<boolean> {
  try {
    return (await run('runuser', ['-u', user, '--', 'test', '-x', dir, '-a', '-r', dir])).code === 0;
  } catch {
    return false;
  }
}
