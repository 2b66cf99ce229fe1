import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page-header';
import { Pagination } from '@/components/ui/pagination';
import { EmptyState } from '@/components/ui/states';
import { cx } from '@/lib/cx';
import { plural } from '@/lib/format';
import { canWrite, useCurrentWorkspace } from '@/lib/workspace-context';
import { filtersFromSearch, hasLiveBatches, useBatches, type BatchStatus } from '../api/get-batches';
import { BatchesTable } from './batches-table';

const statusOptions: Array<{ value: BatchStatus | ''; label: string }> = [
  { value: '', label: 'Any status' },
  { value: 'queued', label: 'Queued' },
  { value: 'running', label: 'Running' },
  { value: 'done', label: 'Done' },
  { value: 'failed', label: 'Failed' },
  { value: 'cancelled', label: 'Cancelled' },
];

/** `/w/:slug` — the workspace's batches, filtered and paged on the server, live while running. */
export function BatchesPage() {
  const { workspace, role } = useCurrentWorkspace();
  const [search, setSearch] = useSearchParams();
  const filters = filtersFromSearch(search);
  const data = useBatches(workspace.slug, filters);
  const base = `/w/${encodeURIComponent(workspace.slug)}`;
  const writer = canWrite(role);
  const filtered = !!filters.status || !!filters.q;

  const update = (changes: Record<string, string | undefined>) => {
    const next = new URLSearchParams(search);
    for (const [key, value] of Object.entries(changes)) {
      if (value) next.set(key, value);
      else next.delete(key);
    }
    if (!('page' in changes)) next.delete('page');
    setSearch(next, { replace: true });
  };

  return (
    <>
      <PageHeader
        eyebrow={workspace.name}
        title="Batches"
        description={
          hasLiveBatches(data) ? 'Live: batches in progress update every few seconds.' : `${plural(data.total, 'batch', 'batches')} in this workspace.`
        }
        actions={writer && <ButtonLink to={`${base}/new`}>New batch</ButtonLink>}
      />
      <div role="search" className="mb-4 flex flex-wrap items-end gap-3">
        <SearchBox initial={filters.q ?? ''} onSearch={(q) => update({ q: q || undefined })} />
        <div className="flex flex-col gap-1">
          <label htmlFor="batch-status" className="text-xs font-medium text-ink-soft">
            Status
          </label>
          <select
            id="batch-status"
            className={cx(inputClass, 'w-44')}
            value={filters.status ?? ''}
            onChange={(e) => update({ status: e.target.value || undefined })}
          >
            {statusOptions.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </div>
      </div>
      {data.items.length === 0 ? (
        filtered ? (
          <EmptyState title="No batches match">Try another status or search term.</EmptyState>
        ) : (
          <EmptyState
            title="No batches yet"
            action={writer ? <ButtonLink to={`${base}/new`}>Upload the first batch</ButtonLink> : undefined}
          >
            {writer
              ? 'Drop optimized geometries (XYZ, SDF, PDB, CML, QCSchema or a ZIP) to perceive, snap and check them.'
              : 'When a chemist uploads a batch, it appears here for review.'}
          </EmptyState>
        )
      ) : (
        <div className="flex flex-col gap-3">
          <BatchesTable batches={data.items} batchHref={(id) => `${base}/batches/${encodeURIComponent(id)}`} />
          <Pagination
            page={data.page}
            pageSize={data.pageSize}
            total={data.total}
            onPage={(p) => update({ page: p > 1 ? String(p) : undefined })}
            label="Batch pages"
          />
        </div>
      )}
    </>
  );
}

/** Search by batch name; waits for a pause in typing before asking the server. */
function SearchBox({ initial, onSearch }: { initial: string; onSearch: (q: string) => void }) {
  const [value, setValue] = useState(initial);
  useEffect(() => setValue(initial), [initial]);
  useEffect(() => {
    if (value.trim() === initial) return;
    const timer = setTimeout(() => onSearch(value.trim()), 350);
    return () => clearTimeout(timer);
    // onSearch changes every render; the value is what matters.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value, initial]);
  return (
    <div className="flex min-w-64 flex-1 flex-col gap-1">
      <label htmlFor="batch-search" className="text-xs font-medium text-ink-soft">
        Search batches
      </label>
      <input
        id="batch-search"
        type="search"
        className={inputClass}
        placeholder="Batch name"
        value={value}
        onChange={(e) => setValue(e.target.value)}
        onKeyDown={(e) => e.key === 'Enter' && onSearch(value.trim())}
      />
    </div>
  );
}
