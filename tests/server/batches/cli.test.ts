import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { runProcess, useRunningServer, type ProcessResult } from './running-server';

/*
 * The command line against a running server: `token create` on the database, `submit --wait
 * --out` through the HTTP API, and the groups it brings back compared with `pointfold snap` on
 * the same files.
 */

const repoRoot = fileURLToPath(new URL('../../..', import.meta.url));
const demo = (name: string) => join(repoRoot, 'examples/demo', name);

const cli = (args: string[], env: Record<string, string> = {}): Promise<ProcessResult> =>
  runProcess(process.execPath, ['--import', 'tsx', 'server/cli/index.ts', ...args], { cwd: repoRoot, env });

const server = useRunningServer('pf-submit-');

describe('pointfold token create', () => {
  it('prints a working API token for a member, and refuses unknown users', async () => {
    const { db, t, chemist } = server;
    const made = await cli(['token', 'create', '--email', chemist.user.email.toUpperCase()], { DATABASE_URL: db.url });
    expect(made.code, made.stderr).toBe(0);
    const token = made.stdout.trim();
    expect(token).toMatch(/^pf_[A-Za-z0-9_-]{43}$/);
    expect(made.stderr).toContain(`workspace '${chemist.workspace.slug}'`);
    const me = await fetch(`${t.url}/api/me`, { headers: { Authorization: `Bearer ${token}` } });
    expect(me.status).toBe(200);
    const nobody = await cli(['token', 'create', '--email', 'nobody@example.org'], { DATABASE_URL: db.url });
    expect(nobody.code).toBe(1);
    expect(nobody.stderr.trim()).toBe('pointfold token: no user with the e-mail nobody@example.org');
    expect((await cli(['token', 'create'], { DATABASE_URL: db.url })).code).toBe(2);
  }, 60_000);
});

describe('pointfold submit', () => {
  it('uploads, waits, unpacks cleaned files and manifest.json whose groups match pointfold snap', async () => {
    const { t, chemist, out } = server;
    const files = [demo('ligands.xyz'), demo('complexes.sdf')];
    const run = await cli(['submit', ...files, '--server', t.url, '--token', chemist.token, '--tolerance', '0.1', '--wait', '--out', out]);
    // ligands.xyz holds one unreadable frame: status 1, named on stderr, the rest delivered.
    expect(run.code, run.stderr).toBe(1);
    expect(run.stderr).toContain("ligands.xyz:31: frame 6: atom 2: coordinate '1.128O0000' is not a number");
    expect(run.stderr).toMatch(/batch done: 20 snapped/);
    const batchId = run.stdout.trim();
    expect(batchId).toMatch(/^[0-9a-f-]{36}$/);

    const written = readdirSync(out);
    expect(written).toEqual(expect.arrayContaining(['manifest.json', 'summary.csv', 'ligands-01.xyz', 'ligands-01.qcschema.json', 'complexes-6.xyz']));
    const manifest = JSON.parse(readFileSync(join(out, 'manifest.json'), 'utf8'));
    expect(manifest.batch.id).toBe(batchId);
    expect(manifest.structures).toHaveLength(21);
    for (const s of manifest.structures) for (const f of s.outputFiles) expect(existsSync(join(out, f)), f).toBe(true);

    const snapped = await cli(['snap', ...files, '--tolerance', '0.1', '--json']);
    const local: { name: string; pointGroup: string; computationalSubgroup: string }[] = JSON.parse(snapped.stdout).structures;
    const done = manifest.structures.filter((s: { status: string }) => s.status === 'done');
    expect(done).toHaveLength(20);
    for (const s of done) {
      const same = local.find((l) => l.name === s.name);
      expect(same, s.name).toBeDefined();
      expect(s.pointGroup, s.name).toBe(same!.pointGroup);
      expect(s.computationalSubgroup, s.name).toBe(same!.computationalSubgroup);
    }
  }, 120_000);

  it('exits 0 when every structure was snapped, 2 on a usage error, 1 with a bad token', async () => {
    const { t, chemist } = server;
    const ok = await cli(['submit', demo('complexes.sdf'), '--server', t.url, '--token', chemist.token, '--wait']);
    expect(ok.code, ok.stderr).toBe(0);
    const usage = await cli(['submit', demo('complexes.sdf'), '--token', chemist.token]);
    expect(usage.code).toBe(2);
    expect(usage.stderr).toContain('missing --server URL');
    const bad = await cli(['submit', demo('complexes.sdf'), '--server', t.url, '--token', 'pf_nope']);
    expect(bad.code).toBe(1);
    expect(bad.stderr.trim()).toBe('pointfold submit: The API token is unknown or revoked (HTTP 401)');
    const missing = await cli(['submit', demo('nothing.xyz'), '--server', t.url, '--token', chemist.token]);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toContain('nothing.xyz: no such file');
  }, 120_000);
});
