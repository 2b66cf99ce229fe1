import { useMemo, useRef, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type RowSelectionState,
  type Updater,
} from '@tanstack/react-table';
import { useVirtualizer } from '@tanstack/react-virtual';
import type { StructureRow } from '@shared/contracts/api';
import { Badge } from '@/components/ui/badge';
import { focusRing } from '@/components/ui/focus';
import { GroupBadge } from '@/components/ui/group-badge';
import { StatusPill } from '@/components/ui/status-pill';
import { cx } from '@/lib/cx';
import { formatDecimal } from '@/lib/format';
import type { StructureListQuery } from '../api/get-batch-structures';
import { FLAG_LABELS, REVIEW_LABELS } from '../labels';

/** Columns the server can sort by (structureListQuerySchema.sort). */
export type SortKey = StructureListQuery['sort'];
const SORTABLE = new Set<string>(['name', 'formula', 'perceivedGroup', 'pointGroup', 'displacementRmsd', 'maxDisplacement', 'csm', 'symmetryRmsdBefore']);

/** Above this many rows on one page the body is virtualised (only visible rows are in the DOM). */
export const VIRTUALISE_OVER = 100;
const ROW_HEIGHT = 41;

const column = createColumnHelper<StructureRow>();

/** A length in Å without the unit (the header carries it), compact so the table fits 1280 px. */
function num(value: number | null) {
  if (value === null || !Number.isFinite(value)) return '—';
  if (value !== 0 && Math.abs(value) < 1e-4) return value.toExponential(1);
  return value.toFixed(4);
}

/**
 * The batch's structure table: server-side sorting (a header click changes the query), rows
 * of the current page, and a selection that survives paging (keyed by structure id).
 */
export function StructureTable({
  slug,
  rows,
  query,
  onSort,
  selection,
  onSelectionChange,
  busy = false,
}: {
  slug: string;
  rows: StructureRow[];
  query: StructureListQuery;
  onSort: (sort: SortKey, dir: 'asc' | 'desc') => void;
  selection: RowSelectionState;
  onSelectionChange: (next: RowSelectionState) => void;
  busy?: boolean;
}) {
  const columns = useMemo(
    () => [
      column.display({
        id: 'select',
        header: ({ table }) => (
          <input
            type="checkbox"
            aria-label="Select all structures on this page"
            className={cx('size-4 accent-lapis', focusRing)}
            checked={table.getIsAllPageRowsSelected()}
            ref={(el) => {
              if (el) el.indeterminate = table.getIsSomePageRowsSelected();
            }}
            onChange={table.getToggleAllPageRowsSelectedHandler()}
          />
        ),
        cell: ({ row }) => (
          <input
            type="checkbox"
            aria-label={`Select ${row.original.name}`}
            className={cx('size-4 accent-lapis', focusRing)}
            checked={row.getIsSelected()}
            onChange={row.getToggleSelectedHandler()}
          />
        ),
      }),
      column.accessor('name', {
        header: 'Structure',
        cell: ({ row }) => (
          <div className="flex min-w-36 flex-col">
            <Link to={`/w/${encodeURIComponent(slug)}/structures/${encodeURIComponent(row.original.id)}`} className={cx('font-medium text-lapis hover:underline', focusRing)}>
              {row.original.name}
            </Link>
            <span className="text-xs text-ink-faint">
              {row.original.sourceFile}
              {row.original.frameIndex > 0 && <> · frame {row.original.frameIndex + 1}</>}
            </span>
          </div>
        ),
      }),
      column.accessor('formula', { header: 'Formula', cell: (c) => <span className="num">{c.getValue() ?? '—'}</span> }),
      column.accessor('perceivedGroup', { header: 'Perceived', cell: (c) => <GroupBadge group={c.getValue()} /> }),
      column.accessor('pointGroup', { header: 'Chosen', cell: (c) => <GroupBadge group={c.getValue()} /> }),
      column.accessor('computationalSubgroup', { header: 'Subgroup', cell: (c) => <GroupBadge group={c.getValue()} /> }),
      column.accessor('flags', {
        header: 'Flags',
        cell: ({ row }) => <RowFlags row={row.original} />,
      }),
      column.accessor('review', {
        header: 'Review',
        cell: (c) => <Badge tone={REVIEW_LABELS[c.getValue()].tone}>{REVIEW_LABELS[c.getValue()].label}</Badge>,
      }),
      column.accessor('maxDisplacement', { header: 'Max displ. (Å)', meta: { numeric: true }, cell: (c) => num(c.getValue()) }),
      column.accessor('displacementRmsd', { header: 'Displ. RMSD (Å)', meta: { numeric: true }, cell: (c) => num(c.getValue()) }),
      column.accessor('symmetryRmsdBefore', { header: 'Sym. RMSD before (Å)', meta: { numeric: true }, cell: (c) => num(c.getValue()) }),
      column.accessor('symmetryRmsdAfter', { header: 'Sym. RMSD after (Å)', meta: { numeric: true }, cell: (c) => num(c.getValue()) }),
      column.accessor('csm', { header: 'CSM', meta: { numeric: true }, cell: (c) => formatDecimal(c.getValue(), 4) }),
    ],
    [slug],
  );

  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (row) => row.id,
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableRowSelection: true,
    state: { rowSelection: selection },
    onRowSelectionChange: (updater: Updater<RowSelectionState>) =>
      onSelectionChange(typeof updater === 'function' ? updater(selection) : updater),
  });

  const scrollRef = useRef<HTMLDivElement>(null);
  const virtual = rows.length > VIRTUALISE_OVER;
  const virtualizer = useVirtualizer({
    count: virtual ? rows.length : 0,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => ROW_HEIGHT,
    overscan: 12,
  });
  const tableRows = table.getRowModel().rows;
  const items = virtual ? virtualizer.getVirtualItems() : [];
  const visible = virtual ? items.map((item) => tableRows[item.index]) : tableRows;
  const padTop = virtual && items.length ? items[0].start : 0;
  const padBottom = virtual && items.length ? virtualizer.getTotalSize() - items[items.length - 1].end : 0;
  const colCount = columns.length;

  return (
    <div
      ref={scrollRef}
      className={cx('overflow-auto rounded-lg border border-rule bg-card', virtual && 'max-h-[70vh]', busy && 'opacity-70')}
      aria-busy={busy || undefined}
    >
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">Structures of this batch. Column headers with a button sort the table.</caption>
        <thead className="sticky top-0 z-10 border-b border-rule bg-paper text-left text-xs font-semibold tracking-wide text-ink-soft">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const id = header.column.id;
                const sortable = SORTABLE.has(id);
                const active = query.sort === id;
                const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                const label = flexRender(header.column.columnDef.header, header.getContext());
                return (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={active ? (query.dir === 'asc' ? 'ascending' : 'descending') : sortable ? 'none' : undefined}
                    className={cx('px-2.5 py-2.5 align-bottom', numeric ? 'text-right' : 'whitespace-nowrap', id === 'select' && 'w-10')}
                  >
                    {sortable ? (
                      <SortButton
                        active={active}
                        dir={query.dir}
                        onClick={() => onSort(id as SortKey, active && query.dir === 'asc' ? 'desc' : 'asc')}
                      >
                        {label}
                      </SortButton>
                    ) : (
                      label
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody className="divide-y divide-rule/70">
          {padTop > 0 && (
            <tr aria-hidden>
              <td colSpan={colCount} style={{ height: padTop, padding: 0 }} />
            </tr>
          )}
          {visible.map((row) => (
            <tr key={row.id} className={cx('align-middle', row.getIsSelected() && 'bg-lapis-wash/60')} style={{ height: ROW_HEIGHT }}>
              {row.getVisibleCells().map((cell) => {
                const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                return (
                  <td key={cell.id} className={cx('px-2.5 py-2', numeric && 'num text-right whitespace-nowrap')}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                );
              })}
            </tr>
          ))}
          {padBottom > 0 && (
            <tr aria-hidden>
              <td colSpan={colCount} style={{ height: padBottom, padding: 0 }} />
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}

function SortButton({ active, dir, onClick, children }: { active: boolean; dir: 'asc' | 'desc'; onClick: () => void; children: ReactNode }) {
  return (
    <button type="button" onClick={onClick} className={cx('inline-flex items-center gap-1 rounded hover:text-ink', active && 'text-ink', focusRing)}>
      {children}
      <span aria-hidden className={cx('text-[0.7rem]', !active && 'opacity-30')}>
        {active && dir === 'desc' ? '▼' : '▲'}
      </span>
    </button>
  );
}

function RowFlags({ row }: { row: StructureRow }) {
  if (row.status === 'error') {
    return (
      <span className="flex items-center gap-1">
        <StatusPill status="error" />
        {row.error && <span className="max-w-56 truncate text-xs text-brick" title={row.error}>{row.error}</span>}
      </span>
    );
  }
  if (row.status !== 'done') return <StatusPill status={row.status} />;
  if (row.flags.length === 0) return <Badge tone="moss">clean</Badge>;
  return (
    <span className="flex flex-wrap gap-1">
      {row.flags.map((flag) => (
        <Badge key={flag} tone={FLAG_LABELS[flag].tone} title={FLAG_LABELS[flag].hint}>
          {FLAG_LABELS[flag].label}
        </Badge>
      ))}
    </span>
  );
}
