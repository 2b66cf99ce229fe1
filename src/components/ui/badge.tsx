import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

export type BadgeTone = 'neutral' | 'lapis' | 'moss' | 'ochre' | 'brick' | 'saffron';

const tones: Record<BadgeTone, string> = {
  neutral: 'bg-paper-deep text-ink-soft',
  lapis: 'bg-lapis-wash text-lapis-deep',
  moss: 'bg-moss-wash text-moss',
  ochre: 'bg-ochre-wash text-ochre',
  brick: 'bg-brick-wash text-brick',
  saffron: 'bg-saffron-wash text-ochre',
};

/** A small label. Colour is never the only carrier of meaning: the text says it too. */
export function Badge({ tone = 'neutral', className, children, title }: { tone?: BadgeTone; className?: string; children: ReactNode; title?: string }) {
  return (
    <span title={title} className={cx('inline-flex items-center gap-1 rounded px-1.5 py-0.5 text-xs font-medium leading-5', tones[tone], className)}>
      {children}
    </span>
  );
}
