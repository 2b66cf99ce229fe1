import { cleanup, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { queryClient } from '@/lib/query-client';
import { doneBatch, page, runningBatch } from '../fixtures/batches';
import { json, meFixture, renderApp, stubApi } from '../support/app-harness';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  queryClient.clear();
});

const batchesPath = '/api/workspaces/demo/batches';

describe('app shell and routes (UI fixture data)', () => {
  it('sends a signed-out visitor to sign-in, remembering where they were going', async () => {
    stubApi(() => json({ error: { code: 'unauthenticated', message: 'Sign in' } }, 401));
    const { router } = renderApp('/w/demo?status=done');
    const link = await screen.findByRole('link', { name: 'Sign in with GitHub' });
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(link.getAttribute('href')).toBe('/auth/github?returnTo=' + encodeURIComponent('/w/demo?status=done'));
  });

  it('opens the first workspace from /, with the role and the New batch button for a chemist', async () => {
    stubApi(({ url }) => (url.pathname === '/api/me' ? json(meFixture('chemist')) : url.pathname === batchesPath ? json(page([doneBatch])) : undefined));
    const { router } = renderApp('/');
    expect(await screen.findByRole('heading', { name: 'Batches' })).toBeTruthy();
    expect(router.state.location.pathname).toBe('/w/demo');
    expect(screen.getByText('Your role:').parentElement?.textContent).toContain('chemist');
    expect(screen.getAllByRole('link', { name: 'New batch' }).length).toBeGreaterThan(0);
    expect((screen.getByRole('combobox', { name: 'Workspace' }) as HTMLSelectElement).value).toBe('demo');
  });

  it('hides every upload entry from a reviewer', async () => {
    stubApi(({ url }) => (url.pathname === '/api/me' ? json(meFixture('reviewer')) : url.pathname === batchesPath ? json(page([])) : undefined));
    renderApp('/w/demo');
    expect(await screen.findByRole('heading', { name: 'Batches' })).toBeTruthy();
    expect(screen.queryByRole('link', { name: 'New batch' })).toBeNull();
    expect(screen.queryByRole('link', { name: /upload/i })).toBeNull();
    expect(screen.getByText('When a chemist uploads a batch, it appears here for review.')).toBeTruthy();
  });

  it('answers a workspace the user is not in with the 404 page, even if its batches were answered', async () => {
    // Route loaders run in parallel, so the list may be asked for; membership from /api/me decides.
    stubApi(({ url }) =>
      url.pathname === '/api/me' ? json(meFixture('chemist')) : url.pathname === '/api/workspaces/someone-else/batches' ? json(page([doneBatch])) : undefined,
    );
    renderApp('/w/someone-else');
    expect(await screen.findByRole('heading', { name: 'Not found — or not yours' })).toBeTruthy();
    expect(screen.queryByRole('link', { name: 'Intermediates' })).toBeNull();
  });

  it('turns an API 404 inside a workspace route into the same 404 page', async () => {
    stubApi(({ url }) => (url.pathname === '/api/me' ? json(meFixture('chemist')) : undefined));
    renderApp('/w/demo');
    expect(await screen.findByRole('heading', { name: 'Not found — or not yours' })).toBeTruthy();
    // The rail stays: the user can go elsewhere.
    expect(screen.getByRole('combobox', { name: 'Workspace' })).toBeTruthy();
  });

  it('shows the 404 page for an unknown address', async () => {
    stubApi(({ url }) => (url.pathname === '/api/me' ? json(meFixture('owner')) : undefined));
    renderApp('/nowhere/at/all');
    expect(await screen.findByRole('heading', { name: 'Not found — or not yours' })).toBeTruthy();
  });

  it('tells someone without a workspace to ask for an invitation', async () => {
    stubApi(({ url }) => (url.pathname === '/api/me' ? json(meFixture(null)) : undefined));
    renderApp('/');
    expect(await screen.findByRole('heading', { name: 'You’re not in a workspace yet — ask an owner for an invitation' })).toBeTruthy();
  });

  it('polls the batch list while a batch runs and stops once none does', async () => {
    let listCalls = 0;
    stubApi(({ url }) => {
      if (url.pathname === '/api/me') return json(meFixture('chemist'));
      if (url.pathname === batchesPath) {
        listCalls += 1;
        const progressed = { ...runningBatch, counts: { ...runningBatch.counts, done: 30, clean: 27 } };
        return json(page([listCalls === 1 ? runningBatch : listCalls === 2 ? progressed : { ...progressed, status: 'done' }]));
      }
      return undefined;
    });
    renderApp('/w/demo');
    const bar = await screen.findByRole('progressbar', { name: 'Progress of Ligand series, round 2' });
    expect(bar.getAttribute('aria-valuetext')).toBe('37%');
    await waitFor(() => expect(screen.getByRole('progressbar', { name: /Progress of/ }).getAttribute('aria-valuetext')).toBe('82%'), { timeout: 4000 });
    await waitFor(() => expect(screen.queryByRole('progressbar', { name: /Progress of/ })).toBeNull(), { timeout: 4000 });
    const callsWhenDone = listCalls;
    await new Promise((r) => setTimeout(r, 2000));
    expect(listCalls).toBe(callsWhenDone);
    expect(within(screen.getByRole('table')).getByText('Done')).toBeTruthy();
  }, 15_000);

  it('sends filters and search to the server and keeps them in the address', async () => {
    const { seen } = stubApi(({ url }) => (url.pathname === '/api/me' ? json(meFixture('chemist')) : url.pathname === batchesPath ? json(page([doneBatch])) : undefined));
    const { router } = renderApp('/w/demo?status=done&q=inter&page=2');
    expect(await screen.findByRole('heading', { name: 'Batches' })).toBeTruthy();
    const list = seen.find((r) => r.url.pathname === batchesPath)!;
    expect(Object.fromEntries(list.url.searchParams)).toEqual({ status: 'done', q: 'inter', page: '2', pageSize: '25' });
    expect((screen.getByLabelText('Status') as HTMLSelectElement).value).toBe('done');
    expect((screen.getByLabelText('Search batches') as HTMLInputElement).value).toBe('inter');
    expect(router.state.location.search).toBe('?status=done&q=inter&page=2');
  });
});
