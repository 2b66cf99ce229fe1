import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

/** What a list shows when it has nothing yet: a sentence, and the next step if there is one. */
export function EmptyState({ title, children, action, className }: { title: string; children?: ReactNode; action?: ReactNode; className?: string }) {
  return (
    <div className={cx('flex flex-col items-center gap-3 rounded-lg border border-dashed border-rule bg-card/60 px-6 py-12 text-center', className)}>
      <FoldGlyph className="size-9 opacity-60" />
      <h2 className="text-base font-semibold text-ink">{title}</h2>
      {children && <div className="max-w-md text-sm text-ink-soft">{children}</div>}
      {action}
    </div>
  );
}

/** A failure the user should read: what went wrong, in one line, and a way out. */
export function ErrorState({ title = 'Something went wrong', message, action, className }: { title?: string; message: string; action?: ReactNode; className?: string }) {
  return (
    <div role="alert" className={cx('flex flex-col items-start gap-2 rounded-lg border border-brick/30 bg-brick-wash px-5 py-4', className)}>
      <h2 className="text-sm font-semibold text-brick">{title}</h2>
      <p className="text-sm text-ink">{message}</p>
      {action}
    </div>
  );
}

/** An inline error line under a form or beside an action. */
export function InlineError({ children }: { children: ReactNode }) {
  return (
    <p role="alert" className="text-sm text-brick">
      {children}
    </p>
  );
}

/** The folded-square glyph of the name mark, on its own (decorative). */
export function FoldGlyph({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden className={className} fill="none">
      {/* A square sheet with its top-right corner folded onto the diagonal: symmetry by folding. */}
      <path d="M4 4h16l8 8v16H4z" fill="var(--color-lapis)" />
      <path d="M20 4v8h8z" fill="var(--color-saffron)" />
      <path d="M4 28L20 12" stroke="var(--color-paper)" strokeWidth="1.5" strokeDasharray="2 2.5" opacity="0.75" />
    </svg>
  );
}
