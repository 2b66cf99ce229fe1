import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry } from '../../../server/modules/audit/entity';
import { Membership } from '../../../server/modules/workspaces/entity';
import { Invitation } from '../../../server/modules/workspaces/invitation.entity';
import { signInvitation, verifyInvitationToken } from '../../../server/modules/workspaces/invitations';
import { buildTestApp, createUser, createWorkspace, signInAs, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';
import type { Workspace } from '../../../server/modules/workspaces/entity';
import type TestAgent from 'supertest/lib/agent';

describe('invitations by e-mail', () => {
  let db: TestDatabase;
  let t: TestApp;
  let ws: Workspace;
  let asOwner: TestAgent;

  /** Invites `email` as `role` and returns the token from the link in the mail that was sent. */
  async function invite(email: string, role = 'chemist'): Promise<{ id: string; token: string }> {
    const before = t.mail.length;
    const res = await asOwner.post(`/api/workspaces/${ws.slug}/invitations`).send({ email, role }).expect(201);
    expect(t.mail.length).toBe(before + 1);
    const mail = t.mail[t.mail.length - 1];
    expect(mail.to).toBe(email.toLowerCase());
    const link = /(http:\/\/\S+\/invite\/(\S+))/.exec(mail.text);
    expect(link, mail.text).not.toBeNull();
    expect(link![1].startsWith(`${t.url}/invite/`)).toBe(true);
    return { id: res.body.id, token: link![2] };
  }

  /** A user with `email`, signed in through the fake provider. */
  async function personWith(email: string): Promise<TestAgent> {
    const user = await createUser(db.dataSource, { email });
    const agent = t.agent();
    await signInAs(agent, user.id);
    return agent;
  }

  beforeAll(async () => {
    db = await createTestDatabase();
    t = await buildTestApp({ dataSource: db.dataSource });
    const owner = await createUser(db.dataSource, { name: 'Rosalind Owner' });
    ws = await createWorkspace(db.dataSource, { [owner.id]: 'owner' }, { slug: 'spectro', name: 'Spectroscopy group' });
    asOwner = t.agent();
    await signInAs(asOwner, owner.id);
  });
  afterAll(async () => {
    await t?.close();
    await db?.drop();
  });

  it('mails a link that, once accepted by the invited address, adds the membership with the role', async () => {
    const { token } = await invite('Postdoc.One@Example.org', 'reviewer');
    const mail = t.mail[t.mail.length - 1];
    expect(mail.subject).toBe('Rosalind Owner invited you to Spectroscopy group on Pointfold');
    expect(mail.text).toMatch(/as a reviewer/);
    expect(mail.text).toMatch(/expires in 72 hours/);

    // Anyone holding the link may see what it is for, before signing in.
    const peek = await request(t.app).get(`/api/invitations/${token}`).expect(200);
    expect(peek.body).toMatchObject({
      workspace: { name: 'Spectroscopy group', slug: 'spectro' },
      role: 'reviewer',
      email: 'postdoc.one@example.org',
      invitedBy: 'Rosalind Owner',
      status: 'pending',
    });

    // Accepting needs a signed-in browser.
    await request(t.app).post(`/api/invitations/${token}/accept`).set('Origin', t.origin).expect(401);

    const invitee = await personWith('postdoc.one@example.org');
    expect((await invitee.get('/api/me').expect(200)).body.memberships).toEqual([]);
    const accepted = await invitee.post(`/api/invitations/${token}/accept`).expect(200);
    expect(accepted.body).toMatchObject({ workspace: { slug: 'spectro' }, role: 'reviewer' });
    const me = await invitee.get('/api/me').expect(200);
    expect(me.body.memberships).toEqual([expect.objectContaining({ role: 'reviewer', workspace: expect.objectContaining({ slug: 'spectro' }) })]);
    expect((await request(t.app).get(`/api/invitations/${token}`).expect(200)).body.status).toBe('accepted');
    const joined = await db.dataSource.getRepository(AuditEntry).findBy({ workspaceId: ws.id, action: 'member.joined' });
    expect(joined).toHaveLength(1);
  });

  it('refuses a link that was already used', async () => {
    const { token } = await invite('twice@example.org');
    const invitee = await personWith('twice@example.org');
    await invitee.post(`/api/invitations/${token}/accept`).expect(200);
    const again = await invitee.post(`/api/invitations/${token}/accept`).expect(409);
    expect(again.body.error.message).toBe('This invitation has already been used');
  });

  it('refuses an expired link and says so on the peek too', async () => {
    const { id, token } = await invite('late@example.org');
    await db.dataSource.getRepository(Invitation).update({ id }, { expiresAt: new Date(Date.now() - 1000) });
    expect((await request(t.app).get(`/api/invitations/${token}`).expect(200)).body.status).toBe('expired');
    const invitee = await personWith('late@example.org');
    const res = await invitee.post(`/api/invitations/${token}/accept`).expect(409);
    expect(res.body.error.message).toBe('This invitation has expired. Ask the owner for a new one');
    await invitee.get(`/api/workspaces/${ws.slug}`).expect(404);
  });

  it('refuses a tampered link — signature or id changed — without touching the database row', async () => {
    const { id, token } = await invite('tamper@example.org');
    const [idPart, sig] = token.split('.');
    const flip = (s: string, i: number) => s.slice(0, i) + (s[i] === 'A' ? 'B' : 'A') + s.slice(i + 1);
    const otherId = (await db.dataSource.query(`SELECT gen_random_uuid() AS id`))[0].id as string;
    const forgedId = `${signInvitation('x'.repeat(16), otherId).split('.')[0]}.${sig}`;
    const invitee = await personWith('tamper@example.org');
    for (const bad of [`${idPart}.${flip(sig, 5)}`, `${flip(idPart, 3)}.${sig}`, forgedId, `${idPart}.${sig.slice(0, -2)}`, 'garbage']) {
      const peek = await request(t.app).get(`/api/invitations/${encodeURIComponent(bad)}`).expect(400);
      expect(peek.body.error.message).toMatch(/not valid: it may have been altered/);
      const res = await invitee.post(`/api/invitations/${encodeURIComponent(bad)}/accept`).expect(400);
      expect(res.body.error.code).toBe('bad-request');
    }
    // A link signed with another server's secret is refused the same way.
    const otherSecret = signInvitation('another-server-secret', id);
    await invitee.post(`/api/invitations/${otherSecret}/accept`).expect(400);
    expect((await db.dataSource.getRepository(Invitation).findOneByOrFail({ id })).acceptedAt).toBeNull();
    // The genuine link still works afterwards.
    await invitee.post(`/api/invitations/${token}/accept`).expect(200);
  });

  it('refuses a link opened by someone signed in with another e-mail, naming both addresses', async () => {
    const { id, token } = await invite('intended@example.org');
    const someoneElse = await personWith('someone.else@example.org');
    const res = await someoneElse.post(`/api/invitations/${token}/accept`).expect(403);
    expect(res.body.error.message).toBe(
      'This invitation was sent to intended@example.org, but you are signed in as someone.else@example.org. Sign in with that account instead',
    );
    await someoneElse.get(`/api/workspaces/${ws.slug}`).expect(404);
    expect((await db.dataSource.getRepository(Invitation).findOneByOrFail({ id })).acceptedAt).toBeNull();
  });

  it('replaces an older pending invitation to the same address (only the newest link works) and can be withdrawn', async () => {
    const first = await invite('again@example.org', 'reviewer');
    const second = await invite('again@example.org', 'chemist');
    const list = await asOwner.get(`/api/workspaces/${ws.slug}/invitations`).expect(200);
    const ids = list.body.map((i: { id: string }) => i.id);
    expect(ids).toContain(second.id);
    expect(ids).not.toContain(first.id);
    const invitee = await personWith('again@example.org');
    const old = await invitee.post(`/api/invitations/${first.token}/accept`).expect(409);
    expect(old.body.error.message).toMatch(/withdrawn or replaced/);

    await asOwner.delete(`/api/workspaces/${ws.slug}/invitations/${second.id}`).expect(204);
    await invitee.post(`/api/invitations/${second.token}/accept`).expect(409);
    expect((await db.dataSource.getRepository(Membership).findBy({ workspaceId: ws.id })).length).toBeGreaterThan(0);
  });

  it('refuses to invite an existing member, a malformed address or an unknown role', async () => {
    const res = await asOwner.post(`/api/workspaces/${ws.slug}/invitations`).send({ email: 'postdoc.one@example.org', role: 'chemist' }).expect(409);
    expect(res.body.error.message).toBe('postdoc.one@example.org is already a member of this workspace');
    await asOwner.post(`/api/workspaces/${ws.slug}/invitations`).send({ email: 'not an address', role: 'chemist' }).expect(400);
    await asOwner.post(`/api/workspaces/${ws.slug}/invitations`).send({ email: 'a@example.org', role: 'admin' }).expect(400);
  });

  it('cannot be accepted with an API token (a script cannot join workspaces)', async () => {
    const { token } = await invite('scripted@example.org');
    const user = await createUser(db.dataSource, { email: 'scripted@example.org' });
    const other = await createWorkspace(db.dataSource, { [user.id]: 'chemist' });
    const { issueApiToken } = await import('../../../server/modules/tokens/service');
    const { token: secret } = await issueApiToken(db.dataSource, { userId: user.id, workspaceId: other.id, label: 'x' });
    await request(t.app).post(`/api/invitations/${token}/accept`).set('Authorization', `Bearer ${secret}`).expect(403);
  });

  it('signs link tokens so that only this server can make them (HMAC round trip)', () => {
    const id = '3f2b8c1e-9a4d-4c7b-8e21-5d6f7a8b9c0d';
    const token = signInvitation('secret-one-0123456789', id);
    expect(verifyInvitationToken('secret-one-0123456789', token)).toBe(id);
    expect(verifyInvitationToken('secret-two-0123456789', token)).toBeNull();
  });
});
