import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import * as batchRoute from '@/features/batch/route';
import { mockApi, renderRoute, stubResizeObserver, type Call } from '../structure/render-route';
import { batchFixture, json, rowFixture } from '../structure/ui-fixtures';

// The charts (recharts, lazy) are not under test here; a stand-in keeps these page tests fast.
vi.mock('@/features/batch/charts/batch-charts', () => ({ BatchCharts: () => null }));

// UI fixture data: three rows of an invented batch.
const rows = [rowFixture(1), rowFixture(2, { formula: 'CH4', perceivedGroup: 'Td', pointGroup: 'Td' }), rowFixture(3, { flags: ['over-budget'] })];

function api(extra?: (call: Call) => Response | undefined) {
  return mockApi((call) => {
    const hit = extra?.(call);
    if (hit) return hit;
    const p = call.url.pathname;
    if (call.method === 'GET' && p === '/api/batches/b-1') return json(batchFixture());
    if (call.method === 'GET' && p === '/api/batches/b-1/structures') return json({ items: rows, total: rows.length, page: 1, pageSize: Number(call.url.searchParams.get('pageSize') ?? 50) });
    if (call.method === 'GET' && p === '/api/batches/b-1/reviews') return json([]);
    if (call.method === 'POST') return json({ ok: true }, 202);
    return json({ error: { code: 'not-found', message: 'Not found' } }, 404);
  });
}

const structureCalls = (calls: Call[]) => calls.filter((c) => c.method === 'GET' && c.url.pathname === '/api/batches/b-1/structures' && c.url.searchParams.get('pageSize') !== '500');

describe('batch page structure table', { timeout: 15_000 }, () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  it('asks the server for the sorted page when a column header is clicked, and flips the direction on a second click', async () => {
    const calls = api();
    const { router } = renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'chemist' });
    const table = await screen.findByRole('table', { name: /structures of this batch/i }, { timeout: 5000 });
    expect(structureCalls(calls)[0].url.searchParams.get('sort')).toBe('name');

    await userEvent.click(within(table).getByRole('button', { name: /formula/i }));
    await waitFor(() => expect(structureCalls(calls).at(-1)!.url.searchParams.get('sort')).toBe('formula'));
    expect(structureCalls(calls).at(-1)!.url.searchParams.get('dir')).toBe('asc');
    expect(router.state.location.search).toBe('?sort=formula');
    await waitFor(() => expect(within(table).getByRole('columnheader', { name: /formula/i }).getAttribute('aria-sort')).toBe('ascending'));

    await userEvent.click(within(table).getByRole('button', { name: /formula/i }));
    await waitFor(() => expect(structureCalls(calls).at(-1)!.url.searchParams.get('dir')).toBe('desc'));
    expect(router.state.location.search).toBe('?sort=formula&dir=desc');
  });

  it('sends the group and flag filters to the server and goes back to page 1', async () => {
    const calls = api();
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1?page=2', role: 'chemist' });
    await screen.findByRole('table', { name: /structures of this batch/i }, { timeout: 5000 });
    await userEvent.selectOptions(screen.getByLabelText('Perceived group'), 'C3v');
    await waitFor(() => expect(structureCalls(calls).at(-1)!.url.searchParams.get('group')).toBe('C3v'));
    expect(structureCalls(calls).at(-1)!.url.searchParams.get('page')).toBe('1');
    await userEvent.selectOptions(screen.getByLabelText('Flag'), 'over-budget');
    await waitFor(() => expect(structureCalls(calls).at(-1)!.url.searchParams.get('flag')).toBe('over-budget'));
  });

  it('enables the bulk re-snap once rows are selected and sends exactly those ids', async () => {
    const calls = api();
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'chemist' });
    await screen.findByRole('table', { name: /structures of this batch/i }, { timeout: 5000 });
    expect(screen.queryByRole('region', { name: /actions on selected/i })).toBeNull();

    await userEvent.click(screen.getByRole('checkbox', { name: 'Select mol-1' }));
    await userEvent.click(screen.getByRole('checkbox', { name: 'Select mol-3' }));
    const bar = screen.getByRole('region', { name: /actions on selected/i });
    expect(within(bar).getByText('2 structures selected')).toBeTruthy();
    // A chemist may re-snap but not review.
    expect(within(bar).queryByRole('button', { name: /accept/i })).toBeNull();

    await userEvent.selectOptions(within(bar).getByLabelText('Re-snap target'), 'group');
    const submit = within(bar).getByRole('button', { name: /re-snap 2 structures/i }) as HTMLButtonElement;
    expect(submit.disabled).toBe(true); // no group typed yet
    await userEvent.type(within(bar).getByLabelText(/group \(schoenflies\)/i), 'Cs');
    expect(submit.disabled).toBe(false);
    await userEvent.click(submit);

    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const post = calls.find((c) => c.method === 'POST')!;
    expect(post.url.pathname).toBe('/api/batches/b-1/resnap');
    expect(post.body).toEqual({ structureIds: ['s-1', 's-3'], target: { kind: 'group', group: 'Cs' } });
    expect(await screen.findByText(/re-snap to cs queued for 2 structures/i)).toBeTruthy();
  });

  it('selects the whole page from the header checkbox and offers reviewers a bulk accept', async () => {
    const calls = api();
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'reviewer' });
    await screen.findByRole('table', { name: /structures of this batch/i }, { timeout: 5000 });
    await userEvent.click(screen.getByRole('checkbox', { name: /select all structures on this page/i }));
    const bar = screen.getByRole('region', { name: /actions on selected/i });
    // A reviewer may review but not re-snap.
    expect(within(bar).queryByRole('button', { name: /re-snap/i })).toBeNull();
    expect((within(bar).getByRole('button', { name: 'Flag 3' }) as HTMLButtonElement).disabled).toBe(true);
    await userEvent.click(within(bar).getByRole('button', { name: 'Accept 3' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const post = calls.find((c) => c.method === 'POST')!;
    expect(post.url.pathname).toBe('/api/batches/b-1/reviews');
    expect(post.body).toEqual({ structureIds: ['s-1', 's-2', 's-3'], decision: 'accepted', comment: '' });
  });

  it('shows the route error for an API 404', async () => {
    api((call) => (call.url.pathname.startsWith('/api/batches/b-1') ? json({ error: { code: 'not-found', message: 'No such batch' } }, 404) : undefined));
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'chemist' });
    expect((await screen.findByRole('alert')).textContent).toMatch(/no such batch/i);
  });
});
