import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import net from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { buildNeeded, stampName } from '../../../server/ops/build';
import { judgeLock, launcherPids } from '../../../server/ops/lock';
import { chooseServiceDir, relocatedServiceDir } from '../../../server/ops/paths';
import { assertPortsFree, isPortFree, isPortOpen } from '../../../server/ops/ports';
import { isStalePostmasterLock, readPostmasterLock } from '../../../server/ops/postgres';
import { formatLogLine, lastWords } from '../../../server/ops/processes';
import { localServices, testPorts, TEST_PORTS } from '../../../server/ops/stack';
import { installBlocker } from '../../../server/ops/system';
import { OpsError, isLoopbackHost } from '../../../server/ops/util';

const scratch = mkdtempSync(join(tmpdir(), 'pf-ops-test-'));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

describe('stale PostgreSQL lock files', () => {
  const dataDir = join(scratch, 'pg');
  mkdirSync(dataDir, { recursive: true });
  // The layout PostgreSQL writes: pid, data dir, start time, port, socket dir, listen address, …
  writeFileSync(join(dataDir, 'postmaster.pid'), `4242\n${dataDir}\n1700000000\n4332\n/tmp\n127.0.0.1\n  1234   5678\nready\n`);

  it('reads the pid and the port from postmaster.pid', () => {
    expect(readPostmasterLock(dataDir)).toEqual({ pid: 4242, port: 4332 });
    expect(readPostmasterLock(join(scratch, 'nowhere'))).toBeNull();
  });

  it('calls a lock stale when its process is dead (a killed run)', () => {
    expect(isStalePostmasterLock({ pid: 4242, port: 4332 }, () => false, () => '')).toBe(true);
  });

  it('calls a lock stale when its pid now belongs to some other program', () => {
    expect(isStalePostmasterLock({ pid: 4242, port: 4332 }, () => true, () => 'sleep 100')).toBe(true);
  });

  it('keeps a lock held by a live postgres process', () => {
    expect(isStalePostmasterLock({ pid: 4242, port: 4332 }, () => true, () => '/usr/lib/postgresql/15/bin/postgres -D x')).toBe(false);
  });

  it('calls the lock of a pid that cannot exist stale, with the real process table', () => {
    expect(isStalePostmasterLock({ pid: 2 ** 22 + 1, port: 1 })).toBe(true);
  });
});

describe('the npm start lock', () => {
  const info = { pid: 100, launchers: [101, 102], startedAt: '' };
  const cmd = () => 'node --import tsx server/ops/start.ts';
  it('is held while the owner and its launchers live', () => {
    expect(judgeLock(info, () => true, cmd)).toBe('held');
  });
  it('is abandoned when npm (a launcher) was killed but the owner still runs', () => {
    expect(judgeLock(info, (pid) => pid !== 102, cmd)).toBe('abandoned');
  });
  it('is stale when the owner is gone, or its pid was recycled', () => {
    expect(judgeLock(info, (pid) => pid !== 100, cmd)).toBe('stale');
    expect(judgeLock(info, () => true, () => 'vim notes.txt')).toBe('stale');
  });
  it('reads the launcher pids passed down by bootstrap.mjs', () => {
    expect(launcherPids({ PF_LAUNCHER_PIDS: '10,1,x,20' })).toEqual([10, 20]);
    expect(launcherPids({})).toEqual([]);
  });
});

describe('port checks', () => {
  it('sees a port held by a listener as taken, and free once it closes', async () => {
    const server = net.createServer();
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    const port = (server.address() as net.AddressInfo).port;
    expect(await isPortFree(port)).toBe(false);
    expect(await isPortOpen(port)).toBe(true);
    await expect(assertPortsFree([{ port, what: 'the app', variable: 'PORT' }])).rejects.toSatisfy(
      (e: unknown) => e instanceof OpsError && !e.oneLine().includes('\n') && e.oneLine().includes(`port ${port}`) && e.oneLine().includes('PORT'),
    );
    await new Promise<void>((r) => server.close(() => r()));
    expect(await isPortFree(port)).toBe(true);
    expect(await isPortOpen(port)).toBe(false);
  });
});

describe('where the data lives', () => {
  it('stays in the repository when the postgres user can reach it', () => {
    expect(chooseServiceDir('/srv/pf/.data', '/srv/pf', 'data', true)).toEqual({ stateDir: '/srv/pf/.data', serviceDir: '/srv/pf/.data', relocated: false });
  });
  it('moves to /var/tmp/pointfold-<hash of the repo path>/ when it cannot (a clone under /root)', () => {
    const dirs = chooseServiceDir('/root/pf/.data', '/root/pf', 'data', false);
    expect(dirs.relocated).toBe(true);
    expect(dirs.serviceDir).toMatch(/^\/var\/tmp\/pointfold-[0-9a-f]{12}\/data$/);
    expect(relocatedServiceDir('/root/pf', 'data')).toBe(dirs.serviceDir);
    expect(relocatedServiceDir('/root/other', 'data')).not.toBe(dirs.serviceDir);
  });
});

describe('which services npm start runs itself', () => {
  it('runs PostgreSQL and Redis for loopback URLs, and neither for external hosts or PF_EXTERNAL_SERVICES', () => {
    expect(localServices({ databaseUrl: 'postgres://postgres@127.0.0.1:4332/p', redisUrl: 'redis://localhost:4379', external: false })).toEqual({ postgres: true, redis: true });
    expect(localServices({ databaseUrl: 'postgres://u:p@db.internal:5432/p', redisUrl: 'redis://127.0.0.1:4379', external: false })).toEqual({ postgres: false, redis: true });
    expect(localServices({ databaseUrl: 'postgres://postgres@127.0.0.1:4332/p', redisUrl: 'redis://127.0.0.1:4379', external: true })).toEqual({ postgres: false, redis: false });
    expect(isLoopbackHost('[::1]')).toBe(true);
    expect(isLoopbackHost('10.0.0.5')).toBe(false);
  });
  it('shifts every test port together with PF_TEST_PORT_BASE, and rejects a silly base in one line', () => {
    expect(testPorts({})).toEqual(TEST_PORTS);
    expect(testPorts({ PF_TEST_PORT_BASE: '5400' }).app).toBe(5480);
    expect(testPorts({ PF_TEST_PORT_BASE: '5400' }).postgres).toBe(5442);
    expect(() => testPorts({ PF_TEST_PORT_BASE: 'lots' })).toThrow(OpsError);
  });
});

describe('missing system packages', () => {
  it('goes ahead as root with apt-get, and says what to run otherwise', () => {
    expect(installBlocker([], false, false)).toBeNull();
    expect(installBlocker(['postgresql'], true, true)).toBeNull();
    expect(installBlocker(['postgresql', 'redis-server'], false, true)?.oneLine()).toContain('sudo apt-get install -y postgresql redis-server');
    expect(installBlocker(['redis-server'], true, false)?.oneLine()).toContain('apt-get is not available');
  });
});

describe('browser build freshness', () => {
  it('is missing without a stamp, fresh after one, stale when a source file is newer', () => {
    const root = join(scratch, 'repo');
    const out = join(root, 'dist', 'web');
    mkdirSync(join(root, 'src'), { recursive: true });
    mkdirSync(out, { recursive: true });
    writeFileSync(join(root, 'src', 'main.tsx'), 'x');
    const past = new Date(Date.now() - 60_000);
    utimesSync(join(root, 'src', 'main.tsx'), past, past);
    utimesSync(join(root, 'src'), past, past);
    expect(buildNeeded(root, out)).toBe('missing');
    writeFileSync(join(out, 'index.html'), '<html>');
    writeFileSync(join(out, stampName), 'now');
    expect(buildNeeded(root, out)).toBeNull();
    const future = new Date(Date.now() + 60_000);
    utimesSync(join(root, 'src', 'main.tsx'), future, future);
    expect(buildNeeded(root, out)).toBe('stale');
  });
});

describe('child process output', () => {
  it('renders pino JSON lines readably and passes other lines through', () => {
    expect(formatLogLine('{"level":30,"time":1,"pid":1,"hostname":"h","name":"api","msg":"API listening","url":"http://x"}')).toBe('info  API listening url=http://x');
    expect(formatLogLine('plain text')).toBe('plain text');
  });
  it('picks the error line out of a crash, not the Node version footer', () => {
    const tail = ["Error [ERR_MODULE_NOT_FOUND]: Cannot find package '@shared/x'", '    at resolve (x.js:1:1)', '}', '', 'Node.js v20.20.2'];
    expect(lastWords(tail)).toContain('ERR_MODULE_NOT_FOUND');
  });
});
