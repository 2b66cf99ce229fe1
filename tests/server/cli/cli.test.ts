import { spawn } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ZipArchive } from 'archiver';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readStructures } from '@shared/formats';
import { LAUNCHER, ROOT, runLauncher, SAMPLES, type Run } from './run-cli';

/**
 * The command line as DESIGN.md specifies it ("The command line"), run as a child process the way
 * scripts run it: through server/cli/launch.mjs, as `npm run pointfold` does (its bundle cached in
 * a folder of this test file's own). Sample files are constructed test inputs
 * (tests/shared/formats/samples). Point groups expected for the sample molecules are the handbook
 * ones (water C2v, ammonia C3v, methane Td, ethylene D2h, benzene D6h, ammonium Td: e.g. Cotton,
 * "Chemical Applications of Group Theory", 3rd ed., chapter 3 — from memory).
 */

const cli = (args: string[]): Promise<Run> => runLauncher(args, { PF_CLI_CACHE: join(tmp, 'cli-cache') });

const sample = (name: string) => join(SAMPLES, name);
let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'pf-cli-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const CONTRACT_FIELDS = [
  'name', 'formula', 'pointGroup', 'order', 'tolerance', 'computationalSubgroup', 'symmetryRmsdBefore',
  'symmetryRmsdAfter', 'displacementRmsd', 'maxDisplacement', 'csm', 'flags', 'atoms',
];

describe('pointfold snap --json', () => {
  let run: Run;
  let structures: Record<string, unknown>[];
  beforeAll(async () => {
    run = await cli(['snap', sample('ligands.xyz'), sample('ligands.sdf'), sample('benzene.pdb'), '--json']);
    structures = (JSON.parse(run.stdout) as { structures: Record<string, unknown>[] }).structures;
  }, 60_000);

  it('prints one entry per structure in input order, failures included, and exits 1 for the bad frames', () => {
    expect(run.status).toBe(1);
    expect(structures).toHaveLength(10);
    expect(structures.map((s) => s.error == null)).toEqual([true, true, false, true, true, true, false, true, true, true]);
    expect(structures[2]).toEqual({
      name: `${sample('ligands.xyz')}#3`,
      inputFile: sample('ligands.xyz'),
      frameIndex: 2,
      error: `${sample('ligands.xyz')}:25: frame 3: expected 12 atom lines, found 11`,
    });
  });

  it('reports each bad frame as one line on stderr naming file and line', () => {
    expect(run.stderr.trim().split('\n')).toEqual([
      `${sample('ligands.xyz')}:25: frame 3: expected 12 atom lines, found 11`,
      `${sample('ligands.sdf')}:41: frame 3: expected 3 atom lines, found 2`,
    ]);
  });

  it('gives every good structure the contract fields with the handbook point groups', () => {
    const good = structures.filter((s) => s.error == null);
    for (const s of good) for (const f of CONTRACT_FIELDS) expect(s, `${String(s.name)} lacks ${f}`).toHaveProperty(f);
    expect(good.map((s) => [s.name, s.formula, s.pointGroup, s.order])).toEqual([
      ['water, B3LYP/def2-TZVP optimized', 'H2O', 'C2v', 4],
      ['ammonia opt', 'H3N', 'C3v', 6],
      ['methane', 'CH4', 'Td', 24],
      ['methane', 'CH4', 'Td', 24],
      ['ammonium', 'H4N', 'Td', 24],
      ['water radical cation', 'H2O', 'C2v', 4],
      ['BENZENE TWO SNAPSHOTS (model 1)', 'C6H6', 'D6h', 24],
      ['BENZENE TWO SNAPSHOTS (model 2)', 'C6H6', 'D6h', 24],
    ]);
    // Computational subgroups: the largest subgroup among D2h and its subgroups. Td has two
    // non-equivalent maximal ones of order 4 (D2 and C2v); the engine reports one and the other
    // as the alternative.
    const sub = good.map((s) => s.computationalSubgroup);
    expect([sub[0], sub[1], sub[5], sub[6], sub[7]]).toEqual(['C2v', 'Cs', 'C2v', 'D2h', 'D2h']);
    for (const td of [good[2], good[3], good[4]]) {
      expect([td.computationalSubgroup, ...(td.computationalSubgroupAlternatives as string[])].sort()).toEqual(['C2v', 'D2']);
    }
  });

  it('writes atoms as {element, x, y, z} in Å in the input atom order, exactly symmetric and close to the input', () => {
    const water = structures[0] as { atoms: { element: string; x: number; y: number; z: number }[]; symmetryRmsdAfter: number; maxDisplacement: number };
    expect(water.atoms.map((a) => a.element)).toEqual(['O', 'H', 'H']);
    expect(Object.keys(water.atoms[0]).sort()).toEqual(['element', 'x', 'y', 'z']);
    expect(water.symmetryRmsdAfter).toBeLessThan(1e-10);
    expect(water.maxDisplacement).toBeLessThan(5e-3);
    // O–H stays the constructed 0.9572 Å to within the ±1e-3 Å noise.
    const [o, h] = water.atoms;
    expect(Math.abs(Math.hypot(o.x - h.x, o.y - h.y, o.z - h.z) - 0.9572)).toBeLessThan(3e-3);
  });

  it('takes charge and multiplicity from the files', () => {
    const byName = (n: string) => structures.find((s) => s.name === n) as { charge: number; multiplicity: number };
    expect([byName('ammonium').charge, byName('ammonium').multiplicity]).toEqual([1, 1]);
    expect([byName('water radical cation').charge, byName('water radical cation').multiplicity]).toEqual([1, 2]);
  });
});

describe('pointfold snap, text output and files', () => {
  it('prints an aligned table with the caution footer for flagged structures, and exit 0 when all is well', async () => {
    const run = await cli(['snap', sample('water-ammonia.cml'), sample('methane.qcschema.json')]);
    expect(run.status).toBe(0);
    expect(run.stderr).toBe('');
    const lines = run.stdout.split('\n');
    expect(lines[0]).toMatch(/^Structure\s+Formula\s+Group\s+Order\s+Subgroup\s+RMSD before\s+RMSD after\s+Moved RMS\s+Moved max\s+CSM\s+Flags$/);
    expect(lines[1]).toMatch(/^-+( +-+)+$/);
    expect(lines[2]).toMatch(/^water\s+H2O\s+C2v\s+4\s+C2v\s/);
    expect(lines[3]).toMatch(/^ammonia\s+H3N\s+C3v\s+6\s+Cs\s/);
    expect(lines[4]).toMatch(/^methane\s+CH4\s+Td\s+24\s/);
    expect(run.stdout).toContain('3 structures: 3 snapped, 0 failed.');
    // Columns line up: every row has 'Group' at the same offset.
    const at = lines[0].indexOf('Group');
    expect(lines.slice(2, 5).every((l) => /^\S/.test(l.slice(at)))).toBe(true);
  });

  it('writes every output format with --out, each read back and re-perceived', async () => {
    const out = join(tmp, 'out');
    const run = await cli(['snap', sample('ethylene.extxyz'), '--out', out, '--format', 'xyz,extxyz,mol', '--format', 'qcschema,unique', '--json']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const entries = (JSON.parse(run.stdout) as { structures: { outputFiles: string[]; pointGroup: string }[] }).structures;
    expect(entries[0].outputFiles).toEqual(['ethylene-1.xyz', 'ethylene-1.extxyz', 'ethylene-1.mol', 'ethylene-1.qcschema.json', 'ethylene-1.unique.txt']);
    expect(readdirSync(out).sort()).toHaveLength(10);
    const back = readStructures('ethylene-2.xyz', readFileSync(join(out, 'ethylene-2.xyz')));
    expect(back[0].ok && [back[0].molecule.charge, back[0].molecule.multiplicity, back[0].molecule.name]).toEqual([1, 2, 'ethylene-cation']);
    expect(entries.map((e) => e.pointGroup)).toEqual(['D2h', 'D2h']);
  });

  it('reads a ZIP of structure files, naming entries archive/entry', async () => {
    const zipPath = join(tmp, 'batch.zip');
    const archive = new ZipArchive({ zlib: { level: 6 } });
    const chunks: Buffer[] = [];
    archive.on('data', (c: Buffer) => chunks.push(c));
    const ended = new Promise((r) => archive.on('end', r));
    archive.append(readFileSync(sample('water-ammonia.cml')), { name: 'batch/water-ammonia.cml' });
    archive.append(readFileSync(sample('methane.qcschema.json')), { name: 'batch/methane.qcschema.json' });
    archive.append('', { name: '__MACOSX/batch/._methane.qcschema.json' });
    await archive.finalize();
    await ended;
    writeFileSync(zipPath, Buffer.concat(chunks));
    const run = await cli(['snap', zipPath, '--json']);
    expect(run.status).toBe(0);
    const s = (JSON.parse(run.stdout) as { structures: { inputFile: string; pointGroup: string }[] }).structures;
    expect(s.map((x) => [x.inputFile, x.pointGroup])).toEqual([
      [`${zipPath}/batch/water-ammonia.cml`, 'C2v'],
      [`${zipPath}/batch/water-ammonia.cml`, 'C3v'],
      [`${zipPath}/batch/methane.qcschema.json`, 'Td'],
    ]);
  });
});

describe('bad input and usage', () => {
  it('keeps going past a missing file, a binary file and a structure the engine refuses, exit 1', async () => {
    const junk = join(tmp, 'junk.xyz');
    writeFileSync(junk, Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0, 0, 1]));
    const clash = join(tmp, 'clash.xyz');
    writeFileSync(clash, '2\ntwo atoms on top of each other\nH 0 0 0\nH 0 0 0.001\n');
    copyFileSync(sample('methane.qcschema.json'), join(tmp, 'm.json'));
    const missing = join(tmp, 'nope.xyz');
    const run = await cli(['snap', missing, junk, clash, join(tmp, 'm.json'), '--json']);
    expect(run.status).toBe(1);
    const lines = run.stderr.trim().split('\n');
    expect(lines).toHaveLength(3);
    expect(lines[0]).toBe(`${missing}: frame 1: no such file`);
    expect(lines[1]).toBe(`${junk}: frame 1: not a text file (it contains NUL bytes)`);
    expect(lines[2].startsWith(`${clash}: frame 1: `)).toBe(true);
    const s = (JSON.parse(run.stdout) as { structures: { name: string; error?: string; pointGroup?: string }[] }).structures;
    expect(s.map((x) => x.error == null)).toEqual([false, false, false, true]);
    expect(s[2].name).toBe('two atoms on top of each other');
    expect(s[3].pointGroup).toBe('Td');
  });

  it('refuses unknown options and commands and bad values with one line and exit 2', async () => {
    const unknown = await cli(['snap', sample('ligands.xyz'), '--tolerence', '0.01']);
    expect([unknown.status, unknown.stderr]).toEqual([2, "pointfold snap: unknown option '--tolerence' (see pointfold snap --help)\n"]);
    const tol = await cli(['perceive', sample('ligands.xyz'), '--tolerance=-1']);
    expect([tol.status, tol.stderr]).toEqual([2, "pointfold perceive: --tolerance must be a length in Å greater than 0 and at most 1 (got '-1')\n"]);
    const bare = await cli(['perceive', sample('ligands.xyz'), '--tolerance']);
    expect([bare.status, bare.stderr]).toEqual([2, 'pointfold perceive: --tolerance needs a value\n']);
    const cmd = await cli(['snapp']);
    expect(cmd.status).toBe(2);
    expect(cmd.stderr).toMatch(/^pointfold: unknown command 'snapp'/);
    const group = await cli(['snap', sample('ligands.xyz'), '--target', 'Q7']);
    expect([group.status, group.stderr]).toEqual([2, "pointfold snap: --target 'Q7' is not a point group (examples: C2v, D3h, Td)\n"]);
  });

  it('stops without a word, exit 141, when the reader of its output goes away (… | head)', async () => {
    // Common practice (no source): a program writing into a closed pipe ends as if stopped by
    // SIGPIPE (status 128 + 13), without an error message.
    const base = Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.startsWith('PF_')));
    const child = spawn(process.execPath, [LAUNCHER, 'snap', sample('ligands.xyz'), '--json'], {
      cwd: ROOT,
      env: { ...base, PF_CLI_CACHE: join(tmp, 'cli-cache') },
    });
    child.stdout.destroy(); // the reader is gone before the first byte is written
    let stderr = '';
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString('utf8')));
    const status = await new Promise<number | null>((resolve) => child.on('close', resolve));
    expect(stderr).not.toMatch(/internal error/);
    expect(status).toBe(141);
  }, 60_000);

  it('prints help for each command with exit 0', async () => {
    for (const command of ['snap', 'perceive', 'ladder']) {
      const run = await cli([command, '--help']);
      expect(run.status).toBe(0);
      expect(run.stdout).toMatch(new RegExp(`^Usage: pointfold ${command} FILE\\.\\.\\.`));
    }
  });
});

describe('pointfold perceive and ladder', () => {
  it('perceive --json gives group, operations with residuals and equivalence classes', async () => {
    const run = await cli(['perceive', sample('benzene.pdb'), '--tolerance', '0.02', '--json']);
    expect(run.status).toBe(0);
    const [s] = (JSON.parse(run.stdout) as { structures: Record<string, unknown>[] }).structures;
    expect([s.name, s.formula, s.pointGroup, s.order, s.tolerance]).toEqual(['BENZENE TWO SNAPSHOTS (model 1)', 'C6H6', 'D6h', 24, 0.02]);
    const ops = s.operations as { residual: number }[];
    expect(ops).toHaveLength(24);
    expect(Math.max(...ops.map((o) => o.residual))).toBeLessThan(0.02);
    expect((s.equivalenceClasses as number[][]).map((c) => c.length).sort()).toEqual([6, 6]);
  });

  it('ladder --json gives merged tolerance ranges from 1e-4 to 0.3 Å with snap costs', async () => {
    const run = await cli(['ladder', sample('ligands.xyz'), '--json']);
    expect(run.status).toBe(1); // the short frame
    const s = (JSON.parse(run.stdout) as { structures: { ladder?: { group: string; fromTolerance: number; toTolerance: number; displacementRmsd: number }[] }[] }).structures;
    const water = s[0].ladder!;
    expect(water[0].fromTolerance).toBeCloseTo(1e-4, 10);
    expect(water[water.length - 1].toTolerance).toBeCloseTo(0.3, 10);
    for (let i = 1; i < water.length; i++) expect(water[i].fromTolerance).toBeCloseTo(water[i - 1].toTolerance, 12);
    // Three atoms always lie in one plane, so the molecular plane is an exact mirror: Cs at the
    // smallest tolerance despite the ±1e-3 Å noise; C2v by 0.01 Å.
    expect(water[0].group).toBe('Cs');
    expect(water.some((r) => r.group === 'C2v' && r.fromTolerance <= 0.01 && r.toTolerance > 0.01)).toBe(true);
  });
});

describe('commands in modules of their own', () => {
  it('dispatches submit and token to their modules', async () => {
    const token = await cli(['token', '--help']);
    expect([token.status, token.stderr]).toEqual([0, '']);
    expect(token.stdout).toMatch(/^usage: pointfold token create --email EMAIL/);
    const submit = await cli(['submit', '--help']);
    expect([submit.status, submit.stderr]).toEqual([0, '']);
    expect(submit.stdout).toMatch(/^usage: pointfold submit FILE\.\.\. --server URL --token TOKEN/);
  });
});
