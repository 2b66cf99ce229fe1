import { Link } from 'react-router-dom';
import type { BatchSummary } from '@shared/contracts/api';
import { GroupBadge } from '@/components/ui/group-badge';
import { ProgressBar } from '@/components/ui/progress-bar';
import { StatusPill } from '@/components/ui/status-pill';
import { Table, TBody, TD, TH, THead, TR } from '@/components/ui/table';
import { focusRing } from '@/components/ui/focus';
import { cx } from '@/lib/cx';
import { formatCount, formatDateTime, formatRelative } from '@/lib/format';

const MAX_GROUPS_SHOWN = 4;

/**
 * The workspace's batches: name, submitter, created, status (with live progress while queued
 * or running), structures by outcome, and the point groups found. Purely presentational.
 */
export function BatchesTable({ batches, batchHref, now }: { batches: BatchSummary[]; batchHref: (id: string) => string; now?: number }) {
  return (
    <Table caption="Batches in this workspace" hideCaption>
      <THead>
        <TR>
          <TH>Batch</TH>
          <TH>Submitted by</TH>
          <TH>Created</TH>
          <TH className="w-44">Status</TH>
          <TH>Outcome</TH>
          <TH>Groups found</TH>
        </TR>
      </THead>
      <TBody>
        {batches.map((batch) => (
          <BatchRow key={batch.id} batch={batch} href={batchHref(batch.id)} now={now} />
        ))}
      </TBody>
    </Table>
  );
}

function BatchRow({ batch, href, now }: { batch: BatchSummary; href: string; now?: number }) {
  const live = batch.status === 'queued' || batch.status === 'running';
  const { counts } = batch;
  return (
    <TR className="hover:bg-paper/50">
      <TD className="max-w-72">
        <Link to={href} className={cx('block truncate font-medium text-lapis-deep underline-offset-2 hover:underline', focusRing)}>
          {batch.name}
        </Link>
        <div className="num text-xs text-ink-soft">{formatCount(counts.total)} structures</div>
      </TD>
      <TD className="whitespace-nowrap text-ink-soft">{batch.submitter.name}</TD>
      <TD className="whitespace-nowrap text-ink-soft">
        <time dateTime={batch.createdAt} title={formatDateTime(batch.createdAt)}>
          {formatRelative(batch.createdAt, now)}
        </time>
      </TD>
      <TD>
        <div className="flex flex-col gap-1.5">
          <StatusPill status={batch.status} className="self-start" />
          {live && (
            <ProgressBar
              value={counts.done + counts.error}
              max={Math.max(counts.total, 1)}
              label={`Progress of ${batch.name}`}
            />
          )}
        </div>
      </TD>
      <TD>
        <OutcomeCounts counts={counts} batchName={batch.name} />
      </TD>
      <TD>
        <GroupList groups={batch.groups} />
      </TD>
    </TR>
  );
}

const outcomes = [
  { key: 'clean', label: 'clean', dot: 'bg-moss' },
  { key: 'overBudget', label: 'over budget', dot: 'bg-ochre' },
  { key: 'knifeEdge', label: 'knife edge', dot: 'bg-saffron' },
  { key: 'error', label: 'error', dot: 'bg-brick' },
] as const;

/** Counts of structures by outcome, as a small description list (zeros muted, still shown). */
export function OutcomeCounts({ counts, batchName }: { counts: BatchSummary['counts']; batchName: string }) {
  return (
    <dl aria-label={`Outcome of ${batchName}`} className="grid grid-cols-[auto_auto] gap-x-2 gap-y-0.5 text-xs whitespace-nowrap">
      {outcomes.map(({ key, label, dot }) => {
        const value = counts[key];
        return (
          <div key={key} className={cx('contents', value === 0 && 'text-ink-soft')}>
            <dt className="flex items-center gap-1.5">
              <span aria-hidden className={cx('size-1.5 rounded-full', value === 0 ? 'bg-rule' : dot)} />
              {label}
            </dt>
            <dd className="num text-right">{formatCount(value)}</dd>
          </div>
        );
      })}
    </dl>
  );
}

function GroupList({ groups }: { groups: BatchSummary['groups'] }) {
  if (groups.length === 0) return <span className="text-xs text-ink-soft">none yet</span>;
  const shown = groups.slice(0, MAX_GROUPS_SHOWN);
  const rest = groups.length - shown.length;
  return (
    <ul aria-label="Point groups found" className="flex max-w-80 min-w-52 flex-wrap gap-1">
      {shown.map((g) => (
        <li key={g.group}>
          <GroupBadge group={g.group} count={g.count} />
        </li>
      ))}
      {rest > 0 && <li className="self-center text-xs text-ink-soft">+{rest} more</li>}
    </ul>
  );
}
