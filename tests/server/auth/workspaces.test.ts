import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiToken } from '../../../server/modules/tokens/entity';
import { Membership } from '../../../server/modules/workspaces/entity';
import { buildTestApp, createUser, createWorkspace, signInAs, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import type { User } from '../../../server/modules/users/entity';
import type { Workspace } from '../../../server/modules/workspaces/entity';
import type TestAgent from 'supertest/lib/agent';

describe('workspaces, roles and API tokens', () => {
  let db: TestDatabase;
  let t: TestApp;
  // Workspace A: owner, chemist, reviewer. Workspace B: its own owner and chemist.
  let a: Workspace, b: Workspace;
  let ownerA: User, chemistA: User, reviewerA: User, ownerB: User, chemistB: User;
  let asOwnerA: TestAgent, asChemistA: TestAgent, asReviewerA: TestAgent, asOwnerB: TestAgent;

  beforeAll(async () => {
    db = await createTestDatabase();
    t = await buildTestApp({ dataSource: db.dataSource });
    [ownerA, chemistA, reviewerA, ownerB, chemistB] = await Promise.all([1, 2, 3, 4, 5].map(() => createUser(db.dataSource)));
    a = await createWorkspace(db.dataSource, { [ownerA.id]: 'owner', [chemistA.id]: 'chemist', [reviewerA.id]: 'reviewer' }, { slug: 'group-a' });
    b = await createWorkspace(db.dataSource, { [ownerB.id]: 'owner', [chemistB.id]: 'chemist' }, { slug: 'group-b' });
    asOwnerA = t.agent();
    asChemistA = t.agent();
    asReviewerA = t.agent();
    asOwnerB = t.agent();
    await signInAs(asOwnerA, ownerA.id);
    await signInAs(asChemistA, chemistA.id);
    await signInAs(asReviewerA, reviewerA.id);
    await signInAs(asOwnerB, ownerB.id);
  });
  afterAll(async () => {
    await t?.close();
    await db?.drop();
  });

  describe('across workspaces', () => {
    it("gives a member of A 404 for B's workspace, members, tokens and audit log — every time", async () => {
      for (const agent of [asOwnerA, asChemistA, asReviewerA]) {
        for (const path of ['/api/workspaces/group-b', '/api/workspaces/group-b/members', '/api/workspaces/group-b/tokens', '/api/workspaces/group-b/audit', '/api/workspaces/group-b/invitations']) {
          const res = await agent.get(path).expect(404);
          expect(res.body.error.code).toBe('not-found');
        }
      }
    });

    it("gives 404 when A's owner addresses B's member or token by id, through either workspace", async () => {
      const tokenB = await asOwnerB.post('/api/workspaces/group-b/tokens').send({ label: 'b cluster' }).expect(201);
      await asOwnerA.patch(`/api/workspaces/group-a/members/${chemistB.id}`).send({ role: 'reviewer' }).expect(404);
      await asOwnerA.delete(`/api/workspaces/group-a/members/${chemistB.id}`).expect(404);
      await asOwnerA.patch(`/api/workspaces/group-b/members/${chemistB.id}`).send({ role: 'reviewer' }).expect(404);
      await asOwnerA.delete(`/api/workspaces/group-a/tokens/${tokenB.body.id}`).expect(404);
      await asOwnerA.delete(`/api/workspaces/group-b/tokens/${tokenB.body.id}`).expect(404);
      // B's token still works: nothing was revoked by those attempts.
      await request(t.app).get('/api/workspaces/group-b').set('Authorization', `Bearer ${tokenB.body.token}`).expect(200);
      expect((await db.dataSource.getRepository(Membership).findOneByOrFail({ workspaceId: b.id, userId: chemistB.id })).role).toBe('chemist');
    });

    it("keeps an API token to its own workspace: A's token gets 404 on B even though its user could be in both", async () => {
      const both = await createUser(db.dataSource);
      await db.dataSource.getRepository(Membership).save([
        { workspaceId: a.id, userId: both.id, role: 'chemist' },
        { workspaceId: b.id, userId: both.id, role: 'chemist' },
      ]);
      const agent = t.agent();
      await signInAs(agent, both.id);
      const token = (await agent.post('/api/workspaces/group-a/tokens').send({ label: 'a only' }).expect(201)).body.token;
      const bearer = (path: string) => request(t.app).get(path).set('Authorization', `Bearer ${token}`);
      await bearer('/api/workspaces/group-a').expect(200);
      await bearer('/api/workspaces/group-b').expect(404);
      await bearer('/api/workspaces/group-b/members').expect(404);
      const me = await bearer('/api/me').expect(200);
      expect(me.body.memberships.map((m: { workspace: { slug: string } }) => m.workspace.slug)).toEqual(['group-a']);
    });
  });

  describe('roles', () => {
    it('lets every member read the workspace and its members; only owners change it', async () => {
      for (const agent of [asOwnerA, asChemistA, asReviewerA]) {
        const members = await agent.get('/api/workspaces/group-a/members').expect(200);
        const roles = new Map(members.body.map((m: { user: { id: string }; role: string }) => [m.user.id, m.role]));
        expect(roles.get(ownerA.id)).toBe('owner');
        expect(roles.get(chemistA.id)).toBe('chemist');
        expect(roles.get(reviewerA.id)).toBe('reviewer');
        expect(roles.has(ownerB.id)).toBe(false);
      }
      for (const agent of [asChemistA, asReviewerA]) {
        expect((await agent.patch('/api/workspaces/group-a').send({ name: 'Mine now' }).expect(403)).body.error.code).toBe('forbidden');
        await agent.patch(`/api/workspaces/group-a/members/${ownerA.id}`).send({ role: 'reviewer' }).expect(403);
        await agent.delete(`/api/workspaces/group-a/members/${ownerA.id}`).expect(403);
        await agent.post('/api/workspaces/group-a/invitations').send({ email: 'x@example.org', role: 'owner' }).expect(403);
        await agent.get('/api/workspaces/group-a/audit').expect(403);
      }
    });

    it('merges and validates default snap settings set by an owner, and /api/me shows them', async () => {
      const res = await asOwnerA.patch('/api/workspaces/group-a').send({ defaults: { tolerance: 0.02 } }).expect(200);
      expect(res.body.defaults).toMatchObject({ tolerance: 0.02, displacementBudget: 0.05, frame: 'standard' });
      await asOwnerA.patch('/api/workspaces/group-a').send({ defaults: { displacementBudget: 0.1 } }).expect(200);
      const me = await asChemistA.get('/api/me').expect(200);
      const ws = me.body.memberships.find((m: { workspace: { slug: string } }) => m.workspace.slug === 'group-a').workspace;
      expect(ws.defaults).toMatchObject({ tolerance: 0.02, displacementBudget: 0.1 });
      const bad = await asOwnerA.patch('/api/workspaces/group-a').send({ defaults: { tolerance: -1 } }).expect(400);
      expect(bad.body.error.message).toMatch(/tolerance/);
      await asOwnerA.patch('/api/workspaces/group-a').send({ colour: 'red' }).expect(400);
      await asOwnerA.patch('/api/workspaces/group-a').send({ defaults: { outputFormats: ['docx'] } }).expect(400);
    });

    it('lets an owner change roles, and the new role takes effect at once', async () => {
      const person = await createUser(db.dataSource);
      await db.dataSource.getRepository(Membership).save({ workspaceId: a.id, userId: person.id, role: 'reviewer' });
      const agent = t.agent();
      await signInAs(agent, person.id);
      await agent.post('/api/workspaces/group-a/invitations').send({ email: 'y@example.org', role: 'chemist' }).expect(403);
      const res = await asOwnerA.patch(`/api/workspaces/group-a/members/${person.id}`).send({ role: 'owner' }).expect(200);
      expect(res.body).toMatchObject({ role: 'owner', user: { id: person.id } });
      await agent.post('/api/workspaces/group-a/invitations').send({ email: 'y@example.org', role: 'chemist' }).expect(201);
      await asOwnerA.patch(`/api/workspaces/group-a/members/${person.id}`).send({ role: 'boss' }).expect(400);
      await asOwnerA.patch('/api/workspaces/group-a/members/not-a-uuid').send({ role: 'chemist' }).expect(400);
      // Hand the workspace back to a single owner for the next tests.
      await asOwnerA.delete(`/api/workspaces/group-a/members/${person.id}`).expect(204);
    });

    it('refuses to let the last owner step down or leave, and says what to do instead', async () => {
      const demote = await asOwnerA.patch(`/api/workspaces/group-a/members/${ownerA.id}`).send({ role: 'chemist' }).expect(409);
      expect(demote.body.error.message).toMatch(/last owner/);
      const leave = await asOwnerA.delete(`/api/workspaces/group-a/members/${ownerA.id}`).expect(409);
      expect(leave.body.error.message).toMatch(/last owner.*someone else an owner/);
      expect((await db.dataSource.getRepository(Membership).findOneByOrFail({ workspaceId: a.id, userId: ownerA.id })).role).toBe('owner');
    });

    it('lets a member leave; their tokens of that workspace stop working with the membership', async () => {
      const person = await createUser(db.dataSource);
      await db.dataSource.getRepository(Membership).save({ workspaceId: a.id, userId: person.id, role: 'chemist' });
      const agent = t.agent();
      await signInAs(agent, person.id);
      const token = (await agent.post('/api/workspaces/group-a/tokens').send({ label: 'laptop' }).expect(201)).body.token;
      await agent.delete(`/api/workspaces/group-a/members/${person.id}`).expect(204);
      await agent.get('/api/workspaces/group-a').expect(404);
      await request(t.app).get('/api/me').set('Authorization', `Bearer ${token}`).expect(401);
    });
  });

  describe('personal API tokens', () => {
    it('shows the secret once, stores only its SHA-256, and lists it with its last use', async () => {
      const created = await asChemistA.post('/api/workspaces/group-a/tokens').send({ label: 'cluster submit' }).expect(201);
      expect(created.body.token).toMatch(/^pf_[A-Za-z0-9_-]{43}$/);
      const row = await db.dataSource.getRepository(ApiToken).findOneByOrFail({ id: created.body.id });
      expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
      const stored = JSON.stringify(await db.dataSource.query('SELECT * FROM api_tokens WHERE id = $1', [created.body.id]));
      expect(stored).not.toContain(created.body.token.slice(3));

      let list = await asChemistA.get('/api/workspaces/group-a/tokens').expect(200);
      const listed = list.body.find((x: { id: string }) => x.id === created.body.id);
      expect(listed).toMatchObject({ label: 'cluster submit', lastUsedAt: null, revokedAt: null });
      expect(JSON.stringify(list.body)).not.toContain(created.body.token);

      await request(t.app).get('/api/workspaces/group-a').set('Authorization', `Bearer ${created.body.token}`).expect(200);
      await expect.poll(async () => (await db.dataSource.getRepository(ApiToken).findOneByOrFail({ id: created.body.id })).lastUsedAt).not.toBeNull();
      list = await asChemistA.get('/api/workspaces/group-a/tokens').expect(200);
      expect(list.body.find((x: { id: string }) => x.id === created.body.id).lastUsedAt).not.toBeNull();
    });

    it('answers 401 to a revoked token', async () => {
      const created = await asChemistA.post('/api/workspaces/group-a/tokens').send({ label: 'to revoke' }).expect(201);
      const call = () => request(t.app).get('/api/workspaces/group-a').set('Authorization', `Bearer ${created.body.token}`);
      await call().expect(200);
      const revoked = await asChemistA.delete(`/api/workspaces/group-a/tokens/${created.body.id}`).expect(200);
      expect(revoked.body.revokedAt).not.toBeNull();
      const res = await call().expect(401);
      expect(res.body.error).toEqual({ code: 'unauthenticated', message: 'The API token is unknown or revoked' });
    });

    it("acts with its user's current role: a reviewer's token may read but not change owner settings", async () => {
      const created = await asReviewerA.post('/api/workspaces/group-a/tokens').send({ label: 'reader' }).expect(201);
      const auth = { Authorization: `Bearer ${created.body.token}` };
      await request(t.app).get('/api/workspaces/group-a/members').set(auth).expect(200);
      await request(t.app).patch('/api/workspaces/group-a').set(auth).send({ name: 'x' }).expect(403);
    });

    it('lets owners list and revoke everyone’s tokens; others see and revoke only their own', async () => {
      const chemistToken = await asChemistA.post('/api/workspaces/group-a/tokens').send({ label: 'chemist’s' }).expect(201);
      const reviewerList = await asReviewerA.get('/api/workspaces/group-a/tokens').expect(200);
      expect(reviewerList.body.map((x: { id: string }) => x.id)).not.toContain(chemistToken.body.id);
      await asReviewerA.delete(`/api/workspaces/group-a/tokens/${chemistToken.body.id}`).expect(404);
      const ownerList = await asOwnerA.get('/api/workspaces/group-a/tokens').expect(200);
      expect(ownerList.body.find((x: { id: string }) => x.id === chemistToken.body.id)).toMatchObject({ user: { id: chemistA.id } });
      await asOwnerA.delete(`/api/workspaces/group-a/tokens/${chemistToken.body.id}`).expect(200);
    });

    it('cannot be minted with a token (a leaked token must not make more) nor without a label', async () => {
      const created = await asChemistA.post('/api/workspaces/group-a/tokens').send({ label: 'script' }).expect(201);
      await request(t.app).post('/api/workspaces/group-a/tokens').set('Authorization', `Bearer ${created.body.token}`).send({ label: 'more' }).expect(403);
      await asChemistA.post('/api/workspaces/group-a/tokens').send({}).expect(400);
      await asChemistA.post('/api/workspaces/group-a/tokens').send({ label: '   ' }).expect(400);
    });
  });

  describe('audit log', () => {
    it('shows owners sign-ins of their members, role changes, member removals and token events; newest first', async () => {
      const res = await asOwnerA.get('/api/workspaces/group-a/audit?pageSize=200').expect(200);
      const actions = new Set(res.body.items.map((e: { action: string }) => e.action));
      for (const action of ['sign-in', 'workspace.updated', 'member.role-changed', 'member.removed', 'token.created', 'token.revoked', 'invitation.created']) {
        expect(actions).toContain(action);
      }
      const times = res.body.items.map((e: { createdAt: string }) => e.createdAt);
      expect([...times].sort().reverse()).toEqual(times);
      // Nothing from workspace B, and no sign-in of B's owner (not a member of A).
      expect(res.body.items.some((e: { actor: { id: string } | null }) => e.actor?.id === ownerB.id)).toBe(false);
      const only = await asOwnerA.get('/api/workspaces/group-a/audit?action=token.revoked').expect(200);
      expect(only.body.items.length).toBeGreaterThan(0);
      expect(only.body.items.every((e: { action: string }) => e.action === 'token.revoked')).toBe(true);
      expect(only.body.total).toBe(only.body.items.length);
    });
  });
});
