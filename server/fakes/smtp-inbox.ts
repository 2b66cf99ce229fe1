import { randomUUID } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';

/**
 * A local stand-in for a mail server, for development and tests: it accepts every message over
 * SMTP (no authentication, no TLS: loopback only) and keeps the latest ones in memory, readable
 * over HTTP. It is never started in production.
 */

/** One received message, as `GET /messages` returns it. */
export interface InboxMessage {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** ISO 8601, when the inbox received it. */
  date: string;
}

export interface SmtpInboxOptions {
  host?: string;
  /** 0 picks a free port. */
  smtpPort?: number;
  httpPort?: number;
  /** Oldest messages are dropped beyond this many. */
  keep?: number;
}

export interface SmtpInbox {
  smtpPort: number;
  httpUrl: string;
  /** Newest first. */
  messages(): InboxMessage[];
  close(): Promise<void>;
}

const addresses = (a: AddressObject | AddressObject[] | undefined): string[] =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((o) => o.value.map((v) => v.address ?? '').filter(Boolean));

/** Starts the SMTP listener and its HTTP reader (`GET /messages`, `DELETE /messages`). */
export async function startSmtpInbox(options: SmtpInboxOptions = {}): Promise<SmtpInbox> {
  const host = options.host ?? '127.0.0.1';
  const keep = options.keep ?? 500;
  const store: InboxMessage[] = [];

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          store.unshift({
            id: randomUUID(),
            from: addresses(mail.from)[0] ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: envelopeTo.length > 0 ? envelopeTo : addresses(mail.to),
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : null,
            date: new Date().toISOString(),
          });
          store.splice(keep);
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  const web = http.createServer((req, res) => {
    const path = (req.url ?? '/').split('?')[0];
    if (path === '/messages' && req.method === 'GET') {
      res.writeHead(200, { 'content-type': 'application/json' });
      res.end(JSON.stringify(store));
    } else if (path === '/messages' && req.method === 'DELETE') {
      store.length = 0;
      res.writeHead(204).end();
    } else {
      res.writeHead(404, { 'content-type': 'application/json' });
      res.end(JSON.stringify({ error: { code: 'not-found', message: 'GET or DELETE /messages' } }));
    }
  });

  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(options.smtpPort ?? 0, host, () => resolve());
  });
  try {
    await new Promise<void>((resolve, reject) => {
      web.once('error', reject);
      web.listen(options.httpPort ?? 0, host, () => resolve());
    });
  } catch (err) {
    await new Promise<void>((r) => smtp.close(() => r()));
    throw err;
  }
  const smtpPort = (smtp.server.address() as AddressInfo).port;
  const httpPort = (web.address() as AddressInfo).port;
  return {
    smtpPort,
    httpUrl: `http://${host}:${httpPort}`,
    messages: () => store.slice(),
    async close() {
      web.closeAllConnections();
      await Promise.all([
        new Promise<void>((r) => web.close(() => r())),
        new Promise<void>((r) => smtp.close(() => r())),
      ]);
    },
  };
}
