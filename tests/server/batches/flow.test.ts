import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { batchDetailSchema, batchSummarySchema, page, structureDetailSchema, structureRowSchema } from '@shared/contracts/api';
import { perceive } from '@shared/engine';
import { readStructures } from '@shared/formats';
import { startProcessors } from '../../../worker/processors/index';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { allRows, DEMO_FILES, get, getBinary, member, sha256, unzip, upload, waitForBatch, type Member } from './support';

/*
 * The whole flow on the real PostgreSQL and Redis: upload the demo screen (three formats, one
 * unreadable frame), let the worker snap it, read the results, download them.
 *
 * Point groups of the demo molecules: the textbook assignments (e.g. F. A. Cotton, Chemical
 * Applications of Group Theory, 3rd ed., Wiley 1990, and any inorganic chemistry text) —
 * quoted from memory. The demo files are invented geometries built on those shapes.
 */
const TEXTBOOK_GROUPS: Record<string, string> = {
  'L01 aqua': 'C2v',
  'L02 ammine': 'C3v',
  'L03 formaldehyde': 'C2v',
  'L04 hydrogen cyanide': 'C∞v',
  'L05 carbon dioxide': 'D∞h',
  'L06 acetylene': 'D∞h',
  'L07 ethylene': 'D2h',
  'L08 benzene': 'D6h',
  'L09 pyridine': 'C2v',
  'L10 boron trifluoride': 'D3h',
  'L11 methanol': 'Cs',
  'F01 methane': 'Td',
  'F02 carbon tetrachloride': 'Td',
  'F03 dichloromethane': 'C2v',
  'F04 chloroform': 'C3v',
  'F05 bromochlorofluoromethane': 'C1',
  'F06 ethane (staggered)': 'D3d',
  'F07 cyclohexane (chair)': 'D3d',
  'F08 naphthalene': 'D2h',
  'F09 allene': 'D2d',
  'F10 boric acid': 'C3h',
  'F11 hydrogen peroxide': 'C2',
  'F12 trans-1,2-dichloroethylene': 'C2h',
  'F13 tetraphosphorus': 'Td',
  'F14 cyclo-octasulfur (crown)': 'D4d',
  'C01 hexacarbonylchromium': 'Oh',
  'C02 pentacarbonyliron': 'D3h',
  'C03 tetracarbonylnickel': 'Td',
  'C04 ferrocene (eclipsed)': 'D5h',
  'C05 tetrachloroplatinate': 'D4h',
  'C07 phosphorus pentafluoride': 'D3h',
  'C08 xenon tetrafluoride': 'D4h',
  'C09 sulfur hexafluoride': 'Oh',
  'K01 closo-dodecaborate': 'Ih',
};

let db: TestDatabase;
let t: TestApp;
let processors: { close(): Promise<void> };
let chemist: Member;
let batch: { id: string; [k: string]: unknown };

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  chemist = await member(db.dataSource, 'chemist');
  processors = await startProcessors(t.deps, { sweepIntervalMs: 1000 });
  const res = await upload(t, chemist, DEMO_FILES, { name: 'Demo screen', settings: JSON.stringify({ tolerance: 0.1, outputFormats: ['xyz', 'mol', 'qcschema'] }) });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  batch = res.body;
  await waitForBatch(t, chemist, batch.id);
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await db?.drop();
});

describe('a batch from upload to download', () => {
  it('stores the batch with its files, their SHA-256 and the merged settings', async () => {
    expect(batch).toMatchObject({ name: 'Demo screen', workspaceSlug: chemist.workspace.slug, submitter: { id: chemist.user.id } });
    const detail = (await get(t, chemist, `/api/batches/${batch.id}`)).body;
    expect(detail.settings).toMatchObject({ tolerance: 0.1, frame: 'standard', displacementBudget: 0.05, outputFormats: ['xyz', 'mol', 'qcschema'] });
    expect(detail.files.map((f: { name: string; sha256: string }) => [f.name, f.sha256])).toEqual(DEMO_FILES.map((f) => [f.name, sha256(f.bytes)]));
    expect(detail.files.find((f: { name: string }) => f.name === 'ligands.xyz').structures).toBe(12);
  });

  it('finishes with every structure snapped to its textbook group, and the bad frame as a located error', async () => {
    const detail = (await get(t, chemist, `/api/batches/${batch.id}`)).body;
    expect(detail.status).toBe('done');
    expect(detail.counts).toMatchObject({ total: 37, done: 36, error: 1, overBudget: 1, knifeEdge: 2 });
    expect(detail.finishedAt).not.toBeNull();
    const rows = await allRows(t, chemist, batch.id);
    for (const [name, group] of Object.entries(TEXTBOOK_GROUPS)) {
      const row = rows.find((r) => r.name === name);
      expect(row?.perceivedGroup, name).toBe(group);
      expect(row?.pointGroup, name).toBe(group);
    }
    const bad = rows.filter((r) => r.status === 'error');
    expect(bad).toHaveLength(1);
    // file:line: frame N: message — the reader's located one-line format.
    expect(bad[0].error).toBe("ligands.xyz:31: frame 6: atom 2: coordinate '1.128O0000' is not a number");
    expect(bad[0]).toMatchObject({ sourceFile: 'ligands.xyz', frameIndex: 5 });
  });

  it('flags the Jahn–Teller-elongated complex as over budget and the early-stopped ammine as knife-edge', async () => {
    const rows = await allRows(t, chemist, batch.id);
    const cu = rows.find((r) => r.name.startsWith('C06'))!;
    // Elongating both axial Cu–Cl by 0.08 Å: the Oh average moves them by 2/3 of that, ~0.053 Å > 0.05.
    expect(cu.perceivedGroup).toBe('Oh');
    expect(cu.flags).toEqual(expect.arrayContaining(['over-budget', 'knife-edge']));
    expect(cu.maxDisplacement).toBeGreaterThan(0.05);
    const nh3 = rows.find((r) => r.name.startsWith('F15'))!;
    expect(nh3.perceivedGroup).toBe('C3v');
    expect(nh3.flags).toContain('knife-edge');
    expect(nh3.flags).not.toContain('over-budget');
  });

  it('filters and sorts the structure table in SQL', async () => {
    const c2v = (await get(t, chemist, `/api/batches/${batch.id}/structures?group=c2v`)).body;
    expect(c2v.total).toBe(4);
    expect(c2v.items.every((r: { perceivedGroup: string }) => r.perceivedGroup === 'C2v')).toBe(true);
    const over = (await get(t, chemist, `/api/batches/${batch.id}/structures?flag=over-budget`)).body;
    expect(over.items.map((r: { name: string }) => r.name)).toEqual(['C06 hexachlorocuprate (elongated)']);
    const errors = (await get(t, chemist, `/api/batches/${batch.id}/structures?status=error`)).body;
    expect(errors.total).toBe(1);
    const sorted = (await get(t, chemist, `/api/batches/${batch.id}/structures?sort=maxDisplacement&dir=desc&pageSize=3`)).body;
    expect(sorted.items[0].name).toMatch(/^C06/);
    const values = sorted.items.map((r: { maxDisplacement: number }) => r.maxDisplacement);
    expect([...values].sort((a, b) => b - a)).toEqual(values);
    const search = (await get(t, chemist, `/api/batches/${batch.id}/structures?q=carbonyl`)).body;
    expect(search.items.map((r: { name: string }) => r.name).sort()).toEqual([
      'C01 hexacarbonylchromium',
      'C02 pentacarbonyliron',
      'C03 tetracarbonylnickel',
    ]);
    const page2 = (await get(t, chemist, `/api/batches/${batch.id}/structures?pageSize=10&page=4`)).body;
    expect(page2).toMatchObject({ total: 37, page: 4, pageSize: 10 });
    expect(page2.items).toHaveLength(7);
  });

  it('returns a structure with its input, result, ladder and numbers as JSON numbers', async () => {
    const rows = await allRows(t, chemist, batch.id);
    const benzene = rows.find((r) => r.name === 'L08 benzene')!;
    const detail = (await get(t, chemist, `/api/structures/${benzene.id}`)).body;
    expect(detail.inputAtoms).toHaveLength(12);
    expect(typeof detail.inputAtoms[0].x).toBe('number');
    expect(detail.result.pointGroup).toBe('D6h');
    // D2h is the largest Abelian subgroup of D6h (the usual computational subgroup; common practice).
    expect(detail.result.computationalSubgroup).toBe('D2h');
    expect(detail.result.ladder.length).toBeGreaterThan(0);
    expect(detail.result.atoms).toHaveLength(12);
    expect(typeof detail.symmetryRmsdBefore).toBe('number');
    expect(detail.result.symmetryRmsdAfter).toBeLessThan(1e-9);
    expect(detail.result.engineVersion).toMatch(/^pointfold-engine /);
    expect(detail.settings.tolerance).toBe(0.1);
  });

  it('downloads one structure in any output format, named after its input, that reads back in its group', async () => {
    const rows = await allRows(t, chemist, batch.id);
    const fe = rows.find((r) => r.name.startsWith('C02'))!;
    for (const format of ['xyz', 'extxyz', 'mol', 'qcschema'] as const) {
      const res = await get(t, chemist, `/api/structures/${fe.id}/download?format=${format}`).buffer(true);
      expect(res.status).toBe(200);
      expect(res.headers['content-disposition']).toContain('complexes-2.');
      const text = typeof res.body === 'string' || Buffer.isBuffer(res.body) ? String(res.body) : res.text;
      const back = readStructures(`x.${format === 'qcschema' ? 'json' : format}`, text);
      expect(back[0].ok).toBe(true);
      if (back[0].ok) expect(perceive(back[0].molecule.atoms, { tolerance: format === 'mol' ? 5e-4 : 1e-6 }).pointGroup).toBe('D3h');
    }
    const unique = await get(t, chemist, `/api/structures/${fe.id}/download?format=unique`);
    expect(unique.status).toBe(200);
    expect(unique.text).toContain('D3h');
    expect((await get(t, chemist, `/api/structures/${fe.id}/download?format=pdf`)).status).toBe(400);
    const bad = rows.find((r) => r.status === 'error')!;
    const refused = await get(t, chemist, `/api/structures/${bad.id}/download`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain('not a number');
  });

  it('streams the batch ZIP: cleaned files in every chosen format, manifest.json and summary.csv', async () => {
    const res = await getBinary(t, chemist, `/api/batches/${batch.id}/download`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    const files = await unzip(res.body);
    const manifest = JSON.parse(files.get('manifest.json')!.toString('utf8'));
    expect(manifest.structures).toHaveLength(37);
    expect(manifest.batch).toMatchObject({ id: batch.id, name: 'Demo screen', status: 'done' });
    const shaOf = new Map(DEMO_FILES.map((f) => [f.name, sha256(f.bytes)]));
    for (const s of manifest.structures) {
      expect(s.inputSha256).toBe(shaOf.get(s.inputFile));
      expect(s).not.toHaveProperty('atoms');
      for (const path of s.outputFiles) expect(files.has(path), path).toBe(true);
      if (s.status === 'done') {
        // The fields `pointfold snap --json` prints (DESIGN.md, "The command line"), minus atoms.
        for (const key of ['name', 'formula', 'pointGroup', 'order', 'tolerance', 'computationalSubgroup', 'symmetryRmsdBefore', 'symmetryRmsdAfter', 'displacementRmsd', 'maxDisplacement', 'csm', 'flags']) {
          expect(s, key).toHaveProperty(key);
        }
        expect(s).toHaveProperty('perceivedGroup');
        expect(s).toHaveProperty('transform.rotation');
        expect(s.engineVersion).toMatch(/^pointfold-engine /);
        expect(s.settings.tolerance).toBe(0.1);
        expect(s.outputFiles).toHaveLength(3);
      } else {
        expect(s.error).toContain('not a number');
        expect(s.outputFiles).toEqual([]);
      }
    }
    // Every cleaned file reads back in the group the manifest gives (tight tolerance; molfile 5e-4 Å).
    for (const s of manifest.structures.filter((x: { status: string }) => x.status === 'done')) {
      for (const path of s.outputFiles as string[]) {
        const back = readStructures(path.replace(/\.qcschema\.json$/, '.json'), files.get(path)!);
        expect(back[0].ok, path).toBe(true);
        if (back[0].ok) expect(perceive(back[0].molecule.atoms, { tolerance: path.endsWith('.mol') ? 5e-4 : 1e-6 }).pointGroup, path).toBe(s.pointGroup);
      }
    }
    // Named after the inputs: frame numbers only for multi-frame files (outputFileName's rule).
    expect([...files.keys()]).toEqual(expect.arrayContaining(['ligands-01.xyz', 'ligands-01.mol', 'ligands-01.qcschema.json', 'complexes-9.xyz']));
    expect([...files.keys()].filter((n) => n.startsWith('clusters') && n.endsWith('.xyz'))).toHaveLength(1);
    const csv = files.get('summary.csv')!.toString('utf8').trim().split('\r\n');
    expect(csv[0]).toMatch(/^name,inputFile,frameIndex,status,formula,perceivedGroup,pointGroup/);
    expect(csv).toHaveLength(38);
  });

  it('answers in the shapes of shared/contracts/api.ts (what the browser parses)', async () => {
    batchDetailSchema.parse((await get(t, chemist, `/api/batches/${batch.id}`)).body);
    page(batchSummarySchema).parse((await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches`)).body);
    page(structureRowSchema).parse((await get(t, chemist, `/api/batches/${batch.id}/structures?pageSize=500`)).body);
    for (const row of await allRows(t, chemist, batch.id)) {
      const detail = structureDetailSchema.parse((await get(t, chemist, `/api/structures/${row.id}`)).body);
      expect(detail.result === null).toBe(row.status !== 'done');
    }
  });

  it('mails the submitter once when the batch finishes', async () => {
    const notices = t.mail.filter((m) => m.subject.includes('Demo screen'));
    expect(notices).toHaveLength(1);
    expect(notices[0].to).toBe(chemist.user.email);
    expect(notices[0].subject).toContain('36 of 37 structures snapped');
    expect(notices[0].text).toContain(`/batches/${batch.id}`);
    expect(notices[0].text).toContain('frequency calculation');
  });

  it('lists the workspace batches newest first with counts and groups', async () => {
    const list = (await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches`)).body;
    expect(list.total).toBe(1);
    expect(list.items[0]).toMatchObject({ id: batch.id, status: 'done', counts: { total: 37 } });
    expect(list.items[0].groups[0]).toEqual({ group: 'C2v', count: 4 });
    expect((await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches?status=running`)).body.total).toBe(0);
    expect((await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches?q=demo`)).body.total).toBe(1);
  });
});
