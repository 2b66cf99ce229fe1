import { lazy, Suspense, useCallback, useMemo, useState } from 'react';
import { useNavigation, useSearchParams } from 'react-router-dom';
import type { RowSelectionState } from '@tanstack/react-table';
import { PageHeader } from '@/components/ui/page-header';
import { Pagination } from '@/components/ui/pagination';
import { ProgressBar } from '@/components/ui/progress-bar';
import { Spinner } from '@/components/ui/spinner';
import { EmptyState } from '@/components/ui/states';
import { StatusPill } from '@/components/ui/status-pill';
import { formatCount, formatDateTime, formatRelative, plural } from '@/lib/format';
import { canWrite, useCurrentWorkspace } from '@/lib/workspace-context';
import { isLive, useBatch } from '../api/get-batch';
import { parseStructureListQuery, useBatchStructures, type StructureListQuery } from '../api/get-batch-structures';
import { BulkActions } from './bulk-actions';
import { CancelBatchButton } from './cancel-batch-button';
import { DownloadBatchButton } from './download-batch-button';
import { ReviewHistory } from './review-history';
import { SignOffPanel } from './sign-off-panel';
import { StructureTable, type SortKey } from './structure-table';
import { TableFilters, type QueryPatch } from './table-filters';

// recharts is large: the charts come in their own chunk after the table.
const BatchCharts = lazy(() => import('../charts/batch-charts').then((m) => ({ default: m.BatchCharts })));

const DEFAULTS = parseStructureListQuery(new URLSearchParams());

/** Writes the table query into the URL, leaving out defaults so links stay short. */
export function queryToParams(query: StructureListQuery): URLSearchParams {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === '' || value === DEFAULTS[key as keyof StructureListQuery]) continue;
    params.set(key, String(value));
  }
  return params;
}

/** /w/:slug/batches/:batchId — one batch: progress, charts, the structure table, review and sign-off. */
export function BatchPage({ slug, batchId }: { slug: string; batchId: string }) {
  const { role } = useCurrentWorkspace();
  const batch = useBatch(slug, batchId);
  const [params, setParams] = useSearchParams();
  const query = useMemo(() => parseStructureListQuery(params), [params]);
  const rows = useBatchStructures(slug, batchId, query, batch.status);
  const navigation = useNavigation();
  const [selection, setSelection] = useState<RowSelectionState>({});
  const [message, setMessage] = useState('');
  const live = isLive(batch.status);

  const change = useCallback(
    (patch: QueryPatch) => setParams(queryToParams({ ...query, ...patch }), { replace: true, preventScrollReset: true }),
    [query, setParams],
  );
  const selectedIds = Object.keys(selection).filter((id) => selection[id]);
  const names = useMemo(() => new Map(rows.items.map((r) => [r.id, r.name])), [rows.items]);
  const { counts } = batch;
  const filtered = Boolean(query.group || query.flag || query.review || query.status || query.q);

  return (
    <div className="mx-auto flex max-w-[1400px] flex-col gap-5 px-6 py-6">
      <PageHeader
        eyebrow="Batch"
        title={batch.name}
        description={
          <span className="flex flex-wrap items-center gap-2">
            <StatusPill status={batch.status} />
            <span>
              by {batch.submitter.name} · <time dateTime={batch.createdAt} title={formatDateTime(batch.createdAt)}>{formatRelative(batch.createdAt)}</time>
              {batch.finishedAt && <> · finished {formatDateTime(batch.finishedAt)}</>}
            </span>
            <span className="num text-xs text-ink-faint">
              tolerance {batch.settings.tolerance} Å · budget {batch.settings.displacementBudget} Å
            </span>
            {batch.templates.length > 0 && (
              <span className="text-xs text-ink-faint" title="Export templates rendered per structure into the download, as they were at upload">
                decks: {batch.templates.map((t) => `${t.name} (.${t.fileExtension})`).join(', ')}
              </span>
            )}
          </span>
        }
        actions={
          <>
            {live && canWrite(role) && <CancelBatchButton slug={slug} batchId={batch.id} />}
            <DownloadBatchButton batch={batch} />
          </>
        }
      />

      <div className="grid gap-4 lg:grid-cols-[1fr_24rem]">
        <section aria-label="Outcome" className="flex flex-col gap-3 rounded-lg border border-rule bg-card p-4">
          {live && <ProgressBar value={counts.done + counts.error} max={Math.max(1, counts.total)} label="Structures processed" />}
          <dl className="grid grid-cols-3 gap-3 sm:grid-cols-6">
            <Count label="Structures" value={counts.total} />
            <Count label="Clean" value={counts.clean} tone="text-moss" />
            <Count label="Over budget" value={counts.overBudget} tone="text-ochre" />
            <Count label="Knife edge" value={counts.knifeEdge} tone="text-ochre" />
            <Count label="Errors" value={counts.error} tone="text-brick" />
            <Count label="Finished" value={counts.done} />
          </dl>
          {batch.files.length > 0 && (
            <p className="text-xs text-ink-faint">
              From {plural(batch.files.length, 'file')}: {batch.files.slice(0, 4).map((f) => f.name).join(', ')}
              {batch.files.length > 4 && ` and ${batch.files.length - 4} more`}
            </p>
          )}
        </section>
        <SignOffPanel slug={slug} batch={batch} role={role} />
      </div>

      <Suspense
        fallback={
          <div className="flex h-64 items-center justify-center rounded-lg border border-rule bg-card">
            <Spinner label="Loading charts" />
          </div>
        }
      >
        <BatchCharts slug={slug} batch={batch} />
      </Suspense>

      <section aria-labelledby="structures-h" className="flex flex-col gap-3">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <h2 id="structures-h" className="text-lg font-semibold">
            Structures <span className="num text-sm font-normal text-ink-soft">{formatCount(rows.total)}{filtered && ` of ${formatCount(counts.total)}`}</span>
          </h2>
          {navigation.state === 'loading' && <Spinner label="Updating" />}
        </div>
        <TableFilters batch={batch} query={query} onChange={change} />
        {selectedIds.length > 0 && (
          <div className="flex flex-col gap-1">
            <BulkActions
              slug={slug}
              batchId={batch.id}
              role={role}
              selectedIds={selectedIds}
              groups={batch.groups.map((g) => g.group)}
              onDone={(m) => {
                setSelection({});
                setMessage(m);
              }}
            />
            <button type="button" className="self-start text-xs text-lapis hover:underline" onClick={() => setSelection({})}>
              Clear selection
            </button>
          </div>
        )}
        <p role="status" className="min-h-5 text-sm text-moss">
          {message}
        </p>
        {rows.items.length === 0 ? (
          filtered ? (
            <EmptyState title="No structure matches these filters">Clear a filter to see more of the batch.</EmptyState>
          ) : (
            <EmptyState title={live ? 'Structures are on their way' : 'This batch has no structures'}>
              {live ? 'The worker is reading the files; rows appear here as they finish.' : 'None of the uploaded files held a structure.'}
            </EmptyState>
          )
        ) : (
          <StructureTable
            slug={slug}
            rows={rows.items}
            query={query}
            onSort={(sort: SortKey, dir) => change({ sort, dir, page: 1 })}
            selection={selection}
            onSelectionChange={setSelection}
            busy={navigation.state === 'loading'}
          />
        )}
        {rows.total > 0 && <Pagination page={query.page} pageSize={query.pageSize} total={rows.total} onPage={(page) => change({ page })} label="Structure pages" />}
      </section>

      <ReviewHistory slug={slug} batchId={batch.id} names={names} />
    </div>
  );
}

function Count({ label, value, tone = 'text-ink' }: { label: string; value: number; tone?: string }) {
  return (
    <div className="flex flex-col">
      <dt className="text-xs text-ink-soft">{label}</dt>
      <dd className={`num text-xl font-semibold ${tone}`}>{formatCount(value)}</dd>
    </div>
  );
}

