import { cx } from '@/lib/cx';
import { splitGroup, spokenGroup } from '@/lib/format';

/**
 * A point group in Schoenflies notation with its subscript: C<sub>2v</sub>, D<sub>∞h</sub>, T<sub>d</sub>.
 * `plain` drops the chip (for running text); `count` adds "× n" after it.
 */
export function GroupSymbol({ group, className }: { group: string; className?: string }) {
  const { letter, subscript } = splitGroup(group);
  return (
    <span className={cx('whitespace-nowrap', className)} aria-label={spokenGroup(group)} role="img">
      <span aria-hidden>
        <i>{letter}</i>
        {subscript && <sub className="text-[0.72em] not-italic">{subscript}</sub>}
      </span>
    </span>
  );
}

export function GroupBadge({ group, count, className }: { group: string | null | undefined; count?: number; className?: string }) {
  if (!group) return <span className="text-ink-soft">—</span>;
  return (
    <span
      className={cx(
        'inline-flex items-baseline gap-1 rounded border border-lapis/25 bg-lapis-wash px-1.5 py-px text-[0.95rem] font-medium text-lapis-deep',
        className,
      )}
    >
      <GroupSymbol group={group} />
      {count !== undefined && <span className="num text-xs text-ink-soft">×{count}</span>}
    </span>
  );
}
