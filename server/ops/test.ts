// `npm test`: from a fresh clone, sets up throwaway PostgreSQL and Redis on the test ports,
// then runs the type check, the lint and every vitest suite (engine, API, worker, web, browser),
// prints `N passed, N failed` on a line of its own, and leaves no process behind.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { onStopSignals, reportError, say } from './cli-support';
import { acquireLock } from './lock';
import { repoRoot, resolveStackDirs, type StackDirs } from './paths';
import { ensureDatabase, ensurePostgres, stopLeftoverPostgres, type RunningPostgres } from './postgres';
import { killRecordedChildren, signalGroup } from './processes';
import { ensureRedis, stopLeftoverRedis, type RunningRedis } from './redis';
import { testPorts } from './stack';
import { ensureDebianPackages, ensurePostgresUser } from './system';
import { watchParent } from './parent-watch';

interface StepResult {
  name: string;
  passed: number;
  failed: number;
  skipped: number;
  note?: string;
}

const results: StepResult[] = [];
const running = new Set<ChildProcess>();
let postgres: RunningPostgres | undefined;
let redis: RunningRedis | undefined;
let dirs: StackDirs | undefined;
let releaseLock: (() => void) | undefined;
let finishing = false;

/** Runs a program in its own process group (so Ctrl-C and the clean-up can stop all of it); resolves with its exit code. */
function step(file: string, args: string[], env: NodeJS.ProcessEnv): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(file, args, { cwd: repoRoot, env, stdio: ['ignore', 'inherit', 'inherit'], detached: true });
    running.add(child);
    child.once('exit', (code, signal) => {
      running.delete(child);
      // Whatever it left in its group (a browser, a stray worker) goes too.
      if (child.pid) signalGroup(child.pid, 'SIGKILL');
      resolve(code ?? (signal ? 128 : 1));
    });
    child.once('error', (err) => {
      running.delete(child);
      say(`could not run ${file}: ${err.message}`);
      resolve(1);
    });
  });
}

/** Stops every process this run started and everything left in the test data folders. */
async function cleanUp(): Promise<void> {
  for (const child of running) if (child.pid) signalGroup(child.pid, 'SIGTERM');
  await new Promise((r) => setTimeout(r, running.size > 0 ? 1500 : 0));
  for (const child of running) if (child.pid) signalGroup(child.pid, 'SIGKILL');
  if (dirs) for (const file of childRecordFiles(dirs.stateDir)) await killRecordedChildren(file);
  await Promise.allSettled([redis?.stop(), postgres?.stop()]);
  releaseLock?.();
}

/** children.json files of stacks started under the test folder (the browser tests' stack). */
function childRecordFiles(stateDir: string): string[] {
  const found: string[] = [];
  const walk = (dir: string, depth: number) => {
    if (depth > 3 || !existsSync(dir)) return;
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      if (e.isDirectory() && e.name !== 'artifacts' && e.name !== 'pg') walk(join(dir, e.name), depth + 1);
      else if (e.name === 'children.json') found.push(join(dir, e.name));
    }
  };
  walk(stateDir, 0);
  return found;
}

function summarise(): { passed: number; failed: number; skipped: number } {
  return results.reduce((t, r) => ({ passed: t.passed + r.passed, failed: t.failed + r.failed, skipped: t.skipped + r.skipped }), {
    passed: 0,
    failed: 0,
    skipped: 0,
  });
}

async function finish(code: number, why?: string): Promise<never> {
  if (finishing) return new Promise<never>(() => {});
  finishing = true;
  if (why) say(why);
  await cleanUp().catch(reportError);
  const total = summarise();
  process.stdout.write('\n');
  for (const r of results) {
    process.stdout.write(`  ${r.failed > 0 ? '✗' : '✓'} ${r.name.padEnd(10)} ${r.passed} passed, ${r.failed} failed${r.skipped ? `, ${r.skipped} skipped` : ''}${r.note ? ` (${r.note})` : ''}\n`);
  }
  const failed = total.failed + (code !== 0 && total.failed === 0 ? 1 : 0);
  process.stdout.write(`${total.passed} passed, ${failed} failed${total.skipped ? `, ${total.skipped} skipped` : ''}\n`);
  process.exit(failed > 0 ? code || 1 : 0);
}

onStopSignals(
  () => void finish(130, 'interrupted: stopping everything the tests started …'),
  () => process.exit(130),
);
watchParent(() => void finish(1, 'the launching process is gone: stopping everything …'), { PF_PARENT_PID: String(process.ppid) });

/**
 * Counts from vitest's JSON report (written even when tests fail). A file that failed without a
 * failing test (an import error, a crashed setup) counts as one failure, so it cannot hide.
 */
function vitestCounts(file: string): { passed: number; failed: number; skipped: number; filesFailed: number } | null {
  try {
    const report = JSON.parse(readFileSync(file, 'utf8')) as {
      numPassedTests: number;
      numFailedTests: number;
      numPendingTests: number;
      numTodoTests: number;
      testResults: { status: string; assertionResults: { status: string }[] }[];
    };
    const failedFiles = report.testResults.filter((t) => t.status === 'failed');
    const silentFailures = failedFiles.filter((t) => !t.assertionResults.some((a) => a.status === 'failed')).length;
    return {
      passed: report.numPassedTests,
      failed: report.numFailedTests + silentFailures,
      skipped: report.numPendingTests + report.numTodoTests,
      filesFailed: failedFiles.length,
    };
  } catch {
    return null;
  }
}

async function main() {
  const started = Date.now();
  const ports = testPorts();
  await ensureDebianPackages(['postgresql', 'redis-server', 'chromium'], say);
  await ensurePostgresUser(say);
  dirs = await resolveStackDirs('.test-data');
  const lock = await acquireLock(join(dirs.stateDir, 'test.lock'), 'npm test', say);
  releaseLock = lock.release;

  // Throwaway data: stop whatever an earlier (killed) run left, then wipe.
  for (const file of childRecordFiles(dirs.stateDir)) await killRecordedChildren(file);
  await stopLeftoverPostgres(join(dirs.serviceDir, 'pg'));
  await stopLeftoverRedis(join(dirs.serviceDir, 'redis'));
  for (const entry of readdirSync(dirs.stateDir)) {
    if (entry !== 'test.lock') rmSync(join(dirs.stateDir, entry), { recursive: true, force: true });
  }
  if (dirs.relocated) {
    rmSync(dirs.serviceDir, { recursive: true, force: true });
    say(`the postgres user cannot reach the repository folder, so the test database lives in ${dirs.serviceDir}`);
  }
  mkdirSync(join(dirs.stateDir, 'artifacts'), { recursive: true });

  say(`starting PostgreSQL (127.0.0.1:${ports.postgres}) and Redis (127.0.0.1:${ports.redis}) on throwaway data`);
  const serviceStarts = await Promise.allSettled([
    ensurePostgres({ dataDir: join(dirs.serviceDir, 'pg'), runDir: join(dirs.serviceDir, 'run'), port: ports.postgres, fsync: false, log: say }),
    ensureRedis({ dir: join(dirs.serviceDir, 'redis'), port: ports.redis, persist: false, log: say }),
  ]);
  if (serviceStarts[0].status === 'fulfilled') postgres = serviceStarts[0].value;
  if (serviceStarts[1].status === 'fulfilled') redis = serviceStarts[1].value;
  for (const s of serviceStarts) if (s.status === 'rejected') throw s.reason;
  const databaseUrl = `${postgres!.url}/pointfold_test`;
  await ensureDatabase(databaseUrl, 'pointfold_test');

  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: databaseUrl,
    REDIS_URL: redis!.url,
    QUEUE_PREFIX: 'pf-test',
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
    PF_TEST_DATA: dirs.stateDir,
    PF_TEST_SERVICES: '1',
    PF_TEST_PORT_BASE: String(ports.app - 80),
  };
  const bin = (p: string) => join(repoRoot, 'node_modules', p);

  say('type check (tsc --noEmit) and lint (eslint), side by side');
  const [tscCode, lintCode] = await Promise.all([
    step(process.execPath, [bin('typescript/bin/tsc'), '--noEmit', '-p', '.'], env),
    step(process.execPath, [bin('eslint/bin/eslint.js'), '.'], env),
  ]);
  results.push({ name: 'typecheck', passed: tscCode === 0 ? 1 : 0, failed: tscCode === 0 ? 0 : 1, skipped: 0 });
  results.push({ name: 'lint', passed: lintCode === 0 ? 1 : 0, failed: lintCode === 0 ? 0 : 1, skipped: 0 });
  if (finishing) return;

  say('vitest: engine, API (real PostgreSQL), worker (real Redis), web, browser (Chromium)');
  const report = join(dirs.stateDir, 'vitest-report.json');
  const vitestCode = await step(process.execPath, [bin('vitest/vitest.mjs'), 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`], env);
  if (finishing) return;
  const counts = vitestCounts(report);
  if (counts) {
    results.push({
      name: 'vitest',
      passed: counts.passed,
      failed: counts.failed,
      skipped: counts.skipped,
      note: counts.filesFailed > 0 ? `${counts.filesFailed} test file(s) failed` : undefined,
    });
  } else {
    results.push({ name: 'vitest', passed: 0, failed: 1, skipped: 0, note: `no report; exit code ${vitestCode}` });
  }
  if (vitestCode !== 0 && counts && counts.failed === 0) {
    results.push({ name: 'vitest-run', passed: 0, failed: 1, skipped: 0, note: `vitest exited ${vitestCode} (see above)` });
  }
  say(`finished in ${Math.round((Date.now() - started) / 1000)} s`);
  const anyFailed = results.some((r) => r.failed > 0);
  await finish(anyFailed ? 1 : 0);
}

main().catch(async (err) => {
  reportError(err);
  results.push({ name: 'setup', passed: 0, failed: 1, skipped: 0, note: 'see the error above' });
  await finish(1);
});
