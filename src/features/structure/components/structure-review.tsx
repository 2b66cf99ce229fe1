import { useId, useState } from 'react';
import type { Role, StructureDetail } from '@shared/contracts/api';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { InlineError } from '@/components/ui/states';
import { cx } from '@/lib/cx';
import { formatDateTime } from '@/lib/format';
import { canReview } from '@/lib/workspace-context';
import { useReviewStructure } from '../api/review-structure';

const STATE = {
  pending: { label: 'Pending', tone: 'neutral' },
  accepted: { label: 'Accepted', tone: 'moss' },
  flagged: { label: 'Flagged', tone: 'brick' },
} as const;

/**
 * This structure's review: its state, the decision controls for reviewers and owners (a flag
 * needs a comment saying why), and every decision so far. Chemists see the decisions only.
 */
export function StructureReview({ slug, structure, role }: { slug: string; structure: StructureDetail; role: Role }) {
  const review = useReviewStructure(slug, structure.batchId, structure.id);
  const [comment, setComment] = useState('');
  const commentId = useId();
  const state = STATE[structure.review];
  const events = [...structure.reviews].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
  const decide = (decision: 'accepted' | 'flagged') => review.mutate({ decision, comment }, { onSuccess: () => setComment('') });

  return (
    <section aria-labelledby="review-h" className="flex flex-col gap-3 rounded-lg border border-rule bg-card p-4">
      <div className="flex items-center justify-between gap-2">
        <h2 id="review-h" className="text-sm font-semibold text-ink">
          Review
        </h2>
        <Badge tone={state.tone}>{state.label}</Badge>
      </div>
      {canReview(role) ? (
        <div className="flex flex-col gap-2">
          <label htmlFor={commentId} className="text-xs font-medium text-ink-soft">
            Comment (needed to flag)
          </label>
          <textarea id={commentId} value={comment} onChange={(e) => setComment(e.target.value)} maxLength={4000} rows={2} className={cx(inputClass, 'h-auto py-2')} />
          <div className="flex gap-2">
            <Button variant="secondary" busy={review.isPending && review.variables?.decision === 'accepted'} disabled={review.isPending} onClick={() => decide('accepted')}>
              Accept
            </Button>
            <Button
              variant="danger"
              busy={review.isPending && review.variables?.decision === 'flagged'}
              disabled={review.isPending || !comment.trim()}
              onClick={() => decide('flagged')}
            >
              Flag
            </Button>
          </div>
          {!comment.trim() && <p className="text-xs text-ink-faint">Write a comment to flag: say what the submitter should check.</p>}
          {review.error && <InlineError>Decision not saved: {review.error.message}</InlineError>}
        </div>
      ) : (
        <p className="text-xs text-ink-soft">
          Reviewers and owners accept or flag structures; you can read their decisions here.
        </p>
      )}
      {events.length === 0 ? (
        <p className="text-sm text-ink-soft">No decisions yet.</p>
      ) : (
        <ol aria-label="Decisions on this structure" className="flex flex-col divide-y divide-rule/70 text-sm">
          {events.map((e) => (
            <li key={e.id} className="flex flex-col gap-0.5 py-1.5">
              <span className="flex flex-wrap items-baseline gap-2">
                <span className="font-medium">{e.decision === 'accepted' ? 'Accepted' : e.decision === 'flagged' ? 'Flagged' : 'Signed off'}</span>
                <span className="text-ink-soft">by {e.reviewer.name}</span>
                <time dateTime={e.createdAt} className="num text-xs text-ink-faint">
                  {formatDateTime(e.createdAt)}
                </time>
              </span>
              {e.comment && <q className="text-ink-soft">{e.comment}</q>}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
