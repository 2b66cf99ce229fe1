import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoWorkspace } from '../../../server/modules/workspaces/seed';
import { buildTestApp, signInAs, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import type TestAgent from 'supertest/lib/agent';

describe('hardening', () => {
  let db: TestDatabase;
  let t: TestApp;
  let demo: Awaited<ReturnType<typeof seedDemoWorkspace>>;
  let asOwner: TestAgent;

  beforeAll(async () => {
    db = await createTestDatabase();
    // Small limits so the limiter tests stay short.
    t = await buildTestApp({ dataSource: db.dataSource, env: { RATE_LIMIT_SIGN_IN: '12', RATE_LIMIT_INVITATIONS: '3' } });
    demo = await seedDemoWorkspace(db.dataSource);
    asOwner = t.agent();
    await signInAs(asOwner, demo.users.owner);
  });
  afterAll(async () => {
    await t?.close();
    await db?.drop();
  });

  describe('headers', () => {
    it('sends a Content Security Policy for the built app: own scripts and styles, data:/blob: images, own fonts, no inline script', async () => {
      const res = await request(t.app).get('/api/me');
      const csp = String(res.headers['content-security-policy']);
      const directives = new Map(csp.split(';').map((d) => d.trim().split(/\s+/)).map(([k, ...v]) => [k, v]));
      expect(directives.get('default-src')).toEqual(["'self'"]);
      expect(directives.get('script-src')).toEqual(["'self'"]);
      expect(directives.get('style-src')).toEqual(["'self'"]);
      expect(directives.get('img-src')).toEqual(["'self'", 'data:', 'blob:']);
      expect(directives.get('font-src')).toEqual(["'self'", 'data:']);
      expect(directives.get('object-src')).toEqual(["'none'"]);
      expect(directives.get('frame-ancestors')).toEqual(["'none'"]);
      expect(csp).not.toContain('unsafe-inline');
      expect(csp).not.toContain('unsafe-eval');
      // Plain-HTTP loopback: no upgrade, no HSTS (they would break local development).
      expect(csp).not.toContain('upgrade-insecure-requests');
      expect(res.headers['strict-transport-security']).toBeUndefined();
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['x-powered-by']).toBeUndefined();
    });
  });

  describe('cross-site request protection', () => {
    it("accepts the app's own Origin, or a same-origin Referer when Origin is absent", async () => {
      await asOwner.patch('/api/workspaces/demo').send({ name: 'Demo group' }).expect(200);
      await asOwner.patch('/api/workspaces/demo').unset('Origin').set('Referer', `${t.url}/w/demo/settings`).send({ name: 'Demo group' }).expect(200);
    });

    it('refuses a cookie-authenticated change from another origin, with no origin, or marked cross-site', async () => {
      const cases: [string, Record<string, string>][] = [
        ['foreign Origin', { Origin: 'https://evil.example' }],
        ['foreign Referer', { Referer: 'https://evil.example/page' }],
        ['opaque Origin', { Origin: 'null' }],
        ['no Origin or Referer', {}],
        ['Sec-Fetch-Site: cross-site', { Origin: t.origin, 'Sec-Fetch-Site': 'cross-site' }],
      ];
      for (const [what, headers] of cases) {
        const req = asOwner.patch('/api/workspaces/demo').unset('Origin');
        for (const [k, v] of Object.entries(headers)) req.set(k, v);
        const res = await req.send({ name: `renamed by ${what}` });
        expect(res.status, what).toBe(403);
        expect(res.body.error.code, what).toBe('forbidden');
      }
      const me = await asOwner.get('/api/me').expect(200);
      expect(me.body.memberships[0].workspace.name).toBe('Demo group');
    });

    it('covers HTML form posts too (sign-out from a foreign page does nothing)', async () => {
      await asOwner
        .post('/auth/sign-out')
        .set('Origin', 'https://evil.example')
        .type('form')
        .send('x=1')
        .expect(403);
      await asOwner.get('/api/me').expect(200);
    });

    it('exempts Bearer-token requests, which a browser never sends by itself', async () => {
      const { issueApiToken } = await import('../../../server/modules/tokens/service');
      const { token } = await issueApiToken(db.dataSource, { userId: demo.users.owner, workspaceId: demo.workspaceId, label: 'csrf test' });
      await request(t.app).patch('/api/workspaces/demo').set('Authorization', `Bearer ${token}`).send({ name: 'Demo group' }).expect(200);
    });
  });

  describe('input limits and errors', () => {
    it('refuses a JSON body over 1 MB with 413 and a one-line error', async () => {
      const big = { name: 'x'.repeat(1024 * 1024 + 10) };
      const res = await asOwner.patch('/api/workspaces/demo').send(big).expect(413);
      expect(res.body.error.message).toMatch(/too large/i);
      expect(res.body.error.code).toBe('too-large');
    });

    it('answers malformed JSON with 400 and never a stack trace', async () => {
      const res = await asOwner.patch('/api/workspaces/demo').set('Content-Type', 'application/json').send('{"name": ').expect(400);
      expect(res.body.error.code).toBe('bad-request');
      expect(JSON.stringify(res.body)).not.toMatch(/\bat \S+ \(|node_modules|\.ts:\d+/);
    });

    it('validates route parameters: a malformed id is a 400 naming the parameter', async () => {
      const res = await asOwner.delete('/api/workspaces/demo/tokens/12345').expect(400);
      expect(res.body.error.message).toMatch(/^id: /);
    });
  });

  describe('rate limits', () => {
    it('slows down repeated sign-in attempts from one address with 429', async () => {
      // 12 allowed per window; the agents above already used some.
      let last = 0;
      for (let i = 0; i < 14; i++) last = (await request(t.app).get('/auth/github')).status;
      expect(last).toBe(429);
      const res = await request(t.app).get('/auth/github').expect(429);
      expect(res.body.error).toEqual({ code: 'rate-limited', message: 'Too many sign-in attempts from this address; wait a few minutes and try again' });
      expect(res.headers['ratelimit-policy']).toBeDefined();
    });

    it('limits invitations an owner may send per hour', async () => {
      const statuses: number[] = [];
      for (let i = 0; i < 4; i++) {
        statuses.push((await asOwner.post('/api/workspaces/demo/invitations').send({ email: `limit${i}@example.org`, role: 'reviewer' })).status);
      }
      expect(statuses).toEqual([201, 201, 201, 429]);
    });
  });
});

describe('production configuration', () => {
  it('refuses to build the app in production with the public default session secret', async () => {
    const db = await createTestDatabase();
    try {
      await expect(buildTestApp({ dataSource: db.dataSource, env: { NODE_ENV: 'production', SESSION_SECRET: 'pointfold-development-secret-change-me' } })).rejects.toThrow(
        'SESSION_SECRET must be set to a private random value in production',
      );
    } finally {
      await db.drop();
    }
  });
});
