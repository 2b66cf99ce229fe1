import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { crc32 } from 'node:zlib';
import request from 'supertest';
import type { Response } from 'supertest';
import yauzl from 'yauzl';
import type { DataSource } from 'typeorm';
import type { Role } from '@shared/contracts/api';
import { issueApiToken } from '../../../server/modules/tokens/service';
import { createUser, createWorkspace, type TestApp } from '../../support/app';

/** The demo files (examples/demo), as the upload form would send them. */
export const DEMO_FILES = ['ligands.xyz', 'fragments.xyz', 'complexes.sdf', 'clusters.qcschema.json'].map((name) => ({
  name,
  bytes: readFileSync(new URL(`../../../examples/demo/${name}`, import.meta.url)),
}));

export const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

/** A member with an API token for a fresh workspace (or the given one). */
export async function member(ds: DataSource, role: Role, workspaceId?: string) {
  const user = await createUser(ds);
  const workspace = workspaceId
    ? { id: workspaceId, slug: (await ds.query(`SELECT slug FROM workspaces WHERE id = $1`, [workspaceId]))[0].slug as string }
    : await createWorkspace(ds, {});
  await ds.query(`INSERT INTO memberships (workspace_id, user_id, role) VALUES ($1, $2, $3)`, [workspace.id, user.id, role]);
  const { token } = await issueApiToken(ds, { userId: user.id, workspaceId: workspace.id, label: 'test' });
  return { user, workspace: { id: workspace.id, slug: workspace.slug }, token, auth: `Bearer ${token}` };
}

export type Member = Awaited<ReturnType<typeof member>>;

/** POST a multipart upload as `who`. */
export function upload(t: TestApp, who: Member, files: { name: string; bytes: Buffer }[], fields: Record<string, string> = {}) {
  let req = request(t.app).post(`/api/workspaces/${who.workspace.slug}/batches`).set('Authorization', who.auth);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (const f of files) req = req.attach('files', f.bytes, f.name);
  return req;
}

export const get = (t: TestApp, who: Member, path: string) => request(t.app).get(path).set('Authorization', who.auth);
export const post = (t: TestApp, who: Member, path: string, body: object = {}) => request(t.app).post(path).set('Authorization', who.auth).send(body);

/** GET a binary body (ZIP) as a Buffer. */
export function getBinary(t: TestApp, who: Member, path: string) {
  return request(t.app)
    .get(path)
    .set('Authorization', who.auth)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    }) as unknown as Promise<Response & { body: Buffer }>;
}

/** Polls the batch until it is final (or the time runs out). */
export async function waitForBatch(t: TestApp, who: Member, id: string, timeoutMs = 45_000) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const res = await get(t, who, `/api/batches/${id}`);
    if (['done', 'failed', 'cancelled'].includes(res.body.status)) return res.body;
    if (Date.now() > until) throw new Error(`batch ${id} still ${res.body.status} after ${timeoutMs} ms: ${JSON.stringify(res.body.counts)}`);
    await new Promise((r) => setTimeout(r, 300));
  }
}

/** Every row of the batch's structure table. */
export async function allRows(t: TestApp, who: Member, id: string) {
  const res = await get(t, who, `/api/batches/${id}/structures?pageSize=500`);
  return res.body.items as { id: string; name: string; status: string; perceivedGroup: string | null; pointGroup: string | null; computationalSubgroup: string | null; error: string | null; flags: string[]; sourceFile: string; frameIndex: number; maxDisplacement: number | null }[];
}

/** The entries of a ZIP held in memory. */
export function unzip(buffer: Buffer): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(buffer, { lazyEntries: true }, (err, zip) => {
      if (err || !zip) return reject(err);
      const out = new Map<string, Buffer>();
      zip.on('error', reject);
      zip.on('end', () => resolve(out));
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (e, stream) => {
          if (e || !stream) return reject(e);
          const chunks: Buffer[] = [];
          stream.on('data', (c: Buffer) => chunks.push(c));
          stream.on('end', () => {
            out.set(entry.fileName, Buffer.concat(chunks));
            zip.readEntry();
          });
        });
      });
      zip.readEntry();
    });
  });
}

/**
 * A ZIP of stored (uncompressed) entries with names taken verbatim — including names no archiver
 * would write, such as `../../evil.xyz`. Layout per the PKWARE APPNOTE (local headers, central
 * directory, end record).
 */
export function storedZip(entries: { name: string; data: Buffer }[]): Buffer {
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const e of entries) {
    const name = Buffer.from(e.name, 'utf8');
    const crc = crc32(e.data);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0x0800, 6); // UTF-8 names
    local.writeUInt16LE(0, 8); // stored
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(e.data.length, 18);
    local.writeUInt32LE(e.data.length, 22);
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt16LE(0x0800, 8);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(e.data.length, 20);
    central.writeUInt32LE(e.data.length, 24);
    central.writeUInt16LE(name.length, 28);
    central.writeUInt32LE(offset, 42);
    locals.push(local, name, e.data);
    centrals.push(central, name);
    offset += 30 + name.length + e.data.length;
  }
  const cd = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(entries.length, 8);
  end.writeUInt16LE(entries.length, 10);
  end.writeUInt32LE(cd.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, cd, end]);
}

/** Water as an XYZ file (r(OH) 0.9572 Å, HOH 104.52°: the usual gas-phase values, quoted from memory). */
export const WATER_XYZ = `3
water
O 0.000000 0.000000 0.117300
H 0.000000 0.757200 -0.469200
H 0.000000 -0.757200 -0.469200
`;
