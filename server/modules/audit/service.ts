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
