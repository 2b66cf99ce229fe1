import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';
import { cx } from '@/lib/cx';

/**
 * A plain, semantic table shell: a card with a caption (for screen readers if `hideCaption`),
 * sticky header, ruled rows. Columns, sorting and rows come from the caller.
 */
export function Table({ caption, hideCaption = false, children, className }: { caption: string; hideCaption?: boolean; children: ReactNode; className?: string }) {
  return (
    <div className={cx('overflow-x-auto rounded-lg border border-rule bg-card', className)}>
      <table className="w-full border-collapse text-sm">
        <caption className={hideCaption ? 'sr-only' : 'px-4 pt-3 text-left font-medium text-ink'}>{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function THead({ children }: { children: ReactNode }) {
  return <thead className="border-b border-rule bg-paper/60 text-left text-xs font-semibold tracking-wide text-ink-soft uppercase">{children}</thead>;
}

export function TBody({ children }: { children: ReactNode }) {
  return <tbody className="divide-y divide-rule/70">{children}</tbody>;
}

export function TR({ className, ...rest }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cx('align-middle', className)} {...rest} />;
}

export function TH({ className, scope = 'col', ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return <th scope={scope} className={cx('px-4 py-2.5 font-semibold', className)} {...rest} />;
}

export function TD({ className, numeric = false, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return <td className={cx('px-4 py-3', numeric && 'num text-right', className)} {...rest} />;
}
