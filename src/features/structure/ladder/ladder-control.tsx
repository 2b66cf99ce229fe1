import type { LadderRungJson } from '@shared/contracts/structure';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { GroupBadge } from '@/components/ui/group-badge';
import { cx } from '@/lib/cx';
import { formatAngstrom } from '@/lib/format';
import { formatTolerance } from './ladder-data';

/**
 * The ladder as a list of rungs to choose from: each group with the tolerances it holds over
 * and what snapping to it costs; the chosen group is marked, any other rung can be picked
 * (re-snap to that group).
 */
export function LadderControl({
  ladder,
  chosen,
  tolerance,
  budget,
  canResnap,
  pending,
  onPick,
}: {
  ladder: LadderRungJson[];
  /** The group the structure is snapped to now (result.pointGroup). */
  chosen: string;
  /** The tolerance the structure was perceived at, Å. */
  tolerance: number;
  /** Displacement budget, Å: rungs costing more are marked. */
  budget: number;
  canResnap: boolean;
  /** Group of a re-snap on its way, if any. */
  pending: string | null;
  onPick: (group: string) => void;
}) {
  if (ladder.length === 0) return <p className="text-sm text-ink-soft">No ladder was computed for this structure.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">Ladder rungs: group, tolerance range, cost of snapping, and an action to re-snap</caption>
        <thead className="border-b border-rule text-left text-xs font-semibold text-ink-soft">
          <tr>
            <th scope="col" className="px-2 py-2">Group</th>
            <th scope="col" className="px-2 py-2">Tolerance (Å)</th>
            <th scope="col" className="px-2 py-2 text-right">Displ. RMSD</th>
            <th scope="col" className="px-2 py-2 text-right">Max displ.</th>
            <th scope="col" className="px-2 py-2">
              <span className="sr-only">Action</span>
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-rule/70">
          {ladder.map((rung, i) => {
            const isChosen = rung.group === chosen;
            const holdsTolerance = tolerance >= rung.fromTolerance && tolerance < rung.toTolerance;
            const overBudget = rung.maxDisplacement > budget;
            return (
              <tr key={`${rung.group}-${i}`} aria-current={isChosen ? 'true' : undefined} className={cx(isChosen && 'bg-saffron-wash')}>
                <th scope="row" className="px-2 py-2 text-left font-normal">
                  <span className="flex flex-wrap items-center gap-1.5">
                    <GroupBadge group={rung.group} />
                    <span className="num text-xs text-ink-faint">order {rung.order === 0 ? '∞' : rung.order}</span>
                    {isChosen && <Badge tone="saffron">chosen</Badge>}
                    {holdsTolerance && <Badge tone="lapis">at your tolerance</Badge>}
                  </span>
                </th>
                <td className="num px-2 py-2 whitespace-nowrap">
                  {formatTolerance(rung.fromTolerance)} – {formatTolerance(rung.toTolerance)}
                </td>
                <td className="num px-2 py-2 text-right whitespace-nowrap">{formatAngstrom(rung.displacementRmsd)}</td>
                <td className={cx('num px-2 py-2 text-right whitespace-nowrap', overBudget && 'text-ochre')}>
                  {formatAngstrom(rung.maxDisplacement)}
                  {overBudget && <span className="sr-only"> (over the budget)</span>}
                  {overBudget && <span aria-hidden> ▲</span>}
                </td>
                <td className="px-2 py-2 text-right">
                  {isChosen ? (
                    <span className="text-xs text-ink-soft">current</span>
                  ) : (
                    <Button
                      size="sm"
                      variant="secondary"
                      disabled={!canResnap || pending !== null}
                      busy={pending === rung.group}
                      onClick={() => onPick(rung.group)}
                    >
                      Snap to {rung.group}
                    </Button>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-xs text-ink-soft">
        ▲ costs more than the displacement budget of <span className="num">{formatAngstrom(budget, 3)}</span>.
        {!canResnap && ' Only owners and chemists can re-snap.'}
      </p>
    </div>
  );
}
