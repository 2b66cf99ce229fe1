import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import * as structureRoute from '@/features/structure/route';
import { LadderControl } from '@/features/structure/ladder/ladder-control';
import { ladderBars } from '@/features/structure/ladder/ladder-data';
import { mockApi, renderRoute, stubResizeObserver } from '../structure/render-route';
import { json, resultFixture, structureFixture } from '../structure/ui-fixtures';

// The ladder chart (recharts, lazy) is not under test here; a stand-in keeps these page tests fast.
vi.mock('@/features/structure/ladder/ladder-chart', () => ({ LadderChart: () => null }));

// UI fixture data: the invented four-rung ladder of resultFixture (C1, Cs, C3v, D3h).
const ladder = resultFixture().ladder;

describe('ladder control', () => {
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  it('renders one row per rung with its tolerance range and costs, and marks the chosen group', () => {
    render(<LadderControl ladder={ladder} chosen="C3v" tolerance={0.01} budget={0.05} canResnap pending={null} onPick={() => {}} />);
    const rows = within(screen.getByRole('table')).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(4);
    expect(rows.map((r) => within(r).getByRole('rowheader').querySelector('[role=img]')?.getAttribute('aria-label'))).toEqual(['C 1', 'C s', 'C 3 v', 'D 3 h']);
    const chosen = rows.find((r) => r.getAttribute('aria-current') === 'true')!;
    expect(within(chosen).getByText('chosen')).toBeTruthy();
    expect(within(chosen).queryByRole('button')).toBeNull();
    expect(within(chosen).getByText('at your tolerance')).toBeTruthy();
    expect(rows[1].textContent).toContain('5e−4 – 0.004');
    // D3h would move an atom 0.39 Å, past the 0.05 Å budget: marked for sighted and screen-reader users.
    expect(rows[3].textContent).toContain('(over the budget)');
  });

  it('calls re-snap with the group of the rung picked', async () => {
    const onPick = vi.fn();
    render(<LadderControl ladder={ladder} chosen="C3v" tolerance={0.01} budget={0.05} canResnap pending={null} onPick={onPick} />);
    await userEvent.click(screen.getByRole('button', { name: 'Snap to Cs' }));
    expect(onPick).toHaveBeenCalledWith('Cs');
  });

  it('disables every rung for a role that may not re-snap, and says why', () => {
    render(<LadderControl ladder={ladder} chosen="C3v" tolerance={0.01} budget={0.05} canResnap={false} pending={null} onPick={() => {}} />);
    for (const b of screen.getAllByRole('button')) expect((b as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByText(/only owners and chemists can re-snap/i)).toBeTruthy();
  });

  it('gives the chart positive tolerance ranges for its log axis', () => {
    const bars = ladderBars([{ group: 'C1', order: 1, fromTolerance: 0, toTolerance: 1e-4, displacementRmsd: 0, maxDisplacement: 0 }]);
    expect(bars[0].range[0]).toBeGreaterThan(0);
    expect(bars[0].range[1]).toBeGreaterThan(bars[0].range[0]);
  });
});

describe('structure page ladder', { timeout: 15_000 }, () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  it('re-snaps this one structure to the rung picked with POST /api/batches/:id/resnap', async () => {
    const calls = mockApi((call) => {
      if (call.method === 'GET' && call.url.pathname === '/api/structures/s-1') return json(structureFixture());
      if (call.method === 'POST') return json({ queued: 1 }, 202);
      return json({ error: { code: 'not-found', message: 'Not found' } }, 404);
    });
    renderRoute(structureRoute, { path: 'structures/:structureId', url: '/w/demo/structures/s-1', role: 'chemist' });
    const ladderSection = await screen.findByRole('region', { name: /ladder/i }, { timeout: 5000 });
    await userEvent.click(within(ladderSection).getByRole('button', { name: 'Snap to D3h' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const post = calls.find((c) => c.method === 'POST')!;
    expect(post.url.pathname).toBe('/api/batches/b-1/resnap');
    expect(post.body).toEqual({ structureIds: ['s-1'], target: { kind: 'group', group: 'D3h' } });
  });
});
