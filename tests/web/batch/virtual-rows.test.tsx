import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { structureListQuerySchema } from '@shared/contracts/api';
import { StructureTable, VIRTUALISE_OVER } from '@/features/batch/components/structure-table';
import { rowFixture } from '../structure/ui-fixtures';

// UI fixture data: a page of 500 invented rows (the largest page the API serves).
const rows = Array.from({ length: 500 }, (_, i) => rowFixture(i + 1));
const query = structureListQuerySchema.parse({ pageSize: 500 });

describe('structure table with a large page', () => {
  afterEach(cleanup);

  it('keeps only the visible rows in the DOM once a page holds more than the threshold', () => {
    const { container } = render(
      <MemoryRouter>
        <StructureTable slug="demo" rows={rows} query={query} onSort={() => {}} selection={{}} onSelectionChange={() => {}} />
      </MemoryRouter>,
    );
    const rendered = container.querySelectorAll('tbody tr:not([aria-hidden])').length;
    expect(rows.length).toBeGreaterThan(VIRTUALISE_OVER);
    expect(rendered).toBeLessThan(60);
  });

  it('renders every row of a small page', () => {
    const { container } = render(
      <MemoryRouter>
        <StructureTable slug="demo" rows={rows.slice(0, 40)} query={query} onSort={() => {}} selection={{}} onSelectionChange={() => {}} />
      </MemoryRouter>,
    );
    expect(container.querySelectorAll('tbody tr').length).toBe(40);
  });
});
