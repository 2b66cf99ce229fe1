import type { DataSource, EntityManager } from 'typeorm';
import { AuditEntry } from './entity';

/**
 * Actions written to the audit log. Other modules may add their own names; these are the ones
 * the product shows with a friendly label.
 */
export type AuditAction =
  | 'sign-in'
  | 'workspace.updated'
  | 'invitation.created'
  | 'invitation.revoked'
  | 'member.joined'
  | 'member.role-changed'
  | 'member.removed'
  | 'token.created'
  | 'token.revoked'
  | 'batch.created'
  | 'batch.cancelled'
  | 'batch.downloaded'
  | 'structure.downloaded'
  | 'review.recorded'
  | 'batch.signed-off'
  | (string & {});

export interface AuditInput {
  /** The workspace the action happened in; null for user-level events (sign-in). */
  workspaceId: string | null;
  /** The acting user; null for the system. */
  actorId: string | null;
  action: AuditAction;
  /** Small JSON facts (ids, names, counts). Never secrets: the log is shown to owners. */
  detail?: Record<string, unknown>;
}

/**
 * Appends one audit entry. Pass the transaction's manager when the action is part of one, so
 * the entry commits or rolls back with it.
 */
export async function recordAudit(db: DataSource | EntityManager, input: AuditInput): Promise<AuditEntry> {
  const repo = db.getRepository(AuditEntry);
  return repo.save(
    repo.create({
      workspaceId: input.workspaceId,
      actorId: input.actorId,
      action: input.action,
      detail: input.detail ?? {},
    }),
  );
}

/** One page of a workspace's audit log, newest first, with actor names. */
export async function listAudit(
  dataSource: DataSource,
  workspaceId: string,
  query: { page: number; pageSize: number; action?: string },
): Promise<{ items: { id: string; action: string; actor: { id: string; name: string } | null; detail: Record<string, unknown>; createdAt: string }[]; total: number; page: number; pageSize: number }> {
  const qb = dataSource
    .getRepository(AuditEntry)
    .createQueryBuilder('a')
    .leftJoin('users', 'u', 'u.id = a.actor_id')
    // Sign-ins belong to no workspace; an owner sees those of the people currently in theirs.
    .where(
      `(a.workspace_id = :workspaceId OR (a.workspace_id IS NULL AND a.action = 'sign-in'
        AND a.actor_id IN (SELECT m.user_id FROM memberships m WHERE m.workspace_id = :workspaceId)))`,
      { workspaceId },
    );
  if (query.action) qb.andWhere('a.action = :action', { action: query.action });
  const total = await qb.getCount();
  const rows = await qb
    .select(['a.id AS id', 'a.action AS action', 'a.detail AS detail', 'a.created_at AS created_at', 'a.actor_id AS actor_id', 'u.name AS actor_name'])
    .orderBy('a.created_at', 'DESC')
    .addOrderBy('a.id', 'DESC')
    .offset((query.page - 1) * query.pageSize)
    .limit(query.pageSize)
    .getRawMany<{ id: string; action: string; detail: Record<string, unknown>; created_at: Date; actor_id: string | null; actor_name: string | null }>();
  return {
    items: rows.map((r) => ({
      id: r.id,
      action: r.action,
      actor: r.actor_id ? { id: r.actor_id, name: r.actor_name ?? 'Former user' } : null,
      detail: r.detail ?? {},
      createdAt: new Date(r.created_at).toISOString(),
    })),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}
