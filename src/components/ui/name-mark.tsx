import { cx } from '@/lib/cx';
import { FoldGlyph } from './states';

/** Pointfold's name mark: the folded-square glyph and the word. */
export function NameMark({ className, compact = false }: { className?: string; compact?: boolean }) {
  return (
    <span className={cx('inline-flex items-center gap-2 text-ink', className)}>
      <FoldGlyph className="size-7 shrink-0" />
      {!compact && (
        <span className="text-lg font-semibold tracking-tight">
          point<span className="text-lapis">fold</span>
        </span>
      )}
      {compact && <span className="sr-only">Pointfold</span>}
    </span>
  );
}
