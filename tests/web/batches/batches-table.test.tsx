import { cleanup, render, screen, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, describe, expect, it } from 'vitest';
import { BatchesTable } from '@/features/batches/components/batches-table';
import { doneBatch, failedBatch, queuedBatch, runningBatch } from '../fixtures/batches';

afterEach(cleanup);

const NOW = Date.parse('2026-03-12T14:40:00.000Z');

function renderTable() {
  return render(
    <MemoryRouter>
      <BatchesTable batches={[runningBatch, queuedBatch, doneBatch, failedBatch]} batchHref={(id) => `/w/demo/batches/${id}`} now={NOW} />
    </MemoryRouter>,
  );
}

function rowOf(name: string): HTMLElement {
  const link = screen.getByRole('link', { name });
  return link.closest('tr') as HTMLElement;
}

describe('BatchesTable (UI fixture data)', () => {
  it('renders one row per batch with a link to the batch page, submitter and relative date', () => {
    renderTable();
    const table = screen.getByRole('table', { name: 'Batches in this workspace' });
    // header row + 4 batches
    expect(within(table).getAllByRole('row')).toHaveLength(5);
    expect(screen.getByRole('link', { name: 'Ligand series, round 2' }).getAttribute('href')).toBe('/w/demo/batches/b-run');
    const running = rowOf('Ligand series, round 2');
    expect(within(running).getByText('Chemist Example')).toBeTruthy();
    expect(within(running).getByText('40 minutes ago')).toBeTruthy();
    expect(within(running).getByText('40 structures')).toBeTruthy();
  });

  it('shows a progress bar only while a batch is queued or running, counting finished and failed structures', () => {
    renderTable();
    const bar = within(rowOf('Ligand series, round 2')).getByRole('progressbar', { name: 'Progress of Ligand series, round 2' });
    // 12 done + 3 errors of 40 = 37 %
    expect(bar.getAttribute('aria-valuenow')).toBe('15');
    expect(bar.getAttribute('aria-valuemax')).toBe('40');
    expect(bar.getAttribute('aria-valuetext')).toBe('37%');
    expect(within(rowOf('Clusters overnight')).getByRole('progressbar').getAttribute('aria-valuetext')).toBe('0%');
    expect(within(rowOf('Intermediates')).queryByRole('progressbar')).toBeNull();
    expect(within(rowOf('Broken upload')).queryByRole('progressbar')).toBeNull();
  });

  it('shows each status in words', () => {
    renderTable();
    expect(within(rowOf('Ligand series, round 2')).getByText('Running')).toBeTruthy();
    expect(within(rowOf('Clusters overnight')).getByText('Queued')).toBeTruthy();
    expect(within(rowOf('Intermediates')).getByText('Done')).toBeTruthy();
    expect(within(rowOf('Broken upload')).getByText('Failed')).toBeTruthy();
  });

  it('lists the structures by outcome: clean, over budget, knife edge, error', () => {
    renderTable();
    const outcome = screen.getAllByLabelText(/^Outcome of /);
    expect(outcome).toHaveLength(4);
    const counts = (label: string) => {
      const dl = screen.getByLabelText(`Outcome of ${label}`);
      const terms = within(dl).getAllByRole('term').map((t) => t.textContent);
      const values = within(dl).getAllByRole('definition').map((d) => d.textContent);
      return Object.fromEntries(terms.map((t, i) => [t, values[i]]));
    };
    expect(counts('Ligand series, round 2')).toEqual({ clean: '9', 'over budget': '2', 'knife edge': '1', error: '3' });
    expect(counts('Intermediates')).toEqual({ clean: '5', 'over budget': '0', 'knife edge': '0', error: '0' });
  });

  it('renders the groups found with subscripts, the first four and how many more', () => {
    renderTable();
    const groups = within(rowOf('Ligand series, round 2')).getByRole('list', { name: 'Point groups found' });
    const items = within(groups).getAllByRole('listitem');
    expect(items).toHaveLength(5); // four badges + "+2 more"
    expect(items[4].textContent).toBe('+2 more');
    const c2v = within(items[0]).getByRole('img', { name: 'C 2 v' });
    expect(c2v.querySelector('sub')?.textContent).toBe('2v');
    expect(items[0].textContent).toContain('×6');
    expect(within(rowOf('Clusters overnight')).getByText('none yet')).toBeTruthy();
    const d6h = within(rowOf('Intermediates')).getByRole('img', { name: 'D 6 h' });
    expect(d6h.textContent).toBe('D6h');
  });
});
