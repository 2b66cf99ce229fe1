import type * as z from 'zod';
import type { reviewEventSchema, reviewRequestSchema } from '@shared/contracts/api';
import { DomainError, notFound } from '../../errors';
import { recordAudit } from '../audit/service';
import type { BatchRepository } from '../batches/repository';
import { toBatchDetail } from '../batches/service';
import { createTemplateRepository } from '../templates/repository';
import { assertRole, REVIEWERS, UUID_PATTERN, type WorkspaceAccess } from '../workspaces/access';
import { ReviewEvent } from './entity';

type ReviewEventJson = z.infer<typeof reviewEventSchema>;

/**
 * Review decisions: reviewers (and owners) accept or flag structures with a comment, then sign
 * the batch off once every structure is decided. Events are appended, never edited; a
 * structure's `review` column mirrors its latest decision for filtering and counts.
 */
export function createReviewService(deps: { repo: BatchRepository }) {
  const { repo } = deps;
  const ds = repo.dataSource;
  const templateRepo = createTemplateRepository(ds);

  async function scopedBatch(access: WorkspaceAccess, id: string) {
    const batch = UUID_PATTERN.test(id) ? await repo.findBatchInWorkspace(id, access.workspace.id) : null;
    if (!batch) throw notFound('No such batch');
    return batch;
  }

  return {
    async record(access: WorkspaceAccess, userId: string, batchId: string, body: z.infer<typeof reviewRequestSchema>) {
      assertRole(access, REVIEWERS);
      const batch = await scopedBatch(access, batchId);
      if (batch.signedOffAt) throw new DomainError('conflict', 'The batch is signed off; its review decisions are final');
      const ids = [...new Set(body.structureIds)];
      if (!ids.every((id) => UUID_PATTERN.test(id))) throw notFound('No such structure in this batch');
      const structures = await repo.structuresByIds(batch.id, access.workspace.id, ids);
      if (structures.length !== ids.length) throw notFound('No such structure in this batch');
      const pending = structures.find((s) => s.status === 'queued' || s.status === 'running');
      if (pending) throw new DomainError('conflict', `${pending.name} is still being snapped; review it once it has finished`);

      await ds.transaction(async (m) => {
        await m.getRepository(ReviewEvent).insert(
          ids.map((structureId) => ({ workspaceId: access.workspace.id, batchId: batch.id, structureId, decision: body.decision, comment: body.comment, reviewerId: userId })),
        );
        await m.query(`UPDATE structures SET review = $3 WHERE batch_id = $1 AND workspace_id = $2 AND id = ANY($4::uuid[])`, [
          batch.id,
          access.workspace.id,
          body.decision,
          ids,
        ]);
        await recordAudit(m, {
          workspaceId: access.workspace.id,
          actorId: userId,
          action: 'review.recorded',
          detail: { batchId: batch.id, decision: body.decision, structures: ids.length },
        });
      });
      await repo.refreshBatch(batch.id);
      return { recorded: ids.length, decision: body.decision };
    },

    /** Signs a finished batch off; every structure must carry a decision first. */
    async signOff(access: WorkspaceAccess, userId: string, batchId: string, comment: string) {
      assertRole(access, REVIEWERS);
      const batch = await scopedBatch(access, batchId);
      if (batch.signedOffAt) throw new DomainError('conflict', 'The batch is already signed off');
      if (batch.status === 'queued' || batch.status === 'running') {
        throw new DomainError('conflict', 'The batch is still running; sign it off once every structure has finished');
      }
      const [{ undecided }] = await ds.query(
        `SELECT count(*)::int AS undecided FROM structures WHERE batch_id = $1 AND workspace_id = $2 AND review = 'pending'`,
        [batch.id, access.workspace.id],
      );
      if (undecided > 0) {
        throw new DomainError('conflict', `${undecided} structure${undecided === 1 ? ' still needs' : 's still need'} a decision (accept or flag) before sign-off`);
      }
      await ds.transaction(async (m) => {
        const rows = await m.query(
          `UPDATE batches SET signed_off_by_id = $3, signed_off_at = now() WHERE id = $1 AND workspace_id = $2 AND signed_off_at IS NULL RETURNING id`,
          [batch.id, access.workspace.id, userId],
        );
        if ((rows[0] as unknown[]).length === 0) throw new DomainError('conflict', 'The batch is already signed off');
        await m.getRepository(ReviewEvent).insert({ workspaceId: access.workspace.id, batchId: batch.id, structureId: null, decision: 'signed-off', comment, reviewerId: userId });
        await recordAudit(m, { workspaceId: access.workspace.id, actorId: userId, action: 'batch.signed-off', detail: { batchId: batch.id } });
      });
      const signed = (await repo.findBatchInWorkspace(batch.id, access.workspace.id))!;
      return toBatchDetail(signed, access.workspace.slug, await repo.submitters([signed.submitterId, userId]), await templateRepo.batchCopies(signed.id));
    },

    /** Every decision on the batch and its sign-off, newest first. */
    async history(access: WorkspaceAccess, batchId: string): Promise<ReviewEventJson[]> {
      const batch = await scopedBatch(access, batchId);
      const events = await ds.getRepository(ReviewEvent).find({
        where: { batchId: batch.id, workspaceId: access.workspace.id },
        order: { createdAt: 'DESC' },
        take: 5000,
      });
      const users = await repo.submitters(events.map((e) => e.reviewerId));
      return events.map((e) => ({
        id: e.id,
        structureId: e.structureId,
        decision: e.decision,
        comment: e.comment,
        reviewer: { id: e.reviewerId, name: users.get(e.reviewerId)?.name ?? 'Former member' },
        createdAt: e.createdAt.toISOString(),
      }));
    },
  };
}
