import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeOAuthProvider, type FakeOAuthProvider } from '../../../server/fakes/oauth-provider';

/**
 * The local stand-in for the provider follows the OAuth 2.0 authorization-code flow
 * (RFC 6749 §4.1) as GitHub documents it: authorize → code → access_token → /user.
 */
describe('fake OAuth provider', () => {
  let fake: FakeOAuthProvider;
  const client = { id: 'pointfold-dev', secret: 'pointfold-dev-secret' };
  const redirectUri = 'http://127.0.0.1:4380/auth/github/callback';

  const authorize = (params: Record<string, string>) => fetch(`${fake.url}/login/oauth/authorize?${new URLSearchParams(params)}`);
  const pick = (fields: Record<string, string>) =>
    fetch(`${fake.url}/login/oauth/authorize`, {
      method: 'POST',
      redirect: 'manual',
      body: new URLSearchParams({ client_id: client.id, redirect_uri: redirectUri, state: 's1', decision: 'allow', ...fields }),
    });
  const exchange = (fields: Record<string, string>) =>
    fetch(`${fake.url}/login/oauth/access_token`, {
      method: 'POST',
      headers: { Accept: 'application/json' },
      body: new URLSearchParams({ client_id: client.id, client_secret: client.secret, redirect_uri: redirectUri, grant_type: 'authorization_code', ...fields }),
    });
  async function codeFor(login: string): Promise<string> {
    const res = await pick({ login });
    return new URL(res.headers.get('location')!).searchParams.get('code')!;
  }

  beforeAll(async () => {
    fake = await startFakeOAuthProvider({ port: 0, callbackHosts: ['127.0.0.1:4380'] });
  });
  afterAll(async () => {
    await fake?.close();
  });

  it('renders an accessible account picker with the demo accounts and a field for another login', async () => {
    const res = await authorize({ client_id: client.id, redirect_uri: redirectUri, state: '"><script>x</script>' });
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain('<html lang="en">');
    for (const login of ['demo-owner', 'demo-chemist', 'demo-reviewer']) expect(html).toContain(login);
    expect(html).toMatch(/<label for="login">Login<\/label><input id="login"/);
    expect(html).toContain('Cancel sign-in');
    // The state is echoed into the forms escaped, never as markup.
    expect(html).not.toContain('<script>x</script>');
    expect(html).toContain('&quot;&gt;&lt;script&gt;');
  });

  it('refuses an unknown client or a redirect_uri on a host it was not told about', async () => {
    expect((await authorize({ client_id: 'someone-else', redirect_uri: redirectUri })).status).toBe(400);
    const res = await authorize({ client_id: client.id, redirect_uri: 'https://evil.example/cb' });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('redirect_uri must point at one of: 127.0.0.1:4380');
    // A listed name with a port pins the port.
    expect((await authorize({ client_id: client.id, redirect_uri: 'http://127.0.0.1:9999/cb' })).status).toBe(400);
  });

  it('redirects back with the code and the unchanged state, then trades the code for a token and the profile', async () => {
    const res = await pick({ login: 'demo-owner' });
    expect(res.status).toBe(302);
    const back = new URL(res.headers.get('location')!);
    expect(`${back.origin}${back.pathname}`).toBe(redirectUri);
    expect(back.searchParams.get('state')).toBe('s1');
    const token = await exchange({ code: back.searchParams.get('code')! });
    expect(token.status).toBe(200);
    const { access_token: accessToken, token_type: tokenType } = (await token.json()) as { access_token: string; token_type: string };
    expect(tokenType).toBe('bearer');
    const user = await fetch(`${fake.url}/user`, { headers: { Authorization: `Bearer ${accessToken}` } });
    expect(await user.json()).toMatchObject({ login: 'demo-owner', email: 'owner@example.org', name: 'Demo Owner', id: 7100001 });
    const emails = await fetch(`${fake.url}/user/emails`, { headers: { Authorization: `token ${accessToken}` } });
    expect(await emails.json()).toEqual([{ email: 'owner@example.org', primary: true, verified: true, visibility: 'public' }]);
  });

  it('makes codes single-use and bound to the client and redirect_uri', async () => {
    const code = await codeFor('demo-chemist');
    expect((await exchange({ code, client_secret: 'wrong' })).status).toBe(401);
    // Without the client secret nobody can spend (or burn) the code; with it, once.
    expect((await exchange({ code })).status).toBe(200);
    expect((await exchange({ code })).status).toBe(400);
    const code2 = await codeFor('demo-chemist');
    const mismatch = await exchange({ code: code2, redirect_uri: 'http://127.0.0.1:4380/elsewhere' });
    expect(mismatch.status).toBe(400);
    expect(((await mismatch.json()) as { error: string }).error).toBe('redirect_uri_mismatch');
    const code3 = await codeFor('demo-chemist');
    expect((await exchange({ code: code3 })).status).toBe(200);
    expect((await exchange({ code: code3 })).status).toBe(400);
  });

  it('gives a typed-in login a stable id and a default e-mail, and refuses a malformed login', async () => {
    const ids: number[] = [];
    for (let i = 0; i < 2; i++) {
      const token = (await (await exchange({ code: await codeFor('Ada-Lab') })).json()) as { access_token: string };
      const user = (await (await fetch(`${fake.url}/user`, { headers: { Authorization: `Bearer ${token.access_token}` } })).json()) as { id: number; email: string };
      expect(user.email).toBe('ada-lab@example.org');
      ids.push(user.id);
    }
    expect(ids[0]).toBe(ids[1]);
    expect((await pick({ login: '-bad login' })).status).toBe(400);
    expect((await fetch(`${fake.url}/user`)).status).toBe(401);
  });

  it('sends access_denied back with the state when the person cancels', async () => {
    const res = await pick({ decision: 'deny' });
    const back = new URL(res.headers.get('location')!);
    expect(back.searchParams.get('error')).toBe('access_denied');
    expect(back.searchParams.get('state')).toBe('s1');
    expect(back.searchParams.get('code')).toBeNull();
  });
});
