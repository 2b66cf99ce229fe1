import type { Job } from 'bullmq';
import { publicUrl, type Config } from '../../server/config';
import type { Logger } from '../../server/logger';
import type { Mailer } from '../../server/mail/mailer';
import type { BatchRepository } from '../../server/modules/batches/repository';
import type { NotifyJobData } from '../../server/queue/batch-queue';

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** The batch-finished notice: subject and plain text. */
export function noticeText(b: {
  name: string;
  status: string;
  total: number;
  done_count: number;
  clean_count: number;
  over_budget_count: number;
  knife_edge_count: number;
  error_count: number;
  groups: { group: string; count: number }[];
  user_name: string;
  workspace_name: string;
  url: string;
}): { subject: string; text: string } {
  const failed = b.status === 'failed';
  const subject = failed
    ? `Pointfold: batch "${b.name}" failed — no structure could be snapped`
    : `Pointfold: batch "${b.name}" is ready — ${b.done_count} of ${plural(b.total, 'structure')} snapped`;
  const lines = [
    `Hello ${b.user_name},`,
    '',
    failed
      ? `Your batch "${b.name}" in ${b.workspace_name} has finished, but none of its structures could be snapped.`
      : `Your batch "${b.name}" in ${b.workspace_name} has finished.`,
    '',
    `  structures      ${b.total}`,
    `  snapped         ${b.done_count} (${b.clean_count} with no flag)`,
    `  over budget     ${b.over_budget_count}`,
    `  knife edge      ${b.knife_edge_count}`,
    `  errors          ${b.error_count}`,
  ];
  if (b.groups.length > 0) {
    lines.push('', `Point groups: ${b.groups.slice(0, 12).map((g) => `${g.group} ×${g.count}`).join(', ')}${b.groups.length > 12 ? ', …' : ''}`);
  }
  if (b.over_budget_count > 0) {
    lines.push(
      '',
      `${plural(b.over_budget_count, 'structure')} moved more than the displacement budget while being snapped: check ${b.over_budget_count === 1 ? 'it' : 'them'}`,
      'before using the cleaned files. A higher symmetry than the optimizer found may be a saddle point;',
      'confirm it with a frequency calculation.',
    );
  }
  if (b.error_count > 0) lines.push('', `${plural(b.error_count, 'structure')} could not be read or snapped; the batch page says why.`);
  lines.push('', `Open the batch: ${b.url}`, '', '— Pointfold');
  return { subject, text: lines.join('\n') };
}

/**
 * Sends the batch-finished notice to the submitter, once: a batch already notified is skipped
 * (a notice job may be queued twice, by the last result and by the sweeper). SMTP failures
 * throw and are retried with the queue's back-off.
 */
export function createNotifyProcessor(deps: { repo: BatchRepository; mailer: Mailer; config: Config; logger: Logger }) {
  return async function processNotify(job: Job<NotifyJobData>): Promise<{ outcome: string }> {
    const b = await deps.repo.batchForNotice(job.data.batchId);
    if (!b) return { outcome: 'skipped (batch deleted)' };
    if (b.notified_at) return { outcome: 'skipped (already notified)' };
    if (b.status !== 'done' && b.status !== 'failed') return { outcome: `skipped (${b.status})` };
    const url = `${publicUrl(deps.config)}/w/${encodeURIComponent(b.slug)}/batches/${b.id}`;
    const { subject, text } = noticeText({ ...b, url });
    await deps.mailer.send({ to: b.email, subject, text });
    await deps.repo.markNotified(b.id);
    deps.logger.info({ batchId: b.id, to: b.email }, 'batch notice sent');
    return { outcome: 'sent' };
  };
}
