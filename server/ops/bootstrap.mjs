// Entry point of `npm start` and `npm test`. Plain Node ESM on purpose: on a fresh clone
// node_modules is missing, so nothing here may import a package. It installs the npm packages
// when they are missing or older than package-lock.json, then hands over to the TypeScript
// orchestrator (server/ops/start.ts or server/ops/test.ts) running under tsx.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const commands = { start: 'server/ops/start.ts', test: 'server/ops/test.ts' };
const command = process.argv[2];

if (!(command in commands)) {
  console.error(`usage: node server/ops/bootstrap.mjs ${Object.keys(commands).join('|')}`);
  process.exit(2);
}

/** True when node_modules is missing or was installed from an older package-lock.json. */
function needsInstall() {
  const hidden = join(repoRoot, 'node_modules', '.package-lock.json');
  const lock = join(repoRoot, 'package-lock.json');
  if (!existsSync(hidden) || !existsSync(join(repoRoot, 'node_modules', 'tsx'))) return true;
  return statSync(lock).mtimeMs > statSync(hidden).mtimeMs;
}

if (needsInstall()) {
  console.log('▸ installing npm packages (npm ci) …');
  const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm';
  const result = spawnSync(npm, ['ci', '--no-audit', '--no-fund', '--loglevel=error'], {
    cwd: repoRoot,
    stdio: 'inherit',
  });
  if (result.error) {
    console.error(`✗ could not run npm (${result.error.message}); install Node.js with npm and try again`);
    process.exit(1);
  }
  if (result.status !== 0) {
    console.error('✗ npm ci failed (see above); check the network access to the npm registry and try again');
    process.exit(result.status ?? 1);
  }
}

/** Parent pid of `pid` from /proc (undefined when unknown). */
function parentOf(pid) {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) || undefined;
  } catch {
    return undefined;
  }
}

function alive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return err.code === 'EPERM';
  }
}

// npm runs scripts through `sh -c`, and dash does not exec the command, so the launcher to
// watch is our parent (the shell) and its parent (npm).
const launcher = process.ppid;
const launcherParent = parentOf(launcher);
const watched = [launcher, launcherParent].filter((p) => p && p > 1);

const child = spawn(process.execPath, ['--import', 'tsx', commands[command], ...process.argv.slice(3)], {
  cwd: repoRoot,
  stdio: 'inherit',
  env: { ...process.env, PF_LAUNCHER_PIDS: [process.pid, ...watched].join(',') },
});

// Ctrl-C in a terminal reaches the whole foreground process group, the orchestrator included;
// a signal sent to this pid alone is forwarded. The orchestrator treats repeats as one.
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(signal, () => {
    if (child.exitCode === null) child.kill(signal === 'SIGHUP' ? 'SIGTERM' : signal);
  });
}

// If whoever launched us (npm) is killed outright, stop the orchestrator cleanly rather than
// leaving a headless stack behind that the next `npm start` would find holding the ports.
const watch = setInterval(() => {
  if ((process.ppid !== launcher || !watched.every(alive)) && child.exitCode === null) {
    clearInterval(watch);
    child.kill('SIGTERM');
  }
}, 1000);
watch.unref();

child.on('exit', (code, signal) => {
  clearInterval(watch);
  process.exit(code ?? (signal === 'SIGINT' ? 130 : 1));
});
