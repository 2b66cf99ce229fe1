import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { startProcessors } from '../../../worker/processors/index';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { member, type Member } from './support';

/* examples/submit-demo.sh runs in CI, against a test server, so the example cannot rot. */

const repoRoot = fileURLToPath(new URL('../../..', import.meta.url));
let db: TestDatabase;
let t: TestApp;
let processors: { close(): Promise<void> };
let chemist: Member;
let out: string;

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  chemist = await member(db.dataSource, 'chemist');
  processors = await startProcessors(t.deps, { sweepIntervalMs: 1000 });
  out = mkdtempSync(join(tmpdir(), 'pf-example-'));
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await db?.drop();
  rmSync(out, { recursive: true, force: true });
});

it('examples/submit-demo.sh submits the demo screen and gets the expected groups and flags back', async () => {
  const run = await new Promise<{ code: number | null; stdout: string; stderr: string }>((resolve) => {
    const child = spawn('bash', ['examples/submit-demo.sh', out], {
      cwd: repoRoot,
      env: { ...process.env, POINTFOLD_SERVER: t.url, POINTFOLD_TOKEN: chemist.token },
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (c: Buffer) => (stdout += c.toString()));
    child.stderr.on('data', (c: Buffer) => (stderr += c.toString()));
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
  expect(run.code, run.stderr + run.stdout).toBe(0);
  expect(run.stdout).toContain('36 snapped, 1 not');
  expect(run.stdout).toMatch(/C06 hexachlorocuprate \(elongated\)\s+Oh\s+→ Oh/);
  expect(existsSync(join(out, 'manifest.json'))).toBe(true);
  expect(existsSync(join(out, 'summary.csv'))).toBe(true);
}, 180_000);
