import { randomBytes } from 'node:crypto';
import { PassThrough } from 'node:stream';
import { ZipArchive } from 'archiver';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { allRows, get, member, storedZip, upload, WATER_XYZ, type Member } from './support';

/*
 * Hostile and broken uploads: each gets a clear one-line answer, and nothing else is lost — the
 * other files of the same upload go on, and earlier batches stay as they were. No worker runs
 * here: these are decided at upload.
 */

let db: TestDatabase;
let t: TestApp;
let strict: TestApp;
let chemist: Member;
let firstBatch: string;

const water = Buffer.from(WATER_XYZ);

async function zipOf(entries: { name: string; data: Buffer }[], level = 9): Promise<Buffer> {
  const archive = new ZipArchive({ zlib: { level } });
  const sink = new PassThrough();
  const chunks: Buffer[] = [];
  sink.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise((resolve) => sink.on('end', resolve));
  archive.pipe(sink);
  for (const e of entries) archive.append(e.data, { name: e.name });
  await archive.finalize();
  await done;
  return Buffer.concat(chunks);
}

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  strict = await buildTestApp({ dataSource: db.dataSource, env: { UPLOAD_MAX_STRUCTURES: '5', UPLOAD_MAX_BYTES: '20000' } });
  chemist = await member(db.dataSource, 'chemist');
  const res = await upload(t, chemist, [{ name: 'water.xyz', bytes: water }]);
  expect(res.status).toBe(201);
  firstBatch = res.body.id;
});

afterAll(async () => {
  await t?.close();
  await strict?.close();
  await db?.drop();
});

async function batchCount() {
  return (await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches`)).body.total as number;
}

describe('hostile uploads', () => {
  it('refuses a ZIP bomb whole (413) and stores nothing', async () => {
    const before = await batchCount();
    // 64 MiB of zeros deflate to ~64 KiB: a ratio near 1000×, far over the 200× limit.
    const bomb = await zipOf([{ name: 'zeros.xyz', data: Buffer.alloc(64 * 1024 * 1024) }]);
    expect(bomb.length).toBeLessThan(1024 * 1024);
    const res = await upload(t, chemist, [{ name: 'bomb.zip', bytes: bomb }, { name: 'water.xyz', bytes: water }]);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/^bomb\.zip: entry 'zeros\.xyz' expands \d+× \(limit 200×\).*ZIP bomb/);
    expect(await batchCount()).toBe(before);
  });

  it('reports a path-traversal entry as an error of its own and reads the rest of the archive', async () => {
    const zip = storedZip([
      { name: '../../etc/evil.xyz', data: water },
      { name: 'good/water.xyz', data: water },
    ]);
    const res = await upload(t, chemist, [{ name: 'mixed.zip', bytes: zip }]);
    expect(res.status).toBe(201);
    const rows = await allRows(t, chemist, res.body.id);
    expect(rows).toHaveLength(2);
    const evil = rows.find((r) => r.status === 'error')!;
    expect(evil.error).toContain("entry '../../etc/evil.xyz' has an unsafe path");
    expect(evil.sourceFile).not.toContain('..');
    const good = rows.find((r) => r.status === 'queued')!;
    expect(good.sourceFile).toBe('mixed.zip/good/water.xyz');
    expect(res.body.files.every((f: { name: string }) => !f.name.includes('..'))).toBe(true);
  });

  it('turns a frame of 10⁶ atoms into an error without storing its atoms', async () => {
    const n = 1_000_000;
    const lines = new Array<string>(n);
    for (let i = 0; i < n; i++) lines[i] = `C ${(i % 100) * 1.5} ${Math.floor(i / 100) % 100 * 1.5} ${Math.floor(i / 10000) * 1.5}`;
    const huge = Buffer.from(`${n}\nhuge\n${lines.join('\n')}\n`);
    const res = await upload(t, chemist, [{ name: 'huge.xyz', bytes: huge }, { name: 'water.xyz', bytes: water }]);
    expect(res.status).toBe(201);
    const rows = await allRows(t, chemist, res.body.id);
    const big = rows.find((r) => r.sourceFile === 'huge.xyz')!;
    expect(big.status).toBe('error');
    expect(big.error).toBe('huge.xyz:1: frame 1: 1,000,000 atoms exceeds the limit of 20,000 per structure');
    const stored = await db.dataSource.query(`SELECT atom_count, jsonb_array_length(input_atoms) AS n FROM structures WHERE id = $1`, [big.id]);
    expect(stored[0]).toEqual({ atom_count: 0, n: 0 });
    expect(rows.find((r) => r.sourceFile === 'water.xyz')!.status).toBe('queued');
  });

  it('turns NaN coordinates into a located error', async () => {
    const res = await upload(t, chemist, [{ name: 'nan.xyz', bytes: Buffer.from('2\nbroken\nH NaN 0 0\nH 0 0 0.74\n') }]);
    expect(res.status).toBe(201);
    const [row] = await allRows(t, chemist, res.body.id);
    expect(row.status).toBe('error');
    expect(row.error).toMatch(/^nan\.xyz:3: frame 1: .*NaN/);
    // Nothing could be snapped: the batch has failed at once.
    expect((await get(t, chemist, `/api/batches/${res.body.id}`)).body.status).toBe('failed');
  });

  it('turns a binary file named .xyz into an error, the other file goes on', async () => {
    const junk = Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0, 0, 0]), randomBytes(4096)]);
    const res = await upload(t, chemist, [{ name: 'a.out.xyz', bytes: junk }, { name: 'water.xyz', bytes: water }]);
    expect(res.status).toBe(201);
    const rows = await allRows(t, chemist, res.body.id);
    const bin = rows.find((r) => r.sourceFile === 'a.out.xyz')!;
    expect(bin.status).toBe('error');
    expect(bin.error).toBe('a.out.xyz: frame 1: not a text file (it contains NUL bytes)');
    expect(rows.find((r) => r.sourceFile === 'water.xyz')!.status).toBe('queued');
  });

  it('answers an upload with no files, an empty file and a non-multipart body clearly', async () => {
    const none = await request(t.app).post(`/api/workspaces/${chemist.workspace.slug}/batches`).set('Authorization', chemist.auth).field('name', 'nothing');
    expect(none.status).toBe(400);
    expect(none.body.error.message).toBe('The upload holds no files: attach structure files or a ZIP archive');
    const json = await request(t.app).post(`/api/workspaces/${chemist.workspace.slug}/batches`).set('Authorization', chemist.auth).send({ files: [] });
    expect(json.status).toBe(400);
    const empty = await upload(t, chemist, [{ name: 'empty.xyz', bytes: Buffer.alloc(0) }]);
    expect(empty.status).toBe(201);
    const [row] = await allRows(t, chemist, empty.body.id);
    expect(row.error).toMatch(/empty/);
  });

  it('refuses bad settings before reading anything', async () => {
    const before = await batchCount();
    const notJson = await upload(t, chemist, [{ name: 'water.xyz', bytes: water }], { settings: '{tolerance:' });
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.message).toBe('settings: not valid JSON');
    const negative = await upload(t, chemist, [{ name: 'water.xyz', bytes: water }], { settings: JSON.stringify({ tolerance: -1 }) });
    expect(negative.status).toBe(400);
    expect(negative.body.error.message).toMatch(/tolerance/);
    const group = await upload(t, chemist, [{ name: 'water.xyz', bytes: water }], { settings: JSON.stringify({ target: { kind: 'group', group: 'X9' } }) });
    expect(group.status).toBe(400);
    expect(group.body.error.message).toContain("'X9' is not a point group");
    expect(await batchCount()).toBe(before);
  });

  it('enforces the configured size and structure limits with 413', async () => {
    const many = Buffer.from(Array.from({ length: 6 }, () => WATER_XYZ).join(''));
    const tooMany = await upload(strict, chemist, [{ name: 'six.xyz', bytes: many }]);
    expect(tooMany.status).toBe(413);
    expect(tooMany.body.error.message).toContain('more than 5 structures');
    const tooBig = await upload(strict, chemist, [{ name: 'big.xyz', bytes: Buffer.alloc(30_000, 0x20) }]);
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.message).toMatch(/limit/);
  });

  it('lost nothing: the first batch is intact', async () => {
    const first = (await get(t, chemist, `/api/batches/${firstBatch}`)).body;
    expect(first).toMatchObject({ id: firstBatch, status: 'queued', counts: { total: 1 } });
    const rows = await allRows(t, chemist, firstBatch);
    expect(rows[0]).toMatchObject({ name: 'water', status: 'queued' });
  });
});
