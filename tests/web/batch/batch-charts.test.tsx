import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, render, screen, within } from '@testing-library/react';
import { DISPLACEMENT_EDGES } from '@shared/contracts/histogram';
import { BatchCharts } from '@/features/batch/charts/batch-charts';
import { displacementHistogram } from '@/features/batch/charts/histogram';
import { mockApi, stubResizeObserver } from '../structure/render-route';
import { batchFixture, json, settings } from '../structure/ui-fixtures';

// UI fixture counts (invented): 17 bins over the shared edges, underflow first, overflow last.
function countsWith(hits: Record<number, number>): number[] {
  const counts = new Array<number>(DISPLACEMENT_EDGES.length + 1).fill(0);
  for (const [bin, n] of Object.entries(hits)) counts[Number(bin)] = n;
  return counts;
}

describe('displacementHistogram (labels the server counts)', () => {
  const edges = DISPLACEMENT_EDGES;

  it('labels every bin from the edges, underflow first and overflow last, before trimming', () => {
    const bins = displacementHistogram({ edges, counts: countsWith({ 0: 1, 16: 2 }) });
    expect(bins).toHaveLength(17);
    expect(bins[0]).toMatchObject({ from: 0, to: 1e-5, count: 1, label: '< 1e−5' });
    expect(bins[1]).toMatchObject({ from: 1e-5, to: 2e-5, count: 0, label: '1e−5–2e−5' });
    expect(bins[12]).toMatchObject({ from: 0.05, to: 0.1, label: '0.05–0.1' });
    expect(bins[16]).toMatchObject({ from: 1, to: Infinity, count: 2, label: '≥ 1' });
  });

  it('trims empty bins at both ends but keeps the budget bin, and marks it', () => {
    const bins = displacementHistogram({ edges, counts: countsWith({ 7: 4, 9: 2 }) }, 0.05);
    // [1e-3, 2e-3) … [0.05, 0.1): the budget bin stays although it is empty.
    expect(bins.map((b) => b.label)).toEqual(['1e−3–2e−3', '2e−3–5e−3', '5e−3–0.01', '0.01–0.02', '0.02–0.05', '0.05–0.1']);
    expect(bins.map((b) => b.count)).toEqual([4, 0, 2, 0, 0, 0]);
    expect(bins.filter((b) => b.holdsBudget).map((b) => b.label)).toEqual(['0.05–0.1']);
  });

  it('gives nothing to draw when every bin is empty and no budget is given', () => {
    expect(displacementHistogram({ edges, counts: countsWith({}) })).toEqual([]);
  });

  it('refuses counts that do not match the edges', () => {
    expect(() => displacementHistogram({ edges, counts: [1, 2, 3] })).toThrow(/17 counts/);
  });
});

describe('batch charts: displacement histogram from the server', () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  function renderCharts(histogram: { counts: number[]; counted: number; total: number }) {
    const calls = mockApi((call) => {
      if (call.url.pathname === '/api/batches/b-1/displacement-histogram') return json({ edges: DISPLACEMENT_EDGES, ...histogram });
      return json({ error: { code: 'not-found', message: 'Not found' } }, 404);
    });
    const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    const batch = batchFixture({ counts: { ...batchFixture().counts, total: histogram.total }, settings: { ...settings, displacementBudget: 0.05 } });
    render(
      <QueryClientProvider client={client}>
        <BatchCharts slug="demo" batch={batch} />
      </QueryClientProvider>,
    );
    return calls;
  }

  it("draws the server's bins (trimmed, budget marked) and says how many structures have a value", async () => {
    // A batch of 9: 7 with a displacement, 2 without (failed or unfinished).
    const calls = renderCharts({ counts: countsWith({ 7: 4, 9: 2, 14: 1 }), counted: 7, total: 9 });
    const table = await screen.findByRole('table', { name: 'Structures per range of largest displacement, in Å' }, { timeout: 5000 });
    const rows = within(table)
      .getAllByRole('row')
      .map((r) => [within(r).getByRole('rowheader').textContent, within(r).getByRole('cell').textContent]);
    expect(rows).toEqual([
      ['1e−3–2e−3 Å', '4'],
      ['2e−3–5e−3 Å', '0'],
      ['5e−3–0.01 Å', '2'],
      ['0.01–0.02 Å', '0'],
      ['0.02–0.05 Å', '0'],
      ['0.05–0.1 Å (holds the budget)', '0'],
      ['0.1–0.2 Å', '0'],
      ['0.2–0.5 Å', '1'],
    ]);
    expect(screen.getByText(/7 of 9 structures have a value/)).toBeTruthy();
    expect(screen.queryByText(/first .* of .* structures/)).toBeNull();
    // One request for the counts; no structure pages are read for the chart any more.
    expect(calls.map((c) => c.url.pathname)).toEqual(['/api/batches/b-1/displacement-histogram']);
  });

  it('shows only the budget note when every structure has a value', async () => {
    renderCharts({ counts: countsWith({ 8: 3 }), counted: 3, total: 3 });
    await screen.findByRole('table', { name: 'Structures per range of largest displacement, in Å' }, { timeout: 5000 });
    expect(screen.queryByText(/have a value/)).toBeNull();
    expect(screen.getByText(/budget 0\.050.Å \(bin in ochre\)/)).toBeTruthy();
  });

  it('says so when no structure has a value yet', async () => {
    renderCharts({ counts: countsWith({}), counted: 0, total: 4 });
    expect(await screen.findByText('No structure has finished yet.', {}, { timeout: 5000 })).toBeTruthy();
  });
});
