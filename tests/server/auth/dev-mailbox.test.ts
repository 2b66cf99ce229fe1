import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../../server/config';
import { startSmtpInbox, type SmtpInbox } from '../../../server/fakes/smtp-inbox';
import { createMailer } from '../../../server/mail/mailer';
import { buildTestApp, createUser, createWorkspace, signInAs, type TestApp } from '../../support/app';
import { createTestDatabase, type TestDatabase } from '../../support/db';

describe('development mailbox (invitations through real SMTP to the local fake inbox)', () => {
  let db: TestDatabase;
  let inbox: SmtpInbox;
  let t: TestApp;

  beforeAll(async () => {
    db = await createTestDatabase();
    inbox = await startSmtpInbox({ host: '127.0.0.1', smtpPort: 0, httpPort: 0 });
    const env = { DEV_MAILBOX: 'true', DEV_MAILBOX_URL: inbox.httpUrl, SMTP_HOST: '127.0.0.1', SMTP_PORT: String(inbox.smtpPort) };
    t = await buildTestApp({ dataSource: db.dataSource, env, mailer: createMailer(loadConfig(env)) });
  });
  afterAll(async () => {
    await t?.close();
    await inbox?.close();
    await db?.drop();
  });

  it("shows an owner the invitation mail sent to their invitee, and nothing addressed to another workspace's people", async () => {
    const ownerA = await createUser(db.dataSource);
    const ownerB = await createUser(db.dataSource);
    await createWorkspace(db.dataSource, { [ownerA.id]: 'owner' }, { slug: 'mail-a' });
    await createWorkspace(db.dataSource, { [ownerB.id]: 'owner' }, { slug: 'mail-b' });
    const a = t.agent();
    const b = t.agent();
    await signInAs(a, ownerA.id);
    await signInAs(b, ownerB.id);
    await a.post('/api/workspaces/mail-a/invitations').send({ email: 'guest-a@example.org', role: 'chemist' }).expect(201);
    await b.post('/api/workspaces/mail-b/invitations').send({ email: 'guest-b@example.org', role: 'reviewer' }).expect(201);

    const seenByA = (await a.get('/api/workspaces/mail-a/dev-mailbox').expect(200)).body as { to: string; subject: string; text: string }[];
    expect(seenByA).toHaveLength(1);
    expect(seenByA[0].to).toBe('guest-a@example.org');
    expect(seenByA[0].text).toMatch(new RegExp(`${t.url}/invite/\\S+`));
    expect(JSON.stringify(seenByA)).not.toContain('guest-b@example.org');
  });

  it('is for owners only, and switched off unless DEV_MAILBOX is set', async () => {
    const owner = await createUser(db.dataSource);
    const chemist = await createUser(db.dataSource);
    await createWorkspace(db.dataSource, { [owner.id]: 'owner', [chemist.id]: 'chemist' }, { slug: 'mail-c' });
    const asChemist = t.agent();
    await signInAs(asChemist, chemist.id);
    await asChemist.get('/api/workspaces/mail-c/dev-mailbox').expect(403);

    const off = await buildTestApp({ dataSource: db.dataSource });
    try {
      const asOwner = off.agent();
      await signInAs(asOwner, owner.id);
      const res = await asOwner.get('/api/workspaces/mail-c/dev-mailbox').expect(404);
      expect(res.body.error.message).toBe('The development mailbox is switched off');
    } finally {
      await off.close();
    }
  });
});
