import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll } from 'vitest';
import { startProcessors } from '../../../worker/processors/index';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { member, type Member } from './support';

/** What a command printed and how it ended. */
export interface ProcessResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Runs a command to its end, collecting its output (for the command-line tests). */
export function runProcess(command: string, args: string[], options: { cwd: string; env?: Record<string, string> }): Promise<ProcessResult> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: options.cwd, env: { ...process.env, ...options.env } });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (c: Buffer) => (stdout += c.toString()));
    child.stderr.on('data', (c: Buffer) => (stderr += c.toString()));
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

/** A listening app with workers, a chemist with an API token, and an empty output folder. */
export interface RunningServer {
  db: TestDatabase;
  t: TestApp;
  chemist: Member;
  out: string;
}

/**
 * Registers the hooks that start, for the test file, a listening app on a throwaway database with
 * the queue's processors running, and that tear it all down afterwards. The returned object is
 * filled in by `beforeAll`.
 */
export function useRunningServer(outPrefix: string): RunningServer {
  const ctx = {} as RunningServer;
  let processors: { close(): Promise<void> } | undefined;
  beforeAll(async () => {
    ctx.db = await createTestDatabase();
    ctx.t = await buildTestApp({ dataSource: ctx.db.dataSource });
    ctx.chemist = await member(ctx.db.dataSource, 'chemist');
    processors = await startProcessors(ctx.t.deps, { sweepIntervalMs: 1000 });
    ctx.out = mkdtempSync(join(tmpdir(), outPrefix));
  });
  afterAll(async () => {
    await processors?.close();
    await ctx.t?.close();
    await ctx.db?.drop();
    if (ctx.out) rmSync(ctx.out, { recursive: true, force: true });
  });
  return ctx;
}
