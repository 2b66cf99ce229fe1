import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect, it } from 'vitest';
import { runProcess, useRunningServer } from './running-server';

/* examples/submit-demo.sh runs in CI, against a test server, so the example cannot rot. */

const repoRoot = fileURLToPath(new URL('../../..', import.meta.url));
const server = useRunningServer('pf-example-');

it('examples/submit-demo.sh submits the demo screen and gets the expected groups and flags back', async () => {
  const { t, chemist, out } = server;
  const run = await runProcess('bash', ['examples/submit-demo.sh', out], {
    cwd: repoRoot,
    env: { POINTFOLD_SERVER: t.url, POINTFOLD_TOKEN: chemist.token },
  });
  expect(run.code, run.stderr + run.stdout).toBe(0);
  expect(run.stdout).toContain('36 snapped, 1 not');
  expect(run.stdout).toMatch(/C06 hexachlorocuprate \(elongated\)\s+Oh\s+→ Oh/);
  expect(existsSync(join(out, 'manifest.json'))).toBe(true);
  expect(existsSync(join(out, 'summary.csv'))).toBe(true);
}, 180_000);
