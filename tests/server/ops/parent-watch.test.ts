import { spawn } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { isProcessAlive, waitFor } from '../../../server/ops/util';

// A stack child must go away when its parent is killed with SIGKILL (no handler runs there),
// or the next `npm start` finds the ports taken. Here a real process tree: middle → leaf, where
// the leaf runs watchParent from server/ops/parent-watch.ts, and the middle is SIGKILLed.
describe('children of a killed parent', () => {
  it('exit by themselves within seconds', async () => {
    const leafScript = [
      "import { watchParent } from './server/ops/parent-watch.ts';",
      'watchParent(() => process.exit(0), process.env, 100);',
      'setInterval(() => {}, 1000);',
      "process.stdout.write('ready');",
    ].join('\n');
    const middleScript = `
      const { spawn } = require('node:child_process');
      const leaf = spawn(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', ${JSON.stringify(leafScript)}], {
        cwd: process.cwd(), env: { ...process.env, PF_PARENT_PID: String(process.pid) }, detached: true, stdio: ['ignore', 'pipe', 'inherit'],
      });
      leaf.stdout.once('data', () => process.stdout.write(String(leaf.pid) + '\\n'));
      setInterval(() => {}, 1000);`;
    const middle = spawn(process.execPath, ['-e', middleScript], { stdio: ['ignore', 'pipe', 'inherit'] });
    const leafPid = await new Promise<number>((resolve, reject) => {
      middle.stdout.once('data', (d) => resolve(Number(String(d).trim())));
      middle.once('exit', () => reject(new Error('middle process exited early')));
    });
    expect(isProcessAlive(leafPid)).toBe(true);
    middle.kill('SIGKILL');
    const gone = await waitFor(() => !isProcessAlive(leafPid), 10_000, 100);
    if (!gone) process.kill(leafPid, 'SIGKILL');
    expect(gone).toBe(true);
  });
});
