import type * as z from 'zod';
import type { batchStatusSchema, structureStatusSchema } from '@shared/contracts/api';
import { cx } from '@/lib/cx';

type Status = z.infer<typeof batchStatusSchema> | z.infer<typeof structureStatusSchema>;

const look: Record<Status, { label: string; className: string; dot: string }> = {
  queued: { label: 'Queued', className: 'bg-paper-deep text-ink-soft', dot: 'bg-ink-faint' },
  running: { label: 'Running', className: 'bg-lapis-wash text-lapis-deep', dot: 'bg-lapis animate-pulse' },
  done: { label: 'Done', className: 'bg-moss-wash text-moss', dot: 'bg-moss' },
  failed: { label: 'Failed', className: 'bg-brick-wash text-brick', dot: 'bg-brick' },
  error: { label: 'Error', className: 'bg-brick-wash text-brick', dot: 'bg-brick' },
  cancelled: { label: 'Cancelled', className: 'bg-paper-deep text-ink-soft', dot: 'bg-ink-faint' },
};

/** Status of a batch or structure: a word with a dot; the word carries the meaning. */
export function StatusPill({ status, className }: { status: Status; className?: string }) {
  const { label, className: tone, dot } = look[status];
  return (
    <span className={cx('inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-xs font-medium', tone, className)}>
      <span aria-hidden className={cx('size-1.5 rounded-full', dot)} />
      {label}
    </span>
  );
}
