import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, symlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROOT, runLauncher, SAMPLES, splitDebug, type Run } from './run-cli';

/**
 * server/cli/launch.mjs, what `npm run pointfold` starts: it builds an esbuild bundle of the
 * command line into a cache on the first run, reuses it while no input file changed, rebuilds
 * when one did, and runs the TypeScript through tsx when asked to (PF_CLI_NO_BUNDLE) or when no
 * bundle can be built. Each test uses a cache folder of its own (PF_CLI_CACHE). Tests that change
 * an input do it in a copy of the sources in a temporary folder, with the copy's own launcher,
 * never in the repository.
 */

let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'pf-launch-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

interface Manifest {
  dir: string;
  entry: string;
  root: string;
  inputs: Record<string, [number, number]>;
}
const readManifest = (cache: string) => JSON.parse(readFileSync(join(cache, 'manifest.json'), 'utf8')) as Manifest;
const builds = (cache: string) => readdirSync(cache).filter((n) => n.startsWith('build-')).sort();
const sample = (name: string) => join(SAMPLES, name);
const SNAP = ['snap', sample('ligands.xyz'), sample('ligands.sdf'), sample('benzene.pdb'), '--json'];

/** A copy of what the command line is built from, with node_modules linked to the repository's. */
function copyOfSources(name: string): string {
  const dir = join(tmp, name);
  for (const part of ['server', 'shared', 'tsconfig.json', 'package.json']) cpSync(join(ROOT, part), join(dir, part), { recursive: true });
  symlinkSync(join(ROOT, 'node_modules'), join(dir, 'node_modules'), 'dir');
  return dir;
}

/** Replace `from` (which must occur) by `to` in a file of a copy. */
function edit(file: string, from: string, to: string): void {
  const text = readFileSync(file, 'utf8');
  expect(text, `${file} should contain ${from}`).toContain(from);
  writeFileSync(file, text.replace(from, to));
}

describe('the cached bundle', () => {
  let cache: string;
  let first: Run;
  beforeAll(async () => {
    cache = join(tmp, 'cache');
    first = await runLauncher(SNAP, { PF_CLI_CACHE: cache, PF_DEBUG: '1' });
  });

  it('is built on the first run, with a manifest of its inputs', () => {
    const { debug } = splitDebug(first.stderr);
    expect(debug[0]).toBe('pointfold launcher: building the bundle: no readable manifest');
    expect(debug[1]).toMatch(/^pointfold launcher: built build-\w+ in [\d.]+ ms \(\d+ inputs\)$/);
    const manifest = readManifest(cache);
    expect(manifest.root).toBe(ROOT.replace(/\/$/, ''));
    expect(builds(cache)).toEqual([manifest.dir]);
    expect(existsSync(join(cache, manifest.dir, manifest.entry))).toBe(true);
    // The inputs are the files the bundle was made from, with their sizes.
    for (const file of ['server/cli/index.ts', 'server/cli/snap-command.ts', 'server/cli/submit.ts', 'server/cli/token.ts', 'shared/engine/index.ts', 'tsconfig.json', 'server/cli/launch.mjs']) {
      expect(manifest.inputs[file]?.[1], file).toBe(statSync(join(ROOT, file)).size);
    }
    // node_modules stay outside the bundle, except zod (BUNDLED_PACKAGES in launch.mjs).
    const packages = Object.keys(manifest.inputs).filter((f) => f.includes('node_modules/') && !f.endsWith('esbuild/package.json'));
    expect(packages.filter((f) => !f.startsWith('node_modules/zod/'))).toEqual([]);
    expect(packages).toContain('node_modules/zod/index.js');
  });

  it('gives the same snap --json output, messages and exit status as the TypeScript through tsx', async () => {
    const viaTsx = await runLauncher(SNAP, { PF_CLI_CACHE: join(tmp, 'unused-cache'), PF_CLI_NO_BUNDLE: '1', PF_DEBUG: '1' });
    expect(splitDebug(viaTsx.stderr).debug).toEqual(['pointfold launcher: running the TypeScript through tsx (PF_CLI_NO_BUNDLE is set)']);
    expect(existsSync(join(tmp, 'unused-cache'))).toBe(false);
    expect(first.status).toBe(1); // two short frames among the samples
    expect(viaTsx.status).toBe(1);
    const structures = (JSON.parse(first.stdout) as { structures: { pointGroup?: string }[] }).structures;
    expect(structures.map((s) => s.pointGroup ?? null)).toEqual(['C2v', 'C3v', null, 'Td', 'Td', 'Td', null, 'C2v', 'D6h', 'D6h']);
    expect(first.stdout).toBe(viaTsx.stdout);
    expect(splitDebug(first.stderr).rest).toBe(splitDebug(viaTsx.stderr).rest);
    expect(splitDebug(first.stderr).rest).toContain(`${sample('ligands.xyz')}:25: frame 3: expected 12 atom lines, found 11`);
  });

  it('is reused by the next run without a rebuild', async () => {
    const manifestBefore = readFileSync(join(cache, 'manifest.json'), 'utf8');
    const mtimeBefore = statSync(join(cache, 'manifest.json')).mtimeMs;
    const buildsBefore = builds(cache);
    const run = await runLauncher(['--help'], { PF_CLI_CACHE: cache, PF_DEBUG: '1' });
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^Usage: pointfold <command> \[options\]/);
    const dir = readManifest(cache).dir;
    expect(splitDebug(run.stderr).debug).toEqual([
      expect.stringMatching(new RegExp(`^pointfold launcher: bundle ${dir} is up to date \\(\\d+ inputs checked in [\\d.]+ ms\\)$`)),
    ]);
    expect(readFileSync(join(cache, 'manifest.json'), 'utf8')).toBe(manifestBefore);
    expect(statSync(join(cache, 'manifest.json')).mtimeMs).toBe(mtimeBefore);
    expect(builds(cache)).toEqual(buildsBefore);
  });

  it('passes the exit status through: 0 done, 1 bad input, 2 usage, with and without the bundle', async () => {
    const envs: Record<string, string>[] = [{ PF_CLI_CACHE: cache }, { PF_CLI_CACHE: cache, PF_CLI_NO_BUNDLE: '1' }];
    for (const env of envs) {
      const ok = await runLauncher(['perceive', sample('benzene.pdb')], env);
      expect([ok.status, ok.stderr]).toEqual([0, '']);
      expect(ok.stdout).toContain('D6h');
      const bad = await runLauncher(['perceive', sample('ligands.sdf')], env);
      expect([bad.status, bad.stderr]).toEqual([1, `${sample('ligands.sdf')}:41: frame 3: expected 3 atom lines, found 2\n`]);
      const usage = await runLauncher(['snapp'], env);
      expect(usage.status).toBe(2);
      expect(usage.stderr).toMatch(/^pointfold: unknown command 'snapp'/);
      const bare = await runLauncher([], env);
      expect(bare.status).toBe(2);
      expect(bare.stdout).toMatch(/^Usage: pointfold/);
    }
  });
});

describe('a changed input', () => {
  let copy: string;
  let cache: string;
  beforeAll(() => {
    copy = copyOfSources('changed');
    cache = join(tmp, 'changed-cache');
  });
  const launch = (args: string[]) => runLauncher(args, { PF_CLI_CACHE: cache, PF_DEBUG: '1' }, join(copy, 'server/cli/launch.mjs'));

  it('makes the next run rebuild, run the new code and keep the old build for processes still using it', async () => {
    const built = await launch(['--help']);
    expect(built.status).toBe(0);
    expect(splitDebug(built.stderr).debug[0]).toBe('pointfold launcher: building the bundle: no readable manifest');
    const before = readManifest(cache);
    expect(before.root).toBe(copy);

    edit(join(copy, 'server/cli/index.ts'), 'Usage: pointfold <command> [options]', 'Usage: pointfold <command> [options] (edited copy)');
    const rebuilt = await launch(['--help']);
    expect(rebuilt.status).toBe(0);
    expect(rebuilt.stdout.split('\n')[0]).toBe('Usage: pointfold <command> [options] (edited copy)');
    expect(splitDebug(rebuilt.stderr).debug[0]).toBe('pointfold launcher: building the bundle: server/cli/index.ts changed');
    const after = readManifest(cache);
    expect(after.dir).not.toBe(before.dir);
    expect(builds(cache)).toEqual([before.dir, after.dir].sort());

    // A file deep in the graph counts too, even one --help never loads.
    edit(join(copy, 'shared/formats/xyz.ts'), '\n', '\n// edited copy\n');
    const deep = await launch(['--help']);
    expect(splitDebug(deep.stderr).debug[0]).toBe('pointfold launcher: building the bundle: shared/formats/xyz.ts changed');

    const again = await launch(['--help']);
    expect(splitDebug(again.stderr).debug).toEqual([expect.stringMatching(/^pointfold launcher: bundle build-\w+ is up to date/)]);
    expect(again.stdout).toBe(rebuilt.stdout);
  });

  it('that breaks the build falls back to tsx, which still runs what does not need the missing part', async () => {
    const broken = copyOfSources('broken');
    rmSync(join(broken, 'server/cli/token.ts')); // esbuild cannot resolve ./token; tsx loads it only for `token`
    const brokenCache = join(tmp, 'broken-cache');
    const run = await runLauncher(['perceive', sample('benzene.pdb'), '--json'], { PF_CLI_CACHE: brokenCache, PF_DEBUG: '1' }, join(broken, 'server/cli/launch.mjs'));
    const { debug, rest } = splitDebug(run.stderr);
    expect(debug[0]).toBe('pointfold launcher: building the bundle: no readable manifest');
    expect(debug[1]).toMatch(/^pointfold launcher: running the TypeScript through tsx \(no bundle: Build failed with 1 error/);
    expect([run.status, rest]).toEqual([0, '']);
    expect((JSON.parse(run.stdout) as { structures: { pointGroup: string }[] }).structures.map((s) => s.pointGroup)).toEqual(['D6h', 'D6h']);
    expect(existsSync(join(brokenCache, 'manifest.json'))).toBe(false);
    expect(builds(brokenCache)).toEqual([]);
    // Without PF_DEBUG the fallback is silent.
    const quiet = await runLauncher(['--help'], { PF_CLI_CACHE: brokenCache }, join(broken, 'server/cli/launch.mjs'));
    expect([quiet.status, quiet.stderr]).toEqual([0, '']);
  });

  it('with a bug of ours: exit status 70 and the stack, pointing at the TypeScript source under PF_DEBUG', async () => {
    const buggy = copyOfSources('buggy');
    edit(
      join(buggy, 'server/cli/index.ts'),
      "perceive: async () => (await import('./perceive-command')).runPerceive,",
      "perceive: async () => { throw new Error('injected fault'); },",
    );
    const buggyCache = join(tmp, 'buggy-cache');
    const launcher = join(buggy, 'server/cli/launch.mjs');
    const run = await runLauncher(['perceive', sample('benzene.pdb')], { PF_CLI_CACHE: buggyCache }, launcher);
    expect(run.status).toBe(70);
    expect(run.stderr).toMatch(/^pointfold: internal error: Error: injected fault\n\s+at /);
    const debug = await runLauncher(['perceive', sample('benzene.pdb')], { PF_CLI_CACHE: buggyCache, PF_DEBUG: '1' }, launcher);
    expect(debug.status).toBe(70);
    expect(splitDebug(debug.stderr).rest).toContain(`${join(buggy, 'server/cli/index.ts')}:`);
  });

  it('removes build folders only once nothing can be loading from them', async () => {
    const copy2 = copyOfSources('cleanup');
    const cache2 = join(tmp, 'cleanup-cache');
    const launch2 = (args: string[]) => runLauncher(args, { PF_CLI_CACHE: cache2, PF_DEBUG: '1' }, join(copy2, 'server/cli/launch.mjs'));
    expect((await launch2(['--help'])).status).toBe(0);
    const current = readManifest(cache2).dir;
    // A build superseded long ago, and one some other process may be writing right now.
    const hoursAgo = (h: number) => new Date(Date.now() - h * 3600_000);
    for (const [name, age] of [['build-superseded', 3], ['build-in-progress', 0]] as const) {
      mkdirSync(join(cache2, name));
      writeFileSync(join(cache2, name, 'index.mjs'), '');
      utimesSync(join(cache2, name), hoursAgo(age), hoursAgo(age));
    }

    // The current manifest is fresh: a process may have read the one before it a moment ago and
    // still be loading from the superseded build, so nothing goes.
    edit(join(copy2, 'server/cli/output.ts'), '\n', '\n// edit 1\n');
    await launch2(['--help']);
    const second = readManifest(cache2).dir;
    expect(builds(cache2)).toEqual(['build-in-progress', 'build-superseded', current, second].sort());

    // Two hours later (the manifest's mtime moved back): every build but the last two and the
    // young one goes.
    utimesSync(join(cache2, 'manifest.json'), hoursAgo(2), hoursAgo(2));
    for (const dir of [current, second]) utimesSync(join(cache2, dir), hoursAgo(2), hoursAgo(2));
    edit(join(copy2, 'server/cli/output.ts'), '\n', '\n// edit 2\n');
    const third = await launch2(['--help']);
    expect(third.status).toBe(0);
    expect(splitDebug(third.stderr).debug).toContain('pointfold launcher: removed build-superseded');
    expect(splitDebug(third.stderr).debug).toContain(`pointfold launcher: removed ${current}`);
    expect(builds(cache2)).toEqual(['build-in-progress', second, readManifest(cache2).dir].sort());
  });
});

describe('several jobs starting at once on an empty cache', () => {
  it('each build into a folder of their own, all run, and the manifest names a complete build', async () => {
    const cache = join(tmp, 'crowd-cache');
    const runs = await Promise.all(Array.from({ length: 4 }, () => runLauncher(['perceive', sample('benzene.pdb'), '--json'], { PF_CLI_CACHE: cache })));
    for (const run of runs) {
      expect([run.status, run.stderr]).toEqual([0, '']);
      expect((JSON.parse(run.stdout) as { structures: { pointGroup: string }[] }).structures.map((s) => s.pointGroup)).toEqual(['D6h', 'D6h']);
    }
    const manifest = readManifest(cache);
    expect(builds(cache)).toContain(manifest.dir);
    expect(readdirSync(cache).filter((n) => n.endsWith('.tmp'))).toEqual([]);
    const next = await runLauncher(['--help'], { PF_CLI_CACHE: cache, PF_DEBUG: '1' });
    expect(splitDebug(next.stderr).debug).toEqual([expect.stringMatching(new RegExp(`^pointfold launcher: bundle ${manifest.dir} is up to date`))]);
  });
});
