import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, screen, within } from '@testing-library/react';
import * as structureRoute from '@/features/structure/route';
import { mockApi, renderRoute, stubResizeObserver } from './render-route';
import { json, resultFixture, structureFixture } from './ui-fixtures';

// The ladder chart (recharts, lazy) is not under test here; a stand-in keeps these page tests fast.
vi.mock('@/features/structure/ladder/ladder-chart', () => ({ LadderChart: () => null }));

function open(structure: ReturnType<typeof structureFixture>, role: 'chemist' | 'reviewer' = 'chemist') {
  mockApi((call) => (call.url.pathname === '/api/structures/s-1' ? json(structure) : json({ error: { code: 'not-found', message: 'No such structure' } }, 404)));
  return renderRoute(structureRoute, { path: 'structures/:structureId', url: '/w/demo/structures/s-1', role });
}

describe('structure page', { timeout: 15_000 }, () => {
  beforeEach(stubResizeObserver);
  afterEach(() => {
    cleanup();
    vi.unstubAllGlobals();
  });

  it('shows the groups, the measures, the operations with residuals, the classes, the atoms and a download per format', async () => {
    open(structureFixture());
    await screen.findByRole('heading', { name: 'mol-1' }, { timeout: 5000 });
    expect(screen.getAllByRole('img', { name: 'C 3 v' }).length).toBeGreaterThan(0);
    const ops = screen.getByRole('region', { name: /operations/i });
    expect(within(ops).getAllByRole('row')).toHaveLength(4); // header + E, C3, σv
    expect(within(ops).getByText('0.0031 Å')).toBeTruthy();
    const classes = screen.getByRole('region', { name: /equivalence classes/i });
    expect(classes.textContent).toContain('×3');
    const atoms = screen.getByRole('region', { name: /atoms \(4\)/i });
    expect(within(atoms).getAllByRole('row')).toHaveLength(5);
    const links = within(screen.getByRole('region', { name: /download this structure/i })).getAllByRole('link');
    expect(links.map((a) => a.getAttribute('href'))).toEqual(
      ['xyz', 'extxyz', 'mol', 'qcschema', 'unique'].map((f) => `/api/structures/s-1/download?format=${f}`),
    );
    // jsdom has no WebGL: the text fallback stands in for the 3D view and the rest still shows.
    expect((await screen.findByRole('note')).textContent).toMatch(/3D view unavailable/);
  });

  it('states the cautions for a large displacement and a higher group, with the numbers', async () => {
    const result = resultFixture({
      flags: ['over-budget', 'higher-symmetry'],
      flagNotes: [{ flag: 'higher-symmetry', message: 'D3h is supported only at 0.12 Å and above.' }],
      maxDisplacement: 0.39,
    });
    open(structureFixture({ result, flags: result.flags }));
    const region = await screen.findByRole('region', { name: 'Cautions' }, { timeout: 5000 });
    const cautions = { textContent: (region.textContent ?? '').replace(/\u00a0/g, ' ') };
    expect(cautions.textContent).toContain('moved atoms by up to 0.3900 Å, more than the budget of 0.050 Å — check that the structure is the one you meant');
    expect(cautions.textContent).toContain('D3h is supported only at 0.12 Å and above.');
    expect(cautions.textContent).toContain('may be a saddle point rather than a minimum — verify with a frequency calculation');
  });

  it('explains a structure that failed, and keeps the review panel', async () => {
    open(structureFixture({ status: 'error', error: 'fixture.xyz frame 1 line 3: unknown element "Xx"', result: null }));
    const alert = await screen.findByRole('alert', {}, { timeout: 5000 });
    expect(alert.textContent).toMatch(/could not be snapped.*unknown element/);
    expect(screen.getByRole('region', { name: 'Review' })).toBeTruthy();
  });
});
