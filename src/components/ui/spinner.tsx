import { cx } from '@/lib/cx';

/** An indeterminate wait, announced politely to screen readers. */
export function Spinner({ label = 'Loading', className }: { label?: string; className?: string }) {
  return (
    <span role="status" className={cx('inline-flex items-center gap-2 text-sm text-ink-soft', className)}>
      <span aria-hidden className="size-4 animate-spin rounded-full border-2 border-lapis border-r-transparent" />
      <span>{label}…</span>
    </span>
  );
}

/** A spinner centred in a page-sized area, for Suspense fallbacks. */
export function PageSpinner({ label = 'Loading' }: { label?: string }) {
  return (
    <div className="flex min-h-48 items-center justify-center">
      <Spinner label={label} />
    </div>
  );
}
