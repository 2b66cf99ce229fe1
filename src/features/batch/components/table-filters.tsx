import { useEffect, useId, useState, type ReactNode } from 'react';
import { useLocation, useNavigation } from 'react-router-dom';
import { flagCodes } from '@shared/contracts/structure';
import { inputClass } from '@/components/ui/field';
import { cx } from '@/lib/cx';
import type { BatchDetail } from '../api/get-batch';
import type { StructureListQuery } from '../api/get-batch-structures';
import { FLAG_LABELS, REVIEW_LABELS } from '../labels';

export type QueryPatch = Partial<StructureListQuery>;

/** How long typing pauses before the search is sent (ms). */
const SEARCH_DEBOUNCE = 300;

/**
 * Filters of the structure table: search by name, perceived group (the batch's groups with
 * counts), flag, review state and page size. Every change goes back to page 1.
 */
export function TableFilters({ batch, query, onChange }: { batch: BatchDetail; query: StructureListQuery; onChange: (patch: QueryPatch) => void }) {
  const [text, setText] = useState(query.q ?? '');
  useEffect(() => setText(query.q ?? ''), [query.q]);
  // Leaving the page (a structure link clicked while typing) drops the pending search, which
  // would otherwise navigate back here.
  const navigation = useNavigation();
  const { pathname } = useLocation();
  const leaving = navigation.state !== 'idle' && navigation.location?.pathname !== pathname;
  useEffect(() => {
    if ((query.q ?? '') === text || leaving) return;
    const t = setTimeout(() => onChange({ q: text || undefined, page: 1 }), SEARCH_DEBOUNCE);
    return () => clearTimeout(t);
  }, [text, query.q, onChange, leaving]);

  return (
    <div role="search" aria-label="Filter structures" className="flex flex-wrap items-end gap-3">
      <Labelled label="Search names">
        {(id) => (
          <input id={id} type="search" value={text} onChange={(e) => setText(e.target.value)} placeholder="name or file" className={cx(inputClass, 'w-52')} />
        )}
      </Labelled>
      <Labelled label="Perceived group">
        {(id) => (
          <select id={id} value={query.group ?? ''} onChange={(e) => onChange({ group: e.target.value || undefined, page: 1 })} className={cx(inputClass, 'w-40')}>
            <option value="">All groups</option>
            {batch.groups.map((g) => (
              <option key={g.group} value={g.group}>
                {g.group} ({g.count})
              </option>
            ))}
          </select>
        )}
      </Labelled>
      <Labelled label="Flag">
        {(id) => (
          <select
            id={id}
            value={query.flag ?? ''}
            onChange={(e) => onChange({ flag: (e.target.value || undefined) as StructureListQuery['flag'], page: 1 })}
            className={cx(inputClass, 'w-44')}
          >
            <option value="">Any</option>
            {flagCodes.map((f) => (
              <option key={f} value={f}>
                {FLAG_LABELS[f].label}
              </option>
            ))}
          </select>
        )}
      </Labelled>
      <Labelled label="Review">
        {(id) => (
          <select
            id={id}
            value={query.review ?? ''}
            onChange={(e) => onChange({ review: (e.target.value || undefined) as StructureListQuery['review'], page: 1 })}
            className={cx(inputClass, 'w-36')}
          >
            <option value="">Any</option>
            {(['pending', 'accepted', 'flagged'] as const).map((r) => (
              <option key={r} value={r}>
                {REVIEW_LABELS[r].label}
              </option>
            ))}
          </select>
        )}
      </Labelled>
      <Labelled label="Rows per page">
        {(id) => (
          <select id={id} value={query.pageSize} onChange={(e) => onChange({ pageSize: Number(e.target.value), page: 1 })} className={cx(inputClass, 'w-28')}>
            {[25, 50, 100, 250, 500].map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
        )}
      </Labelled>
    </div>
  );
}

function Labelled({ label, children }: { label: string; children: (id: string) => ReactNode }) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-xs font-medium text-ink-soft">
        {label}
      </label>
      {children(id)}
    </div>
  );
}
