import { cx } from '@/lib/cx';
import { percent } from '@/lib/format';

/**
 * A determinate progress bar (`role="progressbar"`) with an accessible name. `value` of `max`;
 * shows the percentage beside it unless `hideValue`.
 */
export function ProgressBar({
  value,
  max = 100,
  label,
  hideValue = false,
  tone = 'lapis',
  className,
}: {
  value: number;
  max?: number;
  label: string;
  hideValue?: boolean;
  tone?: 'lapis' | 'moss' | 'brick';
  className?: string;
}) {
  const pct = percent(value, max);
  const fill = tone === 'moss' ? 'bg-moss' : tone === 'brick' ? 'bg-brick' : 'bg-lapis';
  return (
    <div className={cx('flex items-center gap-2', className)}>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={max}
        aria-valuenow={Math.min(value, max)}
        aria-valuetext={`${pct}%`}
        className="h-1.5 min-w-16 flex-1 overflow-hidden rounded-full bg-paper-deep"
      >
        <div className={cx('h-full rounded-full transition-[width] duration-500', fill)} style={{ width: `${pct}%` }} />
      </div>
      {!hideValue && <span className="num w-10 text-right text-xs text-ink-soft">{pct}%</span>}
    </div>
  );
}
