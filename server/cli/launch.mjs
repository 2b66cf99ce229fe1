// Start of `npm run pointfold` (package.json). Plain Node ESM: loading TypeScript through tsx's
// hooks costs about half a second per call, and cluster scripts call the command line once per
// job. So this file runs an esbuild bundle of server/cli/index.ts kept in a cache and rebuilt
// only when one of its input files changed; without esbuild, or when the build fails, it runs
// the TypeScript through tsx as before (same behaviour, only slower).
//
// Cache: node_modules/.cache/pointfold-cli/ (env PF_CLI_CACHE overrides it). manifest.json there
// names the current build directory and lists the bundle's inputs (from esbuild's metafile, plus
// tsconfig.json, this file and esbuild's package.json) with mtimeMs and size; a start checks
// them with one stat each. Several jobs may start at once on one node: each build goes into a
// fresh directory, the manifest is replaced by rename, and a build directory is deleted only
// when nothing can still be importing from it (see removeOldBuilds).
//
// Env: PF_CLI_NO_BUNDLE=1 always runs the TypeScript through tsx; PF_DEBUG=1 says on stderr what
// the launcher did and why.
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, renameSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { setFlagsFromString } from 'node:v8';

const LAUNCHER = fileURLToPath(import.meta.url);
const ROOT = resolve(dirname(LAUNCHER), '..', '..');
const ENTRY = 'server/cli/index.ts';
const TSCONFIG = join(ROOT, 'tsconfig.json');
const CACHE = process.env.PF_CLI_CACHE ? resolve(process.env.PF_CLI_CACHE) : join(ROOT, 'node_modules', '.cache', 'pointfold-cli');
const MANIFEST = join(CACHE, 'manifest.json');
const MANIFEST_FORMAT = 1;
/** A superseded build directory is kept this long: a process that read the old manifest may still be loading from it. */
const KEEP_MS = 60 * 60 * 1000;

const debug = process.env.PF_DEBUG ? (line) => process.stderr.write(`pointfold launcher: ${line}\n`) : () => {};
const firstLine = (e) => String(e?.message ?? e).split('\n')[0];
const ms = (t0) => `${(performance.now() - t0).toFixed(1)} ms`;

/**
 * The current bundle when the manifest exists, is for this checkout, and every input listed has
 * the recorded mtime and size; otherwise the reason to rebuild.
 */
function checkCache() {
  let manifest;
  let manifestMtimeMs;
  try {
    manifestMtimeMs = statSync(MANIFEST).mtimeMs;
    manifest = JSON.parse(readFileSync(MANIFEST, 'utf8'));
  } catch {
    return { reason: 'no readable manifest' };
  }
  const previous = { dir: manifest?.dir, writtenMs: manifestMtimeMs };
  if (manifest?.format !== MANIFEST_FORMAT || manifest.root !== ROOT || typeof manifest.dir !== 'string' || typeof manifest.entry !== 'string' || manifest.inputs == null) {
    return { reason: 'manifest written for another launcher or checkout', previous };
  }
  for (const [file, recorded] of Object.entries(manifest.inputs)) {
    const st = statSync(resolve(ROOT, file), { throwIfNoEntry: false });
    if (st == null) return { reason: `${file} is gone`, previous };
    if (st.mtimeMs !== recorded?.[0] || st.size !== recorded?.[1]) return { reason: `${file} changed`, previous };
  }
  const entry = join(CACHE, manifest.dir, manifest.entry);
  if (!existsSync(entry)) return { reason: `${manifest.dir}/${manifest.entry} is missing`, previous };
  return { entry, dir: manifest.dir, inputs: Object.keys(manifest.inputs).length };
}

/**
 * The bundle keeps node_modules imports as they are (except BUNDLED_PACKAGES); Node finds them by
 * walking up from the bundle's folder, which reaches the project's node_modules from the default
 * cache. A cache elsewhere (PF_CLI_CACHE) gets a node_modules link to the project's.
 */
function linkNodeModules() {
  const rel = relative(ROOT, CACHE);
  if (rel !== '' && !rel.startsWith('..') && !isAbsolute(rel)) return;
  try {
    symlinkSync(join(ROOT, 'node_modules'), join(CACHE, 'node_modules'), 'dir');
  } catch (e) {
    if (e.code !== 'EEXIST') throw e;
  }
}

/**
 * Packages bundled into the CLI rather than imported from node_modules at run time. zod: the
 * snap settings are validated with it, and importing its package whole (with every message
 * locale) took about 100 ms of each start; bundled, esbuild keeps only what the schemas use, about
 * 190 KB that load in about 40 ms. That needs the namespace import the project uses everywhere
 * (`import * as z from 'zod'`): `import { z }` names zod's whole export object, locales included.
 */
const BUNDLED_PACKAGES = ['zod'];

/**
 * esbuild plugin: what resolves into node_modules stays an import (as `packages: 'external'`
 * would do), except the packages named; tsconfig path aliases (@shared/…) and node: builtins
 * resolve as usual.
 */
function externalPackagesExcept(bundled) {
  const isBundled = (path) => bundled.some((name) => path === name || path.startsWith(`${name}/`));
  const again = Symbol('resolving');
  return {
    name: 'external-packages',
    setup(b) {
      b.onResolve({ filter: /^[^./]/ }, async (args) => {
        if (args.pluginData === again || args.path.startsWith('node:') || isBundled(args.path)) return undefined;
        const r = await b.resolve(args.path, { kind: args.kind, importer: args.importer, resolveDir: args.resolveDir, pluginData: again });
        if (r.errors.length > 0) return { errors: r.errors };
        return r.path.split(/[\\/]/).includes('node_modules') ? { path: args.path, external: true } : undefined;
      });
    },
  };
}

/** Bundle server/cli/index.ts into a fresh build directory and make it current. Returns the entry file. */
async function build(previous) {
  const esbuild = await import('esbuild');
  const t0 = performance.now();
  const startedMs = Date.now();
  mkdirSync(CACHE, { recursive: true });
  linkNodeModules();
  const outdir = mkdtempSync(join(CACHE, 'build-'));
  chmodSync(outdir, 0o755); // mkdtemp makes it private; others sharing the checkout may read it
  let result;
  try {
    result = await esbuild.build({
      absWorkingDir: ROOT,
      entryPoints: [ENTRY],
      outdir,
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      // submit and token (server, database) become chunks loaded only when those commands run.
      splitting: true,
      // node_modules stay ordinary imports, resolved at run time from the project's node_modules,
      // except zod (see BUNDLED_PACKAGES).
      plugins: [externalPackagesExcept(BUNDLED_PACKAGES)],
      tsconfig: TSCONFIG,
      // .mjs: the cache has no package.json saying "type": "module" (node_modules hides the project's).
      outExtension: { '.js': '.mjs' },
      sourcemap: true,
      sourcesContent: false,
      metafile: true,
      logLevel: 'silent',
    });
  } catch (e) {
    rmSync(outdir, { recursive: true, force: true });
    throw e;
  } finally {
    await esbuild.stop?.();
  }
  const [entryOut] = Object.entries(result.metafile.outputs).find(([, out]) => out.entryPoint === ENTRY) ?? [];
  if (entryOut == null) throw new Error(`esbuild's metafile names no output for ${ENTRY}`);
  const entry = resolve(ROOT, entryOut);

  const files = [...Object.keys(result.metafile.inputs), TSCONFIG, LAUNCHER, createRequire(import.meta.url).resolve('esbuild/package.json')];
  const inputs = {};
  let changedDuringBuild = null;
  for (const file of files) {
    const st = statSync(resolve(ROOT, file), { throwIfNoEntry: false });
    if (st == null) continue; // not a file (esbuild's own namespaces); nothing to watch
    inputs[relative(ROOT, resolve(ROOT, file))] = [st.mtimeMs, st.size];
    if (st.mtimeMs >= startedMs) changedDuringBuild ??= file;
  }
  const dir = basename(outdir);
  if (changedDuringBuild != null) {
    // The bundle may hold the old or the new text: use it this once, let the next start rebuild.
    debug(`built ${dir} in ${ms(t0)}, not recorded: ${changedDuringBuild} changed during the build`);
    return entry;
  }
  const manifest = { format: MANIFEST_FORMAT, root: ROOT, dir, entry: relative(outdir, entry), builtAt: new Date(startedMs).toISOString(), inputs };
  const tmp = `${MANIFEST}.${process.pid}-${Math.random().toString(36).slice(2)}.tmp`;
  writeFileSync(tmp, `${JSON.stringify(manifest, null, 1)}\n`);
  renameSync(tmp, MANIFEST);
  debug(`built ${dir} in ${ms(t0)} (${Object.keys(inputs).length} inputs)`);
  try {
    removeOldBuilds(previous, dir);
  } catch (e) {
    debug(`old builds left in place: ${firstLine(e)}`);
  }
  return entry;
}

/**
 * Delete build directories (and stray manifest temp files) nothing can still be loading from.
 * A process loads from the directory named by the manifest it read at start; every directory
 * other than the previous manifest's was superseded when that manifest was written, so they go
 * once that was more than KEEP_MS ago. Directories younger than KEEP_MS always stay: another
 * process may be building into one right now.
 */
function removeOldBuilds(previous, current) {
  const now = Date.now();
  if (previous == null || now - previous.writtenMs < KEEP_MS) return;
  for (const name of readdirSync(CACHE)) {
    if (name === current || name === previous.dir || !(name.startsWith('build-') || name.endsWith('.tmp'))) continue;
    const path = join(CACHE, name);
    const st = statSync(path, { throwIfNoEntry: false });
    if (st == null || now - st.mtimeMs < KEEP_MS) continue;
    rmSync(path, { recursive: true, force: true });
    debug(`removed ${name}`);
  }
}

/** The CLI module from the TypeScript sources through tsx's loader hooks. */
async function importSource(why) {
  debug(`running the TypeScript through tsx (${why})`);
  const { register } = await import('tsx/esm/api');
  register({ tsconfig: TSCONFIG });
  return import(pathToFileURL(join(ROOT, ENTRY)).href);
}

/** The CLI module: the cached bundle, a fresh one, or the TypeScript through tsx. */
async function loadCli() {
  const v = process.env.PF_CLI_NO_BUNDLE;
  if (v && v !== '0') return importSource('PF_CLI_NO_BUNDLE is set');
  const t0 = performance.now();
  const cache = checkCache();
  let entry = cache.entry;
  if (entry != null) {
    debug(`bundle ${cache.dir} is up to date (${cache.inputs} inputs checked in ${ms(t0)})`);
  } else {
    debug(`building the bundle: ${cache.reason}`);
    try {
      entry = await build(cache.previous);
    } catch (e) {
      return importSource(`no bundle: ${firstLine(e)}`);
    }
  }
  try {
    return await import(pathToFileURL(entry).href);
  } catch (e) {
    return importSource(`the bundle did not load: ${firstLine(e)}`);
  }
}

// A command-line run is short: much of it passes before TurboFan has optimised the engine, and
// its compiler thread shares the 2 cores of a typical node with the run. Inlining less into each
// optimised function (V8's default cumulative budget is 920 bytecode bytes) made optimising
// cheaper and sooner: on the bench's 5,000 structures about 8 % less CPU time and 1–4 % less wall
// time (interleaved runs), and no slower once warm (tests/bench/cli.bench.ts; DEVELOPERS.md,
// "Keeping the engine fast"). Set here, before any of our code is compiled, so that every way of
// starting the CLI gets it.
setFlagsFromString('--max-inlined-bytecode-size-cumulative=250');

// Memory the C allocator returns to the system and takes back again costs a page fault per 4 KiB
// page when touched again, about 18 µs each on the development machine (a virtual machine). By
// default glibc gives back the free top of its heaps once it exceeds 128 KiB, so the memory that
// TurboFan's compile jobs and the engine's typed arrays free is faulted in again and again: on
// the bench's 5,000 structures ~13,000 of the run's ~38,000 page faults. glibc raises that
// threshold to twice the size of the largest mapped block freed so far (up to a 32 MiB block), so
// one untouched 8 MiB block, freed after the first garbage collection, makes it 16 MiB for the rest
// of the run: ~25,000 page faults in all. Untouched, the block costs no page fault itself; other C
// libraries simply allocate and free it.
Buffer.allocUnsafeSlow(8 << 20);

let cli;
try {
  if (process.env.PF_DEBUG) process.setSourceMapsEnabled(true);
  cli = await loadCli();
} catch (e) {
  // The sources themselves do not load: a bug of ours (exit status 70, as index.ts uses).
  process.stderr.write(`pointfold: internal error: ${e?.stack ?? String(e)}\n`);
  process.exitCode = 70;
}
if (cli != null) await cli.runCommandLine(process.argv.slice(2));
