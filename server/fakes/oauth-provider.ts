import { createHash, randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import express, { type Request, type Response } from 'express';
import { DEMO_ACCOUNTS } from '../modules/workspaces/seed';

/**
 * A local stand-in for the OAuth provider (GitHub's authorize, token and user endpoints), for
 * development and tests. It speaks the same protocol as the real one, so the app runs the same
 * passport code path; only the URLs differ. It is never started in production.
 */

/** An account the fake can sign in as. `id` is the provider's stable user id. */
export interface FakeAccount {
  id: number;
  login: string;
  email: string;
  name: string;
  /** Shown on the picker, e.g. the demo role. */
  note?: string;
}

export interface FakeOAuthProviderOptions {
  host?: string;
  port?: number;
  /** Hosts a `redirect_uri` may point at: `name` (any port) or `name:port`. Default: loopback names. */
  callbackHosts?: string[];
  /** OAuth clients the fake accepts. Default: the development client from server/config.ts. */
  clients?: { id: string; secret: string }[];
  /** Accounts offered on the picker. Default: the demo accounts. */
  accounts?: FakeAccount[];
}

export interface FakeOAuthProvider {
  url: string;
  close(): Promise<void>;
}

const LOGIN_PATTERN = /^[A-Za-z0-9](?:[A-Za-z0-9-]{0,38})$/;
const EMAIL_PATTERN = /^[^\s@<>"]+@[^\s@<>"]+\.[^\s@<>"]+$/;
const CODE_LIFETIME_MS = 10 * 60 * 1000;

/** The demo accounts, with fixed provider ids so a demo user keeps its id across restarts. */
export const FAKE_DEMO_ACCOUNTS: FakeAccount[] = DEMO_ACCOUNTS.map((a, i) => ({
  id: 7_100_001 + i,
  login: a.login,
  email: a.email,
  name: a.name,
  note: `${a.role} of the demo group`,
}));

/** A stable provider id for a typed-in login (the same login always gets the same id). */
function idForLogin(login: string): number {
  return 8_000_000 + (parseInt(createHash('sha256').update(login.toLowerCase()).digest('hex').slice(0, 7), 16) % 1_000_000);
}

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

const STYLE = `
  body{margin:0;font-family:'IBM Plex Sans',system-ui,sans-serif;background:#f7f5f0;color:#1c2230}
  main{max-width:30rem;margin:3rem auto;padding:2rem;background:#fff;border:1px solid #d8d2c4;border-radius:.75rem}
  h1{font-size:1.25rem;margin:0 0 .25rem} p{color:#4a5264;font-size:.9rem}
  .tag{display:inline-block;font-size:.75rem;font-weight:600;letter-spacing:.04em;text-transform:uppercase;
    color:#8a5a00;background:#fbefd5;border-radius:.25rem;padding:.1rem .4rem}
  ul{list-style:none;padding:0;margin:1rem 0} li{margin:.5rem 0}
  button{font:inherit;cursor:pointer;border-radius:.5rem}
  .account{width:100%;text-align:left;padding:.6rem .8rem;border:1px solid #d8d2c4;background:#fff}
  .account:hover,.account:focus-visible{border-color:#2b4c9b;background:#e3e9f7}
  .account strong{display:block} .account span{font-size:.85rem;color:#4a5264}
  fieldset{border:1px solid #d8d2c4;border-radius:.5rem;padding:.8rem;margin-top:1.5rem}
  label{display:block;font-size:.85rem;margin-top:.5rem} input{font:inherit;width:100%;box-sizing:border-box;
    padding:.4rem .5rem;border:1px solid #d8d2c4;border-radius:.375rem}
  .primary{margin-top:.8rem;padding:.45rem .9rem;border:0;background:#2b4c9b;color:#fff}
  .quiet{margin-top:1rem;padding:.4rem .8rem;border:1px solid #d8d2c4;background:#fff;color:#4a5264}
  :focus-visible{outline:2px solid #d98e1f;outline-offset:2px}
`;

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>${escapeHtml(title)}</title><style>${STYLE}</style></head><body><main>${body}</main></body></html>`;
}

function errorPage(res: Response, status: number, message: string): void {
  res.status(status).type('html').send(page('Sign-in problem', `<h1>Sign-in problem</h1><p role="alert">${escapeHtml(message)}</p>`));
}

/** Starts the fake provider; resolves once it listens. */
export async function startFakeOAuthProvider(options: FakeOAuthProviderOptions = {}): Promise<FakeOAuthProvider> {
  const host = options.host ?? '127.0.0.1';
  const callbackHosts = new Set((options.callbackHosts ?? ['127.0.0.1', 'localhost', '[::1]', '::1']).map((h) => h.toLowerCase()));
  const clients = options.clients ?? [{ id: 'pointfold-dev', secret: 'pointfold-dev-secret' }];
  const accounts = new Map((options.accounts ?? FAKE_DEMO_ACCOUNTS).map((a) => [a.login.toLowerCase(), a]));
  const codes = new Map<string, { clientId: string; redirectUri: string; account: FakeAccount; expiresAt: number }>();
  const tokens = new Map<string, FakeAccount>();

  /** Checks client_id and redirect_uri of an authorize request; returns a message when bad. */
  function checkAuthorizeRequest(clientId: unknown, redirectUri: unknown): string | null {
    if (typeof clientId !== 'string' || !clients.some((c) => c.id === clientId)) return 'Unknown client_id.';
    if (typeof redirectUri !== 'string') return 'redirect_uri is missing.';
    let url: URL;
    try {
      url = new URL(redirectUri);
    } catch {
      return 'redirect_uri is not a URL.';
    }
    // An entry with a port ("127.0.0.1:4380") pins the port too; a bare name allows any port.
    const allowed = callbackHosts.has(url.host.toLowerCase()) || callbackHosts.has(url.hostname.toLowerCase());
    if (!['http:', 'https:'].includes(url.protocol) || !allowed) {
      return `redirect_uri must point at one of: ${[...callbackHosts].join(', ')}.`;
    }
    return null;
  }

  function redirectBack(res: Response, redirectUri: string, params: Record<string, string | undefined>): void {
    const url = new URL(redirectUri);
    for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== '') url.searchParams.set(k, v);
    res.redirect(302, url.toString());
  }

  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: false, limit: '16kb' }));
  app.use(express.json({ limit: '16kb' }));

  app.get('/', (_req, res) => {
    res.type('html').send(page('Local sign-in provider', '<h1>Local sign-in provider</h1><p>Stands in for the OAuth provider in development and tests.</p>'));
  });

  app.get('/login/oauth/authorize', (req, res) => {
    const { client_id: clientId, redirect_uri: redirectUri, state } = req.query;
    const problem = checkAuthorizeRequest(clientId, redirectUri);
    if (problem) return errorPage(res, 400, problem);
    const hidden = (extra = '') =>
      `<input type="hidden" name="client_id" value="${escapeHtml(String(clientId))}">` +
      `<input type="hidden" name="redirect_uri" value="${escapeHtml(String(redirectUri))}">` +
      `<input type="hidden" name="state" value="${escapeHtml(typeof state === 'string' ? state : '')}">${extra}`;
    const list = [...accounts.values()]
      .map(
        (a) => `<li><form method="post" action="/login/oauth/authorize">${hidden()}
<input type="hidden" name="login" value="${escapeHtml(a.login)}">
<button class="account" type="submit" name="decision" value="allow"><strong>${escapeHtml(a.name)}</strong>
<span>${escapeHtml(a.login)} · ${escapeHtml(a.email)}${a.note ? ` · ${escapeHtml(a.note)}` : ''}</span></button></form></li>`,
      )
      .join('');
    res.type('html').send(
      page(
        'Choose an account',
        `<span class="tag">Local test provider</span>
<h1>Choose an account for Pointfold</h1>
<p>This page stands in for the real sign-in provider on this machine. Pick a demo account, or type another login.</p>
<ul aria-label="Demo accounts">${list}</ul>
<form method="post" action="/login/oauth/authorize">${hidden('<input type="hidden" name="decision" value="allow">')}
<fieldset><legend>Another login</legend>
<label for="login">Login</label><input id="login" name="login" required pattern="[A-Za-z0-9][A-Za-z0-9\\-]{0,38}" autocomplete="username">
<label for="email">E-mail (optional; default: login@example.org)</label><input id="email" name="email" type="email" autocomplete="email">
<label for="name">Name (optional)</label><input id="name" name="name" maxlength="200" autocomplete="name">
<button class="primary" type="submit">Continue as this login</button></fieldset></form>
<form method="post" action="/login/oauth/authorize">${hidden('<input type="hidden" name="decision" value="deny">')}
<button class="quiet" type="submit">Cancel sign-in</button></form>`,
      ),
    );
  });

  app.post('/login/oauth/authorize', (req: Request, res) => {
    const body = (req.body ?? {}) as Record<string, string | undefined>;
    const problem = checkAuthorizeRequest(body.client_id, body.redirect_uri);
    if (problem) return errorPage(res, 400, problem);
    const redirectUri = body.redirect_uri!;
    if (body.decision === 'deny') {
      return redirectBack(res, redirectUri, { error: 'access_denied', error_description: 'The user cancelled sign-in.', state: body.state });
    }
    const login = (body.login ?? '').trim();
    if (!LOGIN_PATTERN.test(login)) return errorPage(res, 400, 'A login is letters, digits and hyphens (at most 39), starting with a letter or digit.');
    let account = accounts.get(login.toLowerCase());
    const email = (body.email ?? '').trim();
    if (email && !EMAIL_PATTERN.test(email)) return errorPage(res, 400, 'That e-mail address does not look valid.');
    if (!account || (email && email.toLowerCase() !== account.email.toLowerCase())) {
      account = {
        id: account?.id ?? idForLogin(login),
        login,
        email: email || account?.email || `${login.toLowerCase()}@example.org`,
        name: (body.name ?? '').trim().slice(0, 200) || account?.name || login,
      };
      accounts.set(login.toLowerCase(), account);
    }
    const code = randomBytes(16).toString('hex');
    codes.set(code, { clientId: body.client_id!, redirectUri, account, expiresAt: Date.now() + CODE_LIFETIME_MS });
    redirectBack(res, redirectUri, { code, state: body.state });
  });

  app.post('/login/oauth/access_token', (req, res) => {
    const body = (req.body ?? {}) as Record<string, string | undefined>;
    let clientId = body.client_id;
    let clientSecret = body.client_secret;
    const basic = req.headers.authorization?.match(/^Basic (.+)$/);
    if (basic) [clientId, clientSecret] = Buffer.from(basic[1], 'base64').toString('utf8').split(':');
    if (!clients.some((c) => c.id === clientId && c.secret === clientSecret)) {
      return res.status(401).json({ error: 'incorrect_client_credentials', error_description: 'The client_id and/or client_secret passed are incorrect.' });
    }
    const grant = body.code ? codes.get(body.code) : undefined;
    if (body.code) codes.delete(body.code); // single use, even when the rest is wrong
    if (!grant || grant.expiresAt < Date.now() || grant.clientId !== clientId) {
      return res.status(400).json({ error: 'bad_verification_code', error_description: 'The code passed is incorrect or expired.' });
    }
    if (body.redirect_uri && body.redirect_uri !== grant.redirectUri) {
      return res.status(400).json({ error: 'redirect_uri_mismatch', error_description: 'The redirect_uri does not match the authorize request.' });
    }
    const accessToken = `fake_${randomBytes(20).toString('hex')}`;
    tokens.set(accessToken, grant.account);
    res.json({ access_token: accessToken, token_type: 'bearer', scope: 'user:email' });
  });

  const caller = (req: Request): FakeAccount | undefined => {
    const m = req.headers.authorization?.match(/^(?:Bearer|token) (.+)$/i);
    return m ? tokens.get(m[1].trim()) : undefined;
  };

  app.get('/user', (req, res) => {
    const a = caller(req);
    if (!a) return res.status(401).json({ message: 'Bad credentials' });
    res.json({ id: a.id, login: a.login, name: a.name, email: a.email, html_url: `${url}/${a.login}`, type: 'User' });
  });

  app.get('/user/emails', (req, res) => {
    const a = caller(req);
    if (!a) return res.status(401).json({ message: 'Bad credentials' });
    res.json([{ email: a.email, primary: true, verified: true, visibility: 'public' }]);
  });

  const server = app.listen(options.port ?? 0, host);
  await new Promise<void>((resolve, reject) => {
    server.once('listening', resolve);
    server.once('error', reject);
  });
  const { port } = server.address() as AddressInfo;
  const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
  return {
    url,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
