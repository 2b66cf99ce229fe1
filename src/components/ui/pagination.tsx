import { formatCount } from '@/lib/format';
import { Button } from './button';

/** Previous / next over a server-paginated list, with "41–60 of 312". */
export function Pagination({
  page,
  pageSize,
  total,
  onPage,
  label = 'Pages',
}: {
  page: number;
  pageSize: number;
  total: number;
  onPage: (page: number) => void;
  label?: string;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <nav aria-label={label} className="flex items-center justify-between gap-4 text-sm text-ink-soft">
      <span className="num">
        {formatCount(from)}–{formatCount(to)} of {formatCount(total)}
      </span>
      <div className="flex gap-2">
        <Button variant="secondary" size="sm" disabled={page <= 1} onClick={() => onPage(page - 1)}>
          Previous
        </Button>
        <Button variant="secondary" size="sm" disabled={page >= pages} onClick={() => onPage(page + 1)}>
          Next
        </Button>
      </div>
    </nav>
  );
}
