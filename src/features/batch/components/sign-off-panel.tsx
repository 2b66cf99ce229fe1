import { useId, useState } from 'react';
import type { Role } from '@shared/contracts/api';
import { Button } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { InlineError } from '@/components/ui/states';
import { cx } from '@/lib/cx';
import { formatCount, formatDateTime, plural } from '@/lib/format';
import { canReview } from '@/lib/workspace-context';
import { isLive, type BatchDetail } from '../api/get-batch';
import { useSignOffBatch } from '../api/sign-off-batch';

/**
 * Why the batch cannot be signed off yet, or null when it can. Every structure must be decided
 * (accepted or flagged) and the batch must have stopped running.
 */
export function signOffBlocker(batch: Pick<BatchDetail, 'status' | 'counts' | 'signedOffBy'>, role: Role): string | null {
  if (batch.signedOffBy) return 'The batch is already signed off.';
  if (!canReview(role)) return 'Only reviewers and owners can sign off a batch.';
  if (isLive(batch.status)) return 'The batch is still running; sign-off opens when every structure has finished.';
  const undecided = batch.counts.total - batch.counts.accepted - batch.counts.flagged;
  if (undecided > 0) return `${plural(undecided, 'structure')} still ${undecided === 1 ? 'needs' : 'need'} a decision (accept or flag).`;
  return null;
}

/** Review progress of the batch and the sign-off action, disabled with the reason until it is allowed. */
export function SignOffPanel({ slug, batch, role }: { slug: string; batch: BatchDetail; role: Role }) {
  const signOff = useSignOffBatch(slug, batch.id);
  const [comment, setComment] = useState('');
  const commentId = useId();
  const reasonId = useId();
  const blocker = signOffBlocker(batch, role);
  const { total, accepted, flagged } = batch.counts;
  const decided = accepted + flagged;

  return (
    <section aria-labelledby={`${commentId}-h`} className="flex flex-col gap-3 rounded-lg border border-rule bg-card p-4">
      <h2 id={`${commentId}-h`} className="text-sm font-semibold text-ink">
        Review
      </h2>
      <p className="text-sm text-ink-soft">
        <span className="num text-ink">{formatCount(decided)}</span> of <span className="num text-ink">{formatCount(total)}</span> decided ·{' '}
        <span className="num text-moss">{formatCount(accepted)}</span> accepted · <span className="num text-brick">{formatCount(flagged)}</span> flagged
      </p>
      {batch.signedOffBy ? (
        <p className="rounded-md bg-moss-wash px-3 py-2 text-sm text-moss" role="status">
          Signed off by <strong>{batch.signedOffBy.name}</strong> on {formatDateTime(batch.signedOffAt)}.
        </p>
      ) : canReview(role) ? (
        <form
          className="flex flex-col gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!blocker) signOff.mutate(comment);
          }}
        >
          <label htmlFor={commentId} className="text-xs font-medium text-ink-soft">
            Sign-off comment (optional)
          </label>
          <input id={commentId} value={comment} onChange={(e) => setComment(e.target.value)} maxLength={4000} className={cx(inputClass)} />
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={blocker !== null} busy={signOff.isPending} aria-describedby={blocker ? reasonId : undefined}>
              Sign off batch
            </Button>
            {blocker && (
              <p id={reasonId} className="text-sm text-ink-soft">
                {blocker}
              </p>
            )}
          </div>
          {signOff.error && <InlineError>Sign-off failed: {signOff.error.message}</InlineError>}
        </form>
      ) : (
        <p className="text-sm text-ink-soft">Reviewers and owners accept or flag structures and sign off the batch; you can follow their decisions here.</p>
      )}
    </section>
  );
}
