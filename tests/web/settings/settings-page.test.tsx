import { cleanup, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { queryClient } from '@/lib/query-client';
import { json, meFixture, renderApp, stubApi, type SeenRequest } from '../support/app-harness';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  queryClient.clear();
});

// UI fixture data: invented people, tokens and mail.
const members = [
  { user: { id: 'u-1', login: 'demo-person', email: 'person@example.org', name: 'Demo Person' }, role: 'owner', joinedAt: '2026-03-01T10:00:00.000Z' },
  { user: { id: 'u-2', login: 'colleague', email: 'colleague@example.org', name: 'A Colleague' }, role: 'chemist', joinedAt: '2026-03-02T10:00:00.000Z' },
];
const token = { id: 't-1', label: 'cluster script', createdAt: '2026-03-03T10:00:00.000Z', lastUsedAt: null, revokedAt: null, user: { id: 'u-1', name: 'Demo Person', login: 'demo-person' } };

function settingsApi(role: 'owner' | 'chemist', extra?: (req: SeenRequest) => Response | undefined) {
  return stubApi((req) => {
    const hit = extra?.(req);
    if (hit) return hit;
    const p = req.url.pathname;
    if (p === '/api/me') return json(meFixture(role));
    if (p === '/api/workspaces/demo/members') return json(members);
    if (p === '/api/workspaces/demo/tokens' && req.method === 'GET') return json([token]);
    if (p === '/api/workspaces/demo/invitations') return json([]);
    if (p === '/api/workspaces/demo/audit') return json({ items: [], total: 0, page: 1, pageSize: 20 });
    return undefined;
  });
}

describe('workspace settings (UI fixture data)', () => {
  it('hides the development mailbox when the API answers 404, and shows the owner every section', async () => {
    const { seen } = settingsApi('owner');
    renderApp('/w/demo/settings');
    expect(await screen.findByRole('heading', { name: 'Workspace settings' })).toBeTruthy();
    for (const name of ['Members', 'Invitations', 'API tokens', 'Defaults for new batches']) {
      expect(screen.getByRole('region', { name })).toBeTruthy();
    }
    expect(await screen.findByRole('region', { name: 'Audit log' })).toBeTruthy();
    await waitFor(() => expect(seen.some((r) => r.url.pathname === '/api/workspaces/demo/dev-mailbox')).toBe(true));
    await waitFor(() => expect(screen.queryByText('Opening the mailbox…')).toBeNull());
    expect(screen.queryByRole('region', { name: 'Development mailbox' })).toBeNull();
  });

  it('shows the mailbox when the API has one', async () => {
    settingsApi('owner', ({ url }) =>
      url.pathname === '/api/workspaces/demo/dev-mailbox'
        ? json([{ id: 'm1', from: 'pointfold@localhost', to: 'new@example.org', subject: 'You are invited', text: 'Accept: http://x/invite/abc', date: '2026-03-04T10:00:00.000Z' }])
        : undefined,
    );
    renderApp('/w/demo/settings');
    const mailbox = await screen.findByRole('region', { name: 'Development mailbox' });
    expect(await within(mailbox).findByText('You are invited')).toBeTruthy();
  });

  it('shows the API’s refusal when the last owner would be demoted', async () => {
    settingsApi('owner', ({ url, method }) =>
      method === 'PATCH' && url.pathname === '/api/workspaces/demo/members/u-1'
        ? json({ error: { code: 'conflict', message: 'This is the last owner; make someone else an owner first' } }, 409)
        : undefined,
    );
    const user = userEvent.setup();
    renderApp('/w/demo/settings');
    await user.selectOptions(await screen.findByRole('combobox', { name: 'Role of Demo Person' }), 'chemist');
    const members = screen.getByRole('region', { name: 'Members' });
    expect((await within(members).findByRole('alert')).textContent).toBe('This is the last owner; make someone else an owner first');
  });

  it('shows a new token once, with the warning, and not after the dialog is closed', async () => {
    const secret = 'pf_UIFIXTURE_0123456789abcdefghijklmnop';
    const { seen } = settingsApi('owner', ({ url, method }) =>
      method === 'POST' && url.pathname === '/api/workspaces/demo/tokens' ? json({ ...token, id: 't-2', label: 'laptop', token: secret }, 201) : undefined,
    );
    const user = userEvent.setup();
    renderApp('/w/demo/settings');
    await user.type(await screen.findByRole('textbox', { name: 'Label' }), 'laptop');
    await user.click(screen.getByRole('button', { name: 'Create token' }));
    const dialog = await screen.findByRole('dialog', { name: 'Your new API token' });
    expect(within(dialog).getByLabelText('Token').textContent).toBe(secret);
    expect(dialog.textContent).toContain('you won’t see it again');
    expect(seen.filter((r) => r.method === 'POST')).toHaveLength(1);
    await user.click(within(dialog).getByRole('button', { name: 'I’ve stored it' }));
    await waitFor(() => expect(screen.queryByText(secret)).toBeNull());
  });

  it('asks for a label before creating a token', async () => {
    const { seen } = settingsApi('owner');
    const user = userEvent.setup();
    renderApp('/w/demo/settings');
    await user.click(await screen.findByRole('button', { name: 'Create token' }));
    expect(await screen.findByText('Give the token a label of 1–200 characters, e.g. “cluster submit script”.')).toBeTruthy();
    expect(seen.filter((r) => r.method === 'POST')).toHaveLength(0);
  });

  it('gives a chemist their tokens and the member list, without owner controls', async () => {
    const { seen } = settingsApi('chemist');
    renderApp('/w/demo/settings');
    expect(await screen.findByRole('heading', { name: 'Your API tokens' })).toBeTruthy();
    expect(screen.queryByRole('region', { name: 'Invitations' })).toBeNull();
    expect(screen.queryByRole('combobox', { name: /^Role of/ })).toBeNull();
    expect(screen.queryByRole('button', { name: /^Remove/ })).toBeNull();
    expect(seen.some((r) => r.url.pathname.endsWith('/invitations') || r.url.pathname.endsWith('/audit'))).toBe(false);
  });
});
