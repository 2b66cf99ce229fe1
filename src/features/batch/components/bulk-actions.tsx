import { useId, useState } from 'react';
import type { TargetPolicy } from '@shared/contracts/settings';
import { Button } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { InlineError } from '@/components/ui/states';
import { cx } from '@/lib/cx';
import { plural } from '@/lib/format';
import { canReview, canWrite } from '@/lib/workspace-context';
import type { Role } from '@shared/contracts/api';
import { useResnapStructures } from '../api/resnap-structures';
import { useReviewStructures } from '../api/review-structures';

type TargetKind = TargetPolicy['kind'];
const GROUP_PATTERN = /^[A-Za-z][A-Za-z0-9∞]{0,7}$/;

/**
 * Actions on the selected structures: re-snap to another target (owners, chemists) and accept
 * or flag with one comment (owners, reviewers). Shown above the table while rows are selected.
 */
export function BulkActions({
  slug,
  batchId,
  role,
  selectedIds,
  groups,
  onDone,
}: {
  slug: string;
  batchId: string;
  role: Role;
  selectedIds: string[];
  groups: string[];
  onDone: (message: string) => void;
}) {
  const count = selectedIds.length;
  const resnap = useResnapStructures(slug, batchId);
  const review = useReviewStructures(slug, batchId);
  const [kind, setKind] = useState<TargetKind>('perceived');
  const [group, setGroup] = useState('');
  const [comment, setComment] = useState('');
  const ids = { kind: useId(), group: useId(), comment: useId(), groups: useId() };

  const groupValid = kind !== 'group' || GROUP_PATTERN.test(group.trim());
  const target: TargetPolicy = kind === 'group' ? { kind, group: group.trim() } : { kind };
  const targetWords = kind === 'group' ? group.trim() || 'a group' : kind === 'computational' ? 'the computational subgroup' : 'the perceived group';

  if (count === 0) return null;
  return (
    <section aria-label="Actions on selected structures" className="flex flex-wrap items-end gap-x-6 gap-y-3 rounded-lg border border-lapis/30 bg-lapis-wash/50 px-4 py-3">
      <p className="self-center text-sm font-medium text-ink" aria-live="polite">
        {plural(count, 'structure')} selected
      </p>
      {canWrite(role) && (
        <form
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!groupValid) return;
            resnap.mutate(
              { structureIds: selectedIds, target },
              { onSuccess: () => onDone(`Re-snap to ${targetWords} queued for ${plural(count, 'structure')}.`) },
            );
          }}
        >
          <div className="flex flex-col gap-1">
            <label htmlFor={ids.kind} className="text-xs font-medium text-ink-soft">
              Re-snap target
            </label>
            <select id={ids.kind} value={kind} onChange={(e) => setKind(e.target.value as TargetKind)} className={cx(inputClass, 'w-52')}>
              <option value="perceived">Perceived group</option>
              <option value="computational">Computational subgroup</option>
              <option value="group">A named group…</option>
            </select>
          </div>
          {kind === 'group' && (
            <div className="flex flex-col gap-1">
              <label htmlFor={ids.group} className="text-xs font-medium text-ink-soft">
                Group (Schoenflies)
              </label>
              <input
                id={ids.group}
                value={group}
                onChange={(e) => setGroup(e.target.value)}
                list={ids.groups}
                placeholder="C2v"
                aria-invalid={!groupValid && group !== '' ? true : undefined}
                className={cx(inputClass, 'num w-28')}
              />
              <datalist id={ids.groups}>
                {groups.map((g) => (
                  <option key={g} value={g} />
                ))}
              </datalist>
            </div>
          )}
          <Button type="submit" variant="secondary" busy={resnap.isPending} disabled={!groupValid || (kind === 'group' && !group.trim())}>
            Re-snap {plural(count, 'structure')}
          </Button>
        </form>
      )}
      {canReview(role) && (
        <div className="flex flex-wrap items-end gap-2">
          <div className="flex flex-col gap-1">
            <label htmlFor={ids.comment} className="text-xs font-medium text-ink-soft">
              Review comment
            </label>
            <input id={ids.comment} value={comment} onChange={(e) => setComment(e.target.value)} maxLength={4000} placeholder="optional for accept" className={cx(inputClass, 'w-64')} />
          </div>
          <Button
            variant="secondary"
            busy={review.isPending && review.variables?.decision === 'accepted'}
            disabled={review.isPending}
            onClick={() =>
              review.mutate(
                { structureIds: selectedIds, decision: 'accepted', comment },
                { onSuccess: () => { setComment(''); onDone(`Accepted ${plural(count, 'structure')}.`); } },
              )
            }
          >
            Accept {count}
          </Button>
          <Button
            variant="danger"
            busy={review.isPending && review.variables?.decision === 'flagged'}
            disabled={review.isPending || !comment.trim()}
            title={comment.trim() ? undefined : 'Say why in the comment to flag'}
            onClick={() =>
              review.mutate(
                { structureIds: selectedIds, decision: 'flagged', comment },
                { onSuccess: () => { setComment(''); onDone(`Flagged ${plural(count, 'structure')}.`); } },
              )
            }
          >
            Flag {count}
          </Button>
        </div>
      )}
      {!canWrite(role) && !canReview(role) && <p className="text-sm text-ink-soft">Your role can view these structures but not change them.</p>}
      {resnap.error && <InlineError>Re-snap failed: {resnap.error.message}</InlineError>}
      {review.error && <InlineError>Review failed: {review.error.message}</InlineError>}
    </section>
  );
}
