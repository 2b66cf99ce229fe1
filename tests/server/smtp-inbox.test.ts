import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startSmtpInbox, type InboxMessage, type SmtpInbox } from '../../server/fakes/smtp-inbox';

describe('the fake SMTP inbox', () => {
  let inbox: SmtpInbox;
  beforeAll(async () => {
    inbox = await startSmtpInbox({ smtpPort: 0, httpPort: 0 });
  });
  afterAll(async () => {
    await inbox?.close();
  });

  const send = (to: string, subject: string) =>
    nodemailer
      .createTransport({ host: '127.0.0.1', port: inbox.smtpPort, secure: false, ignoreTLS: true })
      .sendMail({ from: 'Pointfold <pointfold@localhost>', to, subject, text: `Body of ${subject}`, html: `<p>${subject}</p>` });

  it('accepts mail over SMTP and lists it newest first on GET /messages', async () => {
    await send('chemist@example.org', 'Batch finished');
    await send('owner@example.org', 'You are invited');
    const res = await fetch(`${inbox.httpUrl}/messages`);
    expect(res.status).toBe(200);
    const messages = (await res.json()) as InboxMessage[];
    expect(messages.map((m) => m.subject)).toEqual(['You are invited', 'Batch finished']);
    expect(messages[1]).toMatchObject({
      from: 'pointfold@localhost',
      to: ['chemist@example.org'],
      text: 'Body of Batch finished',
      html: '<p>Batch finished</p>',
    });
    expect(Number.isNaN(Date.parse(messages[1].date))).toBe(false);
    expect(new Set(messages.map((m) => m.id)).size).toBe(2);
  });

  it('empties the inbox on DELETE /messages', async () => {
    expect((await fetch(`${inbox.httpUrl}/messages`, { method: 'DELETE' })).status).toBe(204);
    expect(await (await fetch(`${inbox.httpUrl}/messages`)).json()).toEqual([]);
  });

  it('answers other paths with a JSON 404', async () => {
    const res = await fetch(`${inbox.httpUrl}/nope`);
    expect(res.status).toBe(404);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('not-found');
  });
});
