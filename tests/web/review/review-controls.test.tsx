import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import * as batchRoute from '@/features/batch/route';
import * as structureRoute from '@/features/structure/route';
import { signOffBlocker } from '@/features/batch/components/sign-off-panel';
import { mockApi, renderRoute, stubResizeObserver, type Call } from '../structure/render-route';
import { batchFixture, json, rowFixture, structureFixture, type BatchDetail } from '../structure/ui-fixtures';

// The charts (recharts, lazy) are not under test here; a stand-in keeps these page tests fast.
vi.mock('@/features/batch/charts/batch-charts', () => ({ BatchCharts: () => null }));

// The ladder chart (recharts, lazy) is not under test here; a stand-in keeps these page tests fast.
vi.mock('@/features/structure/ladder/ladder-chart', () => ({ LadderChart: () => null }));

// UI fixture data: an invented three-structure batch in several review states.
const counts = (accepted: number, flagged: number) => ({ ...batchFixture().counts, accepted, flagged });

function batchApi(batch: BatchDetail, extra?: (call: Call) => Response | undefined) {
  return mockApi((call) => {
    const hit = extra?.(call);
    if (hit) return hit;
    const p = call.url.pathname;
    if (p === '/api/batches/b-1') return json(batch);
    if (p === '/api/batches/b-1/structures') return json({ items: [rowFixture(1), rowFixture(2), rowFixture(3)], total: 3, page: 1, pageSize: 50 });
    if (p === '/api/batches/b-1/reviews' && call.method === 'GET')
      return json([
        { id: 'r-1', structureId: 's-1', decision: 'accepted', comment: 'looks right', reviewer: { id: 'u-rev', name: 'Demo Reviewer' }, createdAt: '2026-03-01T11:00:00.000Z' },
      ]);
    if (call.method === 'POST') return json({ ok: true });
    return json({ error: { code: 'not-found', message: 'Not found' } }, 404);
  });
}

describe('sign-off rule', () => {
  it('blocks until every structure is accepted or flagged, and while the batch runs', () => {
    const b = batchFixture();
    expect(signOffBlocker({ ...b, counts: counts(1, 0) }, 'reviewer')).toBe('2 structures still need a decision (accept or flag).');
    expect(signOffBlocker({ ...b, counts: counts(2, 0) }, 'reviewer')).toBe('1 structure still needs a decision (accept or flag).');
    expect(signOffBlocker({ ...b, counts: counts(2, 1) }, 'reviewer')).toBeNull();
    expect(signOffBlocker({ ...b, counts: counts(2, 1) }, 'owner')).toBeNull();
    expect(signOffBlocker({ ...b, status: 'running', counts: counts(2, 1) }, 'reviewer')).toMatch(/still running/);
    expect(signOffBlocker({ ...b, counts: counts(2, 1) }, 'chemist')).toMatch(/only reviewers and owners/i);
    expect(signOffBlocker({ ...b, counts: counts(2, 1), signedOffBy: { id: 'u', name: 'R' } }, 'reviewer')).toMatch(/already signed off/);
  });
});

describe('review controls on the batch page', { timeout: 15_000 }, () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  it('keeps sign-off disabled with the reason until all structures are decided', async () => {
    batchApi(batchFixture({ counts: counts(1, 0) }));
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'reviewer' });
    const button = (await screen.findByRole('button', { name: 'Sign off batch' }, { timeout: 5000 })) as HTMLButtonElement;
    expect(button.disabled).toBe(true);
    const reason = document.getElementById(button.getAttribute('aria-describedby')!)!;
    expect(reason.textContent).toBe('2 structures still need a decision (accept or flag).');
    // The history is visible with the reviewer and the comment.
    const history = screen.getByRole('region', { name: 'Review history' });
    expect(history.textContent).toMatch(/Accepted.*mol-1.*Demo Reviewer/);
    expect(history.textContent).toContain('looks right');
  });

  it('signs off once every structure is decided', async () => {
    const calls = batchApi(batchFixture({ counts: counts(2, 1) }));
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'reviewer' });
    const button = (await screen.findByRole('button', { name: 'Sign off batch' }, { timeout: 5000 })) as HTMLButtonElement;
    expect(button.disabled).toBe(false);
    await userEvent.type(screen.getByLabelText(/sign-off comment/i), 'all checked');
    await userEvent.click(button);
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const post = calls.find((c) => c.method === 'POST')!;
    expect(post.url.pathname).toBe('/api/batches/b-1/sign-off');
    expect(post.body).toEqual({ comment: 'all checked' });
  });

  it('shows chemists the decisions but no sign-off button', async () => {
    batchApi(batchFixture({ counts: counts(3, 0), signedOffBy: { id: 'u-rev', name: 'Demo Reviewer' }, signedOffAt: '2026-03-01T12:00:00.000Z' }));
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'chemist' });
    expect((await screen.findByText(/signed off by/i, {}, { timeout: 5000 })).textContent).toMatch(/Demo Reviewer/);
    expect(screen.queryByRole('button', { name: 'Sign off batch' })).toBeNull();
  });
});

describe('review controls on the structure page', { timeout: 15_000 }, () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  function structureApi() {
    return mockApi((call) => {
      if (call.url.pathname === '/api/structures/s-1') return json(structureFixture());
      if (call.method === 'POST') return json({ ok: true });
      return json({ error: { code: 'not-found', message: 'Not found' } }, 404);
    });
  }

  it('lets a reviewer accept, and flag only with a comment', async () => {
    const calls = structureApi();
    renderRoute(structureRoute, { path: 'structures/:structureId', url: '/w/demo/structures/s-1', role: 'reviewer' });
    const review = await screen.findByRole('region', { name: 'Review' }, { timeout: 5000 });
    const flag = within(review).getByRole('button', { name: 'Flag' }) as HTMLButtonElement;
    expect(flag.disabled).toBe(true);
    await userEvent.type(within(review).getByLabelText(/comment/i), 'H3 looks displaced');
    expect(flag.disabled).toBe(false);
    await userEvent.click(flag);
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const post = calls.find((c) => c.method === 'POST')!;
    expect(post.url.pathname).toBe('/api/batches/b-1/reviews');
    expect(post.body).toEqual({ structureIds: ['s-1'], decision: 'flagged', comment: 'H3 looks displaced' });
  });

  it('shows a chemist the decisions without decision buttons', async () => {
    mockApi((call) =>
      call.url.pathname === '/api/structures/s-1'
        ? json(
            structureFixture({
              review: 'accepted',
              reviews: [{ id: 'r-1', structureId: 's-1', decision: 'accepted', comment: 'fine', reviewer: { id: 'u', name: 'Demo Reviewer' }, createdAt: '2026-03-01T11:00:00.000Z' }],
            }),
          )
        : json({ error: { code: 'not-found', message: 'Not found' } }, 404),
    );
    renderRoute(structureRoute, { path: 'structures/:structureId', url: '/w/demo/structures/s-1', role: 'chemist' });
    const review = await screen.findByRole('region', { name: 'Review' }, { timeout: 5000 });
    expect(within(review).queryByRole('button', { name: /accept|flag/i })).toBeNull();
    expect(within(review).getByRole('list', { name: /decisions on this structure/i }).textContent).toMatch(/Accepted.*Demo Reviewer/);
  });
});

describe('batch header', { timeout: 15_000 }, () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  it('names the export templates the batch renders, and says nothing when there are none', async () => {
    batchApi(batchFixture({ templates: [{ name: 'Single point', fileExtension: 'inp' }] }));
    const { unmount } = renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'chemist' });
    expect((await screen.findByText(/^decks:/, {}, { timeout: 5000 })).textContent).toBe('decks: Single point (.inp)');
    unmount();
    batchApi(batchFixture());
    renderRoute(batchRoute, { path: 'batches/:batchId', url: '/w/demo/batches/b-1', role: 'chemist' });
    await screen.findByText(/tolerance/, {}, { timeout: 5000 });
    expect(screen.queryByText(/^decks:/)).toBeNull();
  });
});
