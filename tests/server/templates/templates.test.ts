import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { batchDetailSchema, exportTemplateSchema } from '@shared/contracts/api';
import type { AtomJson } from '@shared/contracts/structure';
import { startProcessors } from '../../../worker/processors/index';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { ammonia, water } from '../../shared/engine/molecule-builders';
import { get, getBinary, member, unzip, upload, waitForBatch, type Member } from '../batches/support';

/*
 * Export templates on the real PostgreSQL and Redis: owners keep them, chemists choose them for a
 * batch, and the batch ZIP holds one rendered deck per structure. Molecules: water (r(OH) 0.9578 Å,
 * ∠HOH 104.4776°) and ammonia (r(NH) 1.012 Å, ∠HNH 106.7°), NIST CCCBDB; point groups C2v and
 * C3v (CCCBDB). Computational subgroups: C2v for water (the project's reference list, #6 → C2v);
 * Cs for C3v ammonia (the D2h-type subgroups of C3v are Cs and C1 only — subgroup tables of the
 * point groups, quoted from memory).
 */

const DECK = ['! neutral placeholder deck for {{name}}', 'charge {{charge}} spin {{multiplicity}}', 'symmetry {{group}} use {{subgroup}}', 'atoms {{natoms}}', '{{geometry}}', 'end', ''].join('\n');

function xyz(title: string, atoms: AtomJson[]): Buffer {
  // Nudged off exact symmetry by 2e-4 Å, as an optimizer would leave it.
  const lines = atoms.map((a, i) => `${a.element} ${(a.x + (i === 1 ? 2e-4 : 0)).toFixed(10)} ${a.y.toFixed(10)} ${(a.z - (i === 2 ? 1e-4 : 0)).toFixed(10)}`);
  return Buffer.from(`${atoms.length}\n${title}\n${lines.join('\n')}\n`);
}

let db: TestDatabase;
let t: TestApp;
let owner: Member;
let chemist: Member;
let reviewer: Member;
let outsider: Member;
let processors: { close(): Promise<void> } | undefined;

const path = (who: Member, suffix = '') => `/api/workspaces/${who.workspace.slug}/templates${suffix}`;
const send = (who: Member, method: 'post' | 'patch' | 'delete', url: string, body?: object) =>
  request(t.app)[method](url).set('Authorization', who.auth).send(body);

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  owner = await member(db.dataSource, 'owner');
  chemist = await member(db.dataSource, 'chemist', owner.workspace.id);
  reviewer = await member(db.dataSource, 'reviewer', owner.workspace.id);
  outsider = await member(db.dataSource, 'owner');
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await db?.drop();
});

describe('export template routes', () => {
  let created: { id: string; name: string };

  it('lets an owner create a template (a leading dot on the extension is dropped) and audits it', async () => {
    const res = await send(owner, 'post', path(owner), { name: 'Single point', fileExtension: '.inp', body: DECK });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    created = exportTemplateSchema.parse(res.body);
    expect(created).toMatchObject({ name: 'Single point', fileExtension: 'inp', body: DECK });
    const audit = await db.dataSource.query(`SELECT action, detail FROM audit_entries WHERE workspace_id = $1 AND action LIKE 'template.%'`, [owner.workspace.id]);
    expect(audit).toEqual([{ action: 'template.created', detail: expect.objectContaining({ templateId: created.id, name: 'Single point' }) }]);
  });

  it('lists the templates to every member, reviewers included', async () => {
    for (const who of [owner, chemist, reviewer]) {
      const res = await get(t, who, path(owner));
      expect(res.status).toBe(200);
      expect(res.body.map((x: { name: string }) => x.name)).toEqual(['Single point']);
    }
  });

  it('refuses a chemist and a reviewer who try to create, change or delete (403)', async () => {
    for (const who of [chemist, reviewer]) {
      expect((await send(who, 'post', path(owner), { name: 'Mine', fileExtension: 'inp', body: DECK })).status).toBe(403);
      expect((await send(who, 'patch', path(owner, `/${created.id}`), { name: 'Renamed' })).status).toBe(403);
      expect((await send(who, 'delete', path(owner, `/${created.id}`))).status).toBe(403);
    }
  });

  it('hides a workspace and its templates from an owner of another workspace (404)', async () => {
    expect((await get(t, outsider, path(owner))).status).toBe(404);
    expect((await request(t.app).get(path(owner)).set('Authorization', outsider.auth)).status).toBe(404);
    // In their own workspace, the other workspace's template id does not exist.
    expect((await send(outsider, 'patch', path(outsider, `/${created.id}`), { name: 'Stolen' })).status).toBe(404);
    expect((await send(outsider, 'delete', path(outsider, `/${created.id}`))).status).toBe(404);
  });

  it('answers 401 without a caller', async () => {
    expect((await request(t.app).get(path(owner))).status).toBe(401);
  });

  it('rejects unknown placeholders, bad extensions and duplicate names with one-line errors', async () => {
    const unknown = await send(owner, 'post', path(owner), { name: 'Typo', fileExtension: 'inp', body: 'charge {{chrage}}\n{{geometry}' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toContain('{{chrage}}');
    expect(unknown.body.error.message).toContain('{{geometry} (not closed)');
    expect((await send(owner, 'post', path(owner), { name: 'Slash', fileExtension: '../x', body: DECK })).status).toBe(400);
    const dup = await send(owner, 'post', path(owner), { name: 'Single point', fileExtension: 'in', body: DECK });
    expect(dup.status).toBe(409);
    expect(dup.body.error.message).toContain("'Single point' already exists");
  });

  it('lets an owner change and delete a template, each audited', async () => {
    const extra = await send(owner, 'post', path(owner), { name: 'Scratch', fileExtension: 'txt', body: '{{formula}}' });
    const patched = await send(owner, 'patch', path(owner, `/${extra.body.id}`), { body: '{{formula}} {{group}}' });
    expect(patched.status).toBe(200);
    expect(patched.body.body).toBe('{{formula}} {{group}}');
    expect((await send(owner, 'delete', path(owner, `/${extra.body.id}`))).status).toBe(204);
    expect((await send(owner, 'delete', path(owner, `/${extra.body.id}`))).status).toBe(404);
    const actions = await db.dataSource.query(`SELECT action FROM audit_entries WHERE workspace_id = $1 AND detail->>'templateId' = $2 ORDER BY created_at`, [owner.workspace.id, extra.body.id]);
    expect(actions.map((a: { action: string }) => a.action)).toEqual(['template.created', 'template.updated', 'template.deleted']);
  });
});

describe('a batch with an export template', () => {
  let templateId: string;
  let batchId: string;

  beforeAll(async () => {
    templateId = (await get(t, owner, path(owner))).body[0].id;
    processors = await startProcessors(t.deps, { sweepIntervalMs: 1000 });
  });

  it('refuses unknown or foreign template ids and stores no batch', async () => {
    const files = [{ name: 'water.xyz', bytes: xyz('water cation', water()) }];
    const foreign = (await send(outsider, 'post', path(outsider), { name: 'Theirs', fileExtension: 'inp', body: DECK })).body.id as string;
    expect((await upload(t, chemist, files, { templateIds: JSON.stringify([foreign]) })).status).toBe(404);
    expect((await upload(t, chemist, files, { templateIds: JSON.stringify(['not-an-id']) })).status).toBe(404);
    expect((await upload(t, chemist, files, { templateIds: '{"a":1}' })).status).toBe(400);
    const count = await db.dataSource.query(`SELECT count(*)::int AS n FROM batches WHERE workspace_id = $1`, [owner.workspace.id]);
    expect(count[0].n).toBe(0);
  });

  it('writes one rendered deck per structure with its charge, multiplicity, group and subgroup', async () => {
    const res = await upload(t, chemist, [{ name: 'water.xyz', bytes: xyz('water cation', water()) }, { name: 'ammonia.xyz', bytes: xyz('ammonia cation', ammonia()) }], {
      settings: JSON.stringify({ charge: 1, multiplicity: 2, outputFormats: ['xyz'] }),
      templateIds: JSON.stringify([templateId]),
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    batchId = res.body.id;
    expect((await waitForBatch(t, chemist, batchId)).status).toBe('done');
    // The batch says which decks it renders (its copies, for provenance), on the page's endpoint.
    const detail = batchDetailSchema.parse((await get(t, chemist, `/api/batches/${batchId}`)).body);
    expect(detail.templates).toEqual([{ name: 'Single point', fileExtension: 'inp' }]);

    const zip = await getBinary(t, chemist, `/api/batches/${batchId}/download`);
    expect(zip.status).toBe(200);
    const files = await unzip(zip.body);
    expect([...files.keys()].sort()).toEqual(['ammonia.inp', 'ammonia.xyz', 'manifest.json', 'summary.csv', 'water.inp', 'water.xyz']);

    const waterDeck = files.get('water.inp')!.toString('utf8');
    expect(waterDeck).toContain('charge 1 spin 2\nsymmetry C2v use C2v\natoms 3\n');
    const ammoniaDeck = files.get('ammonia.inp')!.toString('utf8');
    expect(ammoniaDeck).toContain('charge 1 spin 2\nsymmetry C3v use Cs\natoms 4\n');

    // The deck's geometry is the cleaned geometry: the same numbers as the cleaned XYZ file.
    const deckAtoms = waterDeck.split('\n').slice(4, 7).map((l) => l.trim().split(/\s+/));
    const xyzAtoms = files.get('water.xyz')!.toString('utf8').trim().split('\n').slice(2).map((l) => l.trim().split(/\s+/));
    expect(deckAtoms.map((a) => a[0])).toEqual(['O', 'H', 'H']);
    for (let i = 0; i < 3; i++) for (let k = 1; k <= 3; k++) expect(Number(deckAtoms[i][k])).toBeCloseTo(Number(xyzAtoms[i][k]), 10);
    // Snapped exactly: the two H mirror each other in the yz plane (y → −y), to the printed digits.
    expect(Number(deckAtoms[1][2])).toBeCloseTo(-Number(deckAtoms[2][2]), 10);

    const manifest = JSON.parse(files.get('manifest.json')!.toString('utf8'));
    expect(manifest.batch.exportTemplates).toEqual([{ name: 'Single point', fileExtension: 'inp', bodySha256: expect.stringMatching(/^[0-9a-f]{64}$/) }]);
    const byName = new Map(manifest.structures.map((s: { inputFile: string; outputFiles: string[] }) => [s.inputFile, s.outputFiles]));
    expect(byName.get('water.xyz')).toEqual(['water.xyz', 'water.inp']);
    expect(byName.get('ammonia.xyz')).toEqual(['ammonia.xyz', 'ammonia.inp']);
  });

  it('keeps the decks of a finished batch when the template is changed or deleted afterwards', async () => {
    expect((await send(owner, 'patch', path(owner, `/${templateId}`), { body: 'changed {{formula}}' })).status).toBe(200);
    const files = await unzip((await getBinary(t, chemist, `/api/batches/${batchId}/download`)).body);
    expect(files.get('water.inp')!.toString('utf8')).toContain('symmetry C2v use C2v');
    expect((await send(owner, 'delete', path(owner, `/${templateId}`))).status).toBe(204);
    const again = await unzip((await getBinary(t, chemist, `/api/batches/${batchId}/download`)).body);
    expect(again.get('ammonia.inp')!.toString('utf8')).toContain('symmetry C3v use Cs');
  });

  it('leaves a batch without templates as before: no decks, no exportTemplates in the manifest', async () => {
    const res = await upload(t, chemist, [{ name: 'water.xyz', bytes: xyz('water', water()) }], { settings: JSON.stringify({ outputFormats: ['xyz'] }) });
    expect(res.status).toBe(201);
    await waitForBatch(t, chemist, res.body.id);
    const files = await unzip((await getBinary(t, chemist, `/api/batches/${res.body.id}/download`)).body);
    expect([...files.keys()].sort()).toEqual(['manifest.json', 'summary.csv', 'water.xyz']);
    expect(JSON.parse(files.get('manifest.json')!.toString('utf8')).batch.exportTemplates).toBeUndefined();
  });
});
