import { lazy, Suspense, useEffect, useId, useState } from 'react';
import { Link } from 'react-router-dom';
import type { StructureDetail } from '@shared/contracts/api';
import type { StructureResult } from '@shared/contracts/structure';
import { allowedTargets } from '@shared/engine';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { inputClass } from '@/components/ui/field';
import { focusRing } from '@/components/ui/focus';
import { GroupBadge } from '@/components/ui/group-badge';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { EmptyState, ErrorState, InlineError } from '@/components/ui/states';
import { StatusPill } from '@/components/ui/status-pill';
import { cx } from '@/lib/cx';
import { formatAngstrom, formatDecimal } from '@/lib/format';
import { canWrite, useCurrentWorkspace } from '@/lib/workspace-context';
import { isLive, useStructure } from '../api/get-structure';
import { useResnapStructure } from '../api/resnap-structure';
import { LadderControl } from '../ladder/ladder-control';
import { ViewerPanel } from '../viewer/viewer-panel';
import { Cautions } from './cautions';
import { Downloads } from './downloads';
import { AtomTable, EquivalenceClasses, OperationsTable } from './result-tables';
import { StructureReview } from './structure-review';

const LadderChart = lazy(() => import('../ladder/ladder-chart').then((m) => ({ default: m.LadderChart })));

/** /w/:slug/structures/:structureId — one structure: cautions, 3D view, ladder, operations, atoms, downloads, review. */
export function StructurePage({ slug, structureId }: { slug: string; structureId: string }) {
  const { role } = useCurrentWorkspace();
  const structure = useStructure(slug, structureId);
  // While a re-snap runs the API has no result; keep showing the previous one (labelled as such).
  const [previous, setPrevious] = useState<StructureResult | null>(structure.result);
  useEffect(() => {
    if (structure.result) setPrevious(structure.result);
  }, [structure.result]);
  const result = structure.result ?? (isLive(structure.status) ? previous : null);
  const budget = structure.settings.displacementBudget;
  const batchLink = `/w/${encodeURIComponent(slug)}/batches/${encodeURIComponent(structure.batchId)}`;

  return (
    <div className="mx-auto flex max-w-[1400px] flex-col gap-5 px-6 py-6">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link to={batchLink} className={cx('text-lapis hover:underline', focusRing)}>
          ← Back to the batch
        </Link>
      </nav>
      <PageHeader
        eyebrow="Structure"
        title={structure.name}
        description={
          <span className="flex flex-wrap items-center gap-2">
            <StatusPill status={structure.status} />
            <span className="num">{structure.formula ?? '—'}</span>
            <span>
              · {structure.sourceFile}
              {structure.frameIndex > 0 && ` frame ${structure.frameIndex + 1}`} · {structure.atomCount} atoms · charge {structure.charge}
              {structure.multiplicity !== null && `, multiplicity ${structure.multiplicity}`}
            </span>
          </span>
        }
        actions={result && <GroupSummary result={result} />}
      />

      {isLive(structure.status) && (
        <p role="status" className="flex items-center gap-2 rounded-lg border border-lapis/30 bg-lapis-wash px-4 py-3 text-sm text-lapis-deep">
          <Spinner label={structure.status === 'queued' ? 'Waiting for a worker' : 'Snapping'} />
          <span>This page updates by itself when the snap is done{result && '; what follows is the previous result'}.</span>
        </p>
      )}

      {structure.status === 'error' && !result && (
        <ErrorState title="This structure could not be snapped" message={structure.error ?? 'The worker reported an error without a message.'} />
      )}
      {structure.status === 'cancelled' && !result && <EmptyState title="Cancelled">The batch was cancelled before this structure was snapped. Re-snap it from the batch page.</EmptyState>}
      {!result && isLive(structure.status) && <EmptyState title="No result yet">The 3D view, the ladder and the tables appear when the snap is done.</EmptyState>}

      {result && (
        <>
          <Cautions result={result} budget={budget} />
          <Metrics result={result} budget={budget} />
          <ViewerPanel result={result} inputAtoms={structure.inputAtoms} />
          <LadderSection slug={slug} structure={structure} result={result} canResnap={canWrite(role)} />
          <div className="grid gap-4 lg:grid-cols-[3fr_2fr]">
            <OperationsTable result={result} />
            <EquivalenceClasses result={result} />
          </div>
          <AtomTable result={result} budget={budget} />
        </>
      )}

      <div className="grid gap-4 lg:grid-cols-2">
        <StructureReview slug={slug} structure={structure} role={role} />
        {result ? <Downloads structureId={structure.id} /> : <div />}
      </div>
    </div>
  );
}

function GroupSummary({ result }: { result: StructureResult }) {
  const changed = result.pointGroup !== result.perceivedGroup;
  return (
    <dl className="flex items-end gap-5 text-sm">
      <div className="flex flex-col items-start">
        <dt className="text-xs text-ink-soft">Perceived</dt>
        <dd>
          <GroupBadge group={result.perceivedGroup} className="text-lg" />
        </dd>
      </div>
      <div className="flex flex-col items-start">
        <dt className="text-xs text-ink-soft">Snapped to</dt>
        <dd className="flex items-center gap-1">
          <GroupBadge group={result.pointGroup} className="text-lg" />
          {changed && <Badge tone="saffron">chosen</Badge>}
        </dd>
      </div>
      <div className="flex flex-col items-start">
        <dt className="text-xs text-ink-soft">Computational subgroup</dt>
        <dd className="flex items-center gap-1">
          <GroupBadge group={result.computationalSubgroup} />
          {result.computationalSubgroupAlternatives.length > 0 && (
            <span className="text-xs text-ink-faint">or {result.computationalSubgroupAlternatives.join(', ')}</span>
          )}
        </dd>
      </div>
    </dl>
  );
}

function Metrics({ result, budget }: { result: StructureResult; budget: number }) {
  const items: Array<[string, string, boolean?]> = [
    ['Order', result.order === 0 ? '∞' : String(result.order)],
    ['Symmetry number σ', String(result.rotationalSymmetryNumber)],
    ['Tolerance', formatAngstrom(result.tolerance)],
    ['Sym. RMSD before', formatAngstrom(result.symmetryRmsdBefore)],
    ['Sym. RMSD after', formatAngstrom(result.symmetryRmsdAfter)],
    ['Displacement RMSD', formatAngstrom(result.displacementRmsd)],
    ['Max displacement', formatAngstrom(result.maxDisplacement), result.maxDisplacement > budget],
    ['Budget', formatAngstrom(budget, 3)],
    ['CSM', formatDecimal(result.csm, 4)],
    ['Frame', result.frame === 'standard' ? 'standard' : 'input'],
  ];
  return (
    <section aria-label="Measures" className="rounded-lg border border-rule bg-card px-4 py-3">
      <dl className="grid grid-cols-2 gap-x-6 gap-y-2 sm:grid-cols-5">
        {items.map(([label, value, warn]) => (
          <div key={label} className="flex flex-col">
            <dt className="text-xs text-ink-soft">{label}</dt>
            <dd className={cx('num text-base', warn ? 'font-semibold text-ochre' : 'text-ink')}>{value}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2 text-xs text-ink-faint">Engine {result.engineVersion}</p>
    </section>
  );
}

function LadderSection({ slug, structure, result, canResnap }: { slug: string; structure: StructureDetail; result: StructureResult; canResnap: boolean }) {
  const resnap = useResnapStructure(slug, structure.batchId, structure.id);
  const [queued, setQueued] = useState<string | null>(null);
  const live = isLive(structure.status);
  const pending = resnap.isPending ? (resnap.variables ?? null) : live ? (queued ?? '') : null;
  const pick = (group: string) => resnap.mutate(group, { onSuccess: () => setQueued(group) });
  // Any subgroup of the perceived group is allowed too (the same rule the server applies).
  const onLadder = new Set(result.ladder.map((r) => r.group));
  const others = allowedTargets(result).filter((g) => !onLadder.has(g) && g !== result.pointGroup);
  return (
    <section aria-labelledby="ladder-h" className="flex flex-col gap-3 rounded-lg border border-rule bg-card p-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="ladder-h" className="text-sm font-semibold text-ink">
          Ladder: the group at each tolerance, and what snapping to it costs
        </h2>
        <span className="text-xs text-ink-faint">pick another rung to re-snap this structure to that group</span>
      </div>
      <div className="grid gap-4 2xl:grid-cols-2">
        <div className="h-60 min-w-0">
          {result.ladder.length > 0 && (
            <Suspense fallback={<Spinner label="Loading the chart" />}>
              <LadderChart ladder={result.ladder} chosen={result.pointGroup} tolerance={result.tolerance} />
            </Suspense>
          )}
        </div>
        <div className="flex flex-col gap-3">
          <LadderControl
            ladder={result.ladder}
            chosen={result.pointGroup}
            tolerance={result.tolerance}
            budget={structure.settings.displacementBudget}
            canResnap={canResnap}
            pending={pending}
            onPick={pick}
          />
          {others.length > 0 && <SubgroupPicker groups={others} disabled={!canResnap || pending !== null} onPick={pick} />}
        </div>
      </div>
      {queued && live && <p role="status" className="text-sm text-lapis-deep">Re-snap to {queued} queued; this page updates when it is done.</p>}
      {queued && !live && result.pointGroup === queued && <p role="status" className="text-sm text-moss">Re-snapped to {queued}.</p>}
      {resnap.error && <InlineError>Re-snap failed: {resnap.error.message}</InlineError>}
    </section>
  );
}

/** Snap to a subgroup of the perceived group that is not on the ladder. */
function SubgroupPicker({ groups, disabled, onPick }: { groups: string[]; disabled: boolean; onPick: (group: string) => void }) {
  const id = useId();
  const [group, setGroup] = useState(groups[0]);
  return (
    <form
      className="flex flex-wrap items-end gap-2 border-t border-rule pt-3"
      onSubmit={(e) => {
        e.preventDefault();
        onPick(group);
      }}
    >
      <div className="flex flex-col gap-1">
        <label htmlFor={id} className="text-xs font-medium text-ink-soft">
          Or a subgroup of the perceived group
        </label>
        <select id={id} value={group} onChange={(e) => setGroup(e.target.value)} className={cx(inputClass, 'w-36')}>
          {groups.map((g) => (
            <option key={g} value={g}>
              {g}
            </option>
          ))}
        </select>
      </div>
      <Button type="submit" variant="secondary" disabled={disabled}>
        Snap to {group}
      </Button>
    </form>
  );
}
