import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startProcessors } from '../../../worker/processors/index';
import { buildTestApp, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import { allRows, DEMO_FILES, get, getBinary, member, post, upload, waitForBatch, WATER_XYZ, type Member } from './support';

/*
 * Who may do what with a batch, cancelling, re-snapping with another target, and the review
 * decisions with sign-off — on the real PostgreSQL and Redis.
 */

let db: TestDatabase;
let t: TestApp;
/** A second app on its own queue prefix with no worker behind it: its batches stay queued. */
let idle: TestApp;
let processors: { close(): Promise<void> };
let chemist: Member;
let reviewer: Member;
let owner: Member;
let outsider: Member;
let batchId: string;

const ligands = DEMO_FILES.filter((f) => f.name === 'ligands.xyz');

beforeAll(async () => {
  db = await createTestDatabase();
  t = await buildTestApp({ dataSource: db.dataSource });
  idle = await buildTestApp({ dataSource: db.dataSource });
  chemist = await member(db.dataSource, 'chemist');
  reviewer = await member(db.dataSource, 'reviewer', chemist.workspace.id);
  owner = await member(db.dataSource, 'owner', chemist.workspace.id);
  outsider = await member(db.dataSource, 'owner');
  processors = await startProcessors(t.deps, { sweepIntervalMs: 1000 });
  const res = await upload(t, chemist, ligands, { settings: JSON.stringify({ tolerance: 0.1 }) });
  expect(res.status).toBe(201);
  batchId = res.body.id;
  await waitForBatch(t, chemist, batchId);
});

afterAll(async () => {
  await processors?.close();
  await t?.close();
  await idle?.close();
  await db?.drop();
});

describe('who may see and change a batch', () => {
  it('401 without a caller', async () => {
    expect((await request(t.app).get(`/api/batches/${batchId}`)).status).toBe(401);
    expect((await request(t.app).get(`/api/workspaces/${chemist.workspace.slug}/batches`)).status).toBe(401);
  });

  it("404 for another workspace's batch, structures and downloads, and for ids that are not ids", async () => {
    const rows = await allRows(t, chemist, batchId);
    for (const path of [
      `/api/batches/${batchId}`,
      `/api/batches/${batchId}/structures`,
      `/api/batches/${batchId}/download`,
      `/api/batches/${batchId}/reviews`,
      `/api/structures/${rows[0].id}`,
      `/api/structures/${rows[0].id}/download`,
      `/api/batches/not-a-uuid`,
      `/api/structures/00000000-0000-4000-8000-000000000000`,
    ]) {
      const res = await get(t, outsider, path);
      expect(res.status, path).toBe(404);
    }
    expect((await post(t, outsider, `/api/batches/${batchId}/cancel`)).status).toBe(404);
    expect((await post(t, outsider, `/api/batches/${batchId}/resnap`, { structureIds: [rows[0].id], target: { kind: 'perceived' } })).status).toBe(404);
    // A token is bound to its workspace: naming another slug is a 404 too.
    expect((await upload(t, outsider, ligands)).status).toBe(201);
    const cross = await request(t.app).post(`/api/workspaces/${chemist.workspace.slug}/batches`).set('Authorization', outsider.auth).attach('files', Buffer.from(WATER_XYZ), 'w.xyz');
    expect(cross.status).toBe(404);
  });

  it('403 for a reviewer uploading, cancelling or re-snapping; 403 for a chemist reviewing', async () => {
    const rows = await allRows(t, chemist, batchId);
    expect((await upload(t, reviewer, ligands)).status).toBe(403);
    expect((await post(t, reviewer, `/api/batches/${batchId}/cancel`)).status).toBe(403);
    expect((await post(t, reviewer, `/api/batches/${batchId}/resnap`, { structureIds: [rows[0].id], target: { kind: 'perceived' } })).status).toBe(403);
    expect((await post(t, chemist, `/api/batches/${batchId}/reviews`, { structureIds: [rows[0].id], decision: 'accepted' })).status).toBe(403);
    expect((await post(t, chemist, `/api/batches/${batchId}/sign-off`, {})).status).toBe(403);
    // Reading is for every member.
    expect((await get(t, reviewer, `/api/batches/${batchId}`)).status).toBe(200);
    expect((await getBinary(t, reviewer, `/api/batches/${batchId}/download`)).status).toBe(200);
  });
});

describe('preview', () => {
  it('says what it recognises in the files and stores nothing', async () => {
    const before = (await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches`)).body.total;
    let req = request(t.app).post(`/api/workspaces/${chemist.workspace.slug}/batches/preview`).set('Authorization', chemist.auth);
    for (const f of DEMO_FILES) req = req.attach('files', f.bytes, f.name);
    const res = await req;
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ formats: { xyz: 2, sdf: 1, qcschema: 1 }, frames: 37, structures: 36 });
    expect(res.body.files.map((f: { name: string; structures: number }) => [f.name, f.structures])).toEqual([
      ['ligands.xyz', 12],
      ['fragments.xyz', 15],
      ['complexes.sdf', 9],
      ['clusters.qcschema.json', 1],
    ]);
    expect(res.body.errors).toEqual([{ file: 'ligands.xyz', frame: 5, line: null, message: "ligands.xyz:31: frame 6: atom 2: coordinate '1.128O0000' is not a number" }]);
    expect((await get(t, chemist, `/api/workspaces/${chemist.workspace.slug}/batches`)).body.total).toBe(before);
    expect((await request(t.app).post(`/api/workspaces/${chemist.workspace.slug}/batches/preview`).set('Authorization', reviewer.auth).attach('files', ligands[0].bytes, 'l.xyz')).status).toBe(403);
  });
});

describe('cancel', () => {
  it('cancels a queued batch: its structures are cancelled and it cannot be cancelled twice', async () => {
    const queued = await upload(idle, chemist, ligands);
    expect(queued.status).toBe(201);
    expect(queued.body.status).toBe('queued');
    const res = await post(idle, chemist, `/api/batches/${queued.body.id}/cancel`);
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('cancelled');
    const rows = await allRows(idle, chemist, queued.body.id);
    expect(rows.filter((r) => r.status === 'cancelled')).toHaveLength(11);
    expect(rows.filter((r) => r.status === 'error')).toHaveLength(1);
    const again = await post(idle, chemist, `/api/batches/${queued.body.id}/cancel`);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain('already cancelled');
  });

  it('refuses to cancel a finished batch', async () => {
    const res = await post(t, chemist, `/api/batches/${batchId}/cancel`);
    expect(res.status).toBe(409);
  });
});

describe('re-snap with another target', () => {
  it('snaps ammonia to its subgroup Cs through the queue, keeping the perceived C3v', async () => {
    const rows = await allRows(t, chemist, batchId);
    const nh3 = rows.find((r) => r.name === 'L02 ammine')!;
    const res = await post(t, owner, `/api/batches/${batchId}/resnap`, { structureIds: [nh3.id], target: { kind: 'group', group: 'cs' } });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect(res.body.queued).toBe(1);
    expect(res.body.batch.status).toBe('running');
    await waitForBatch(t, chemist, batchId);
    const detail = (await get(t, chemist, `/api/structures/${nh3.id}`)).body;
    expect(detail).toMatchObject({ status: 'done', perceivedGroup: 'C3v', pointGroup: 'Cs' });
    expect(detail.settings.target).toEqual({ kind: 'group', group: 'Cs' });
    // Only one notice per batch: the re-snap finishing sends none.
    expect(t.mail.filter((m) => m.to === chemist.user.email)).toHaveLength(1);
  });

  it('refuses a group that is neither on the ladder nor a subgroup, naming what is allowed', async () => {
    const rows = await allRows(t, chemist, batchId);
    const nh3 = rows.find((r) => r.name === 'L02 ammine')!;
    // C2 is not a subgroup of C3v (C3v has no two-fold axis), nor on ammonia's ladder.
    const res = await post(t, chemist, `/api/batches/${batchId}/resnap`, { structureIds: [nh3.id], target: { kind: 'group', group: 'C2' } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/C2 is not an allowed target; choose one of .*C3v.*Cs/);
    const unknown = await post(t, chemist, `/api/batches/${batchId}/resnap`, { structureIds: [nh3.id], target: { kind: 'group', group: 'Q7' } });
    expect(unknown.status).toBe(400);
    const bad = rows.find((r) => r.status === 'error')!;
    expect((await post(t, chemist, `/api/batches/${batchId}/resnap`, { structureIds: [bad.id], target: { kind: 'perceived' } })).status).toBe(409);
  });
});

describe('review decisions and sign-off', () => {
  it('records decisions, counts them, and signs off only when every structure is decided', async () => {
    const rows = await allRows(t, chemist, batchId);
    const [first, ...rest] = rows;
    const flag = await post(t, reviewer, `/api/batches/${batchId}/reviews`, { structureIds: [first.id], decision: 'flagged', comment: 'check the frame' });
    expect(flag.status).toBe(201);
    const early = await post(t, reviewer, `/api/batches/${batchId}/sign-off`, { comment: 'ok' });
    expect(early.status).toBe(409);
    expect(early.body.error.message).toContain('11 structures still need a decision');
    const accept = await post(t, reviewer, `/api/batches/${batchId}/reviews`, { structureIds: rest.map((r) => r.id), decision: 'accepted' });
    expect(accept.status).toBe(201);
    const counts = (await get(t, reviewer, `/api/batches/${batchId}`)).body.counts;
    expect(counts).toMatchObject({ accepted: 11, flagged: 1 });
    expect((await get(t, reviewer, `/api/batches/${batchId}/structures?review=flagged`)).body.total).toBe(1);
    const signed = await post(t, reviewer, `/api/batches/${batchId}/sign-off`, { comment: 'cleared for the frequency runs' });
    expect(signed.status).toBe(200);
    expect(signed.body.signedOffBy).toEqual({ id: reviewer.user.id, name: reviewer.user.name });
    const history = (await get(t, chemist, `/api/batches/${batchId}/reviews`)).body;
    expect(history[0]).toMatchObject({ decision: 'signed-off', comment: 'cleared for the frequency runs', structureId: null });
    expect(history.filter((e: { decision: string }) => e.decision === 'accepted')).toHaveLength(11);
    const detail = (await get(t, chemist, `/api/structures/${first.id}`)).body;
    expect(detail.review).toBe('flagged');
    expect(detail.reviews[0]).toMatchObject({ decision: 'flagged', comment: 'check the frame', reviewer: { name: reviewer.user.name } });
  });

  it('keeps a signed-off batch final', async () => {
    const rows = await allRows(t, chemist, batchId);
    expect((await post(t, reviewer, `/api/batches/${batchId}/sign-off`, {})).status).toBe(409);
    expect((await post(t, reviewer, `/api/batches/${batchId}/reviews`, { structureIds: [rows[0].id], decision: 'accepted' })).status).toBe(409);
    expect((await post(t, chemist, `/api/batches/${batchId}/resnap`, { structureIds: [rows[0].id], target: { kind: 'perceived' } })).status).toBe(409);
  });
});
