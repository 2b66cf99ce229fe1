import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { focusRing } from '@/components/ui/focus';
import { cx } from '@/lib/cx';
import { formatDateTime } from '@/lib/format';
import { useBatchReviews, type ReviewEvent } from '../api/get-batch-reviews';

const DECISION: Record<ReviewEvent['decision'], { label: string; tone: 'moss' | 'brick' | 'lapis' }> = {
  accepted: { label: 'Accepted', tone: 'moss' },
  flagged: { label: 'Flagged', tone: 'brick' },
  'signed-off': { label: 'Signed off', tone: 'lapis' },
};
const STEP = 20;

/** The batch's review history: every decision with its reviewer, comment and time, newest first. */
export function ReviewHistory({ slug, batchId, names }: { slug: string; batchId: string; names: Map<string, string> }) {
  const events = useBatchReviews(slug, batchId);
  const [shown, setShown] = useState(STEP);
  const sorted = [...events].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
  return (
    <section aria-labelledby="review-history-h" className="flex flex-col gap-2 rounded-lg border border-rule bg-card p-4">
      <h2 id="review-history-h" className="text-sm font-semibold text-ink">
        Review history
      </h2>
      {sorted.length === 0 ? (
        <p className="text-sm text-ink-soft">No decisions yet.</p>
      ) : (
        <ol className="flex flex-col divide-y divide-rule/70 text-sm">
          {sorted.slice(0, shown).map((e) => (
            <li key={e.id} className="flex flex-wrap items-baseline gap-x-2 gap-y-0.5 py-1.5">
              <Badge tone={DECISION[e.decision].tone}>{DECISION[e.decision].label}</Badge>
              {e.structureId ? (
                <Link to={`/w/${encodeURIComponent(slug)}/structures/${encodeURIComponent(e.structureId)}`} className={cx('text-lapis hover:underline', focusRing)}>
                  {names.get(e.structureId) ?? 'structure'}
                </Link>
              ) : (
                <span className="font-medium">the batch</span>
              )}
              <span className="text-ink-soft">by {e.reviewer.name}</span>
              <time dateTime={e.createdAt} className="num text-xs text-ink-faint">
                {formatDateTime(e.createdAt)}
              </time>
              {e.comment && <q className="basis-full text-ink-soft">{e.comment}</q>}
            </li>
          ))}
        </ol>
      )}
      {sorted.length > shown && (
        <Button variant="quiet" size="sm" className="self-start" onClick={() => setShown((n) => n + STEP)}>
          Show {Math.min(STEP, sorted.length - shown)} more of {sorted.length - shown}
        </Button>
      )}
    </section>
  );
}
