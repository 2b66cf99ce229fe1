import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry } from '../../../server/modules/audit/entity';
import { User } from '../../../server/modules/users/entity';
import { seedDemoWorkspace } from '../../../server/modules/workspaces/seed';
import { buildTestApp, createUser, signInAs, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';

/** Follows the fake provider's picker as a person would: submit the form for `fields`. */
async function pick(t: TestApp, authorizeUrl: string, fields: Record<string, string>): Promise<URL> {
  const authorize = new URL(authorizeUrl);
  const page = await fetch(authorize);
  expect(page.status).toBe(200);
  const html = await page.text();
  expect(html).toContain('Choose an account for Pointfold');
  const res = await fetch(new URL('/login/oauth/authorize', t.oauth.url), {
    method: 'POST',
    redirect: 'manual',
    body: new URLSearchParams({
      client_id: authorize.searchParams.get('client_id')!,
      redirect_uri: authorize.searchParams.get('redirect_uri')!,
      state: authorize.searchParams.get('state') ?? '',
      decision: 'allow',
      ...fields,
    }),
  });
  expect(res.status).toBe(302);
  return new URL(res.headers.get('location')!);
}

describe('sign-in through the OAuth provider (local fake)', () => {
  let db: TestDatabase;
  let t: TestApp;
  let demo: Awaited<ReturnType<typeof seedDemoWorkspace>>;

  beforeAll(async () => {
    db = await createTestDatabase();
    t = await buildTestApp({ dataSource: db.dataSource });
    demo = await seedDemoWorkspace(db.dataSource);
  });
  afterAll(async () => {
    await t?.close();
    await db?.drop();
  });

  it('signs a demo chemist in: authorize → pick → callback with code and state → session → /api/me', async () => {
    const agent = t.agent();
    const start = await agent.get('/auth/github').expect(302);
    const authorize = new URL(start.headers.location);
    expect(authorize.origin).toBe(t.oauth.url);
    expect(authorize.pathname).toBe('/login/oauth/authorize');
    expect(authorize.searchParams.get('redirect_uri')).toBe(`${t.url}/auth/github/callback`);
    expect(authorize.searchParams.get('state')).toMatch(/.{16,}/);

    const callback = await pick(t, start.headers.location, { login: 'demo-chemist' });
    expect(callback.searchParams.get('state')).toBe(authorize.searchParams.get('state'));
    const done = await agent.get(callback.pathname + callback.search).expect(303);
    expect(done.headers.location).toBe('/');

    const cookie = String(done.headers['set-cookie']);
    expect(cookie).toMatch(/pf\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);

    const me = await agent.get('/api/me').expect(200);
    expect(me.body.user).toMatchObject({ id: demo.users.chemist, login: 'demo-chemist', email: 'chemist@example.org' });
    expect(me.body.memberships).toEqual([
      expect.objectContaining({ role: 'chemist', workspace: expect.objectContaining({ slug: 'demo', defaults: expect.objectContaining({ tolerance: 0.01 }) }) }),
    ]);
    // The demo user is now linked to the provider's id.
    const linked = await db.dataSource.getRepository(User).findOneByOrFail({ id: demo.users.chemist });
    expect(linked.providerId).not.toBeNull();
    const signIns = await db.dataSource.getRepository(AuditEntry).findBy({ actorId: demo.users.chemist, action: 'sign-in' });
    expect(signIns).toHaveLength(1);
  });

  it('rotates the session id at sign-in (a cookie from before sign-in is not the signed-in one)', async () => {
    const agent = t.agent();
    const start = await agent.get('/auth/github?returnTo=/w/demo').expect(302);
    const before = /pf\.sid=([^;]+)/.exec(String(start.headers['set-cookie']))?.[1];
    expect(before).toBeTruthy();
    const callback = await pick(t, start.headers.location, { login: 'demo-owner' });
    const done = await agent.get(callback.pathname + callback.search).expect(303);
    expect(done.headers.location).toBe('/w/demo');
    const after = /pf\.sid=([^;]+)/.exec(String(done.headers['set-cookie']))?.[1];
    expect(after).toBeTruthy();
    expect(after).not.toBe(before);
    // The pre-sign-in cookie alone gets nobody.
    await request(t.app).get('/api/me').set('Cookie', `pf.sid=${before}`).expect(401);
    await request(t.app).get('/api/me').set('Cookie', `pf.sid=${after}`).expect(200);
  });

  it('refuses a callback whose state this browser did not start', async () => {
    const victim = t.agent();
    const attacker = t.agent();
    const start = await attacker.get('/auth/github').expect(302);
    const callback = await pick(t, start.headers.location, { login: 'demo-owner' });
    await victim.get('/auth/github').expect(302); // the victim has a state of its own
    const done = await victim.get(callback.pathname + callback.search).expect(303);
    expect(done.headers.location).toBe('/sign-in?error=state');
    await victim.get('/api/me').expect(401);
  });

  it('ignores a returnTo that leaves the site', async () => {
    for (const returnTo of ['https://evil.example/', '//evil.example/x', '/\\evil.example']) {
      const agent = t.agent();
      const start = await agent.get(`/auth/github?returnTo=${encodeURIComponent(returnTo)}`).expect(302);
      const callback = await pick(t, start.headers.location, { login: 'demo-reviewer' });
      const done = await agent.get(callback.pathname + callback.search).expect(303);
      expect(done.headers.location).toBe('/');
    }
  });

  it('creates a new user with no workspace for an unknown login', async () => {
    const agent = t.agent();
    const start = await agent.get('/auth/github').expect(302);
    const callback = await pick(t, start.headers.location, { login: 'new-postdoc', email: 'New.Postdoc@Example.org', name: 'New Postdoc' });
    await agent.get(callback.pathname + callback.search).expect(303);
    const me = await agent.get('/api/me').expect(200);
    expect(me.body).toEqual({
      user: expect.objectContaining({ login: 'new-postdoc', email: 'new.postdoc@example.org', name: 'New Postdoc' }),
      memberships: [],
    });
    // Signing in again finds the same user by the provider's id.
    const again = t.agent();
    const start2 = await again.get('/auth/github').expect(302);
    const callback2 = await pick(t, start2.headers.location, { login: 'new-postdoc', email: 'new.postdoc@example.org' });
    await again.get(callback2.pathname + callback2.search).expect(303);
    expect((await again.get('/api/me').expect(200)).body.user.id).toBe(me.body.user.id);
  });

  it('sends the person back to the sign-in page when they cancel at the provider', async () => {
    const agent = t.agent();
    const start = await agent.get('/auth/github').expect(302);
    const callback = await pick(t, start.headers.location, { decision: 'deny' });
    expect(callback.searchParams.get('error')).toBe('access_denied');
    const done = await agent.get(callback.pathname + callback.search).expect(303);
    expect(done.headers.location).toBe('/sign-in?error=cancelled');
  });

  it('refuses a code that was already exchanged (the provider codes are single-use)', async () => {
    const agent = t.agent();
    const start = await agent.get('/auth/github').expect(302);
    const callback = await pick(t, start.headers.location, { login: 'demo-owner' });
    await agent.get(callback.pathname + callback.search).expect(303);
    const replay = t.agent();
    await replay.get('/auth/github').expect(302);
    const res = await replay.get(callback.pathname + callback.search).expect(303);
    expect(res.headers.location).toMatch(/^\/sign-in\?error=/);
    await replay.get('/api/me').expect(401);
  });

  it('signs out: the session row is destroyed, so its cookie no longer works', async () => {
    const person = await createUser(db.dataSource);
    const agent = t.agent();
    await signInAs(agent, person.id);
    await agent.get('/api/me').expect(200);
    const count = async () =>
      ((await db.dataSource.query(`SELECT count(*)::int AS n FROM sessions WHERE sess->>'userId' = $1`, [person.id])) as { n: number }[])[0].n;
    expect(await count()).toBe(1);
    await agent.post('/auth/sign-out').expect(204);
    expect(await count()).toBe(0);
    await agent.get('/api/me').expect(401);
  });

  it('marks the session cookie Secure when the request came over HTTPS through the trusted proxy', async () => {
    const res = await t.agent().get('/auth/github').set('X-Forwarded-Proto', 'https').expect(302);
    expect(String(res.headers['set-cookie'])).toMatch(/;\s*Secure/i);
    const plain = await t.agent().get('/auth/github').expect(302);
    expect(String(plain.headers['set-cookie'])).not.toMatch(/;\s*Secure/i);
  });
});
