import { In, type DataSource, type EntityManager } from 'typeorm';
import { ApiToken } from '../tokens/entity';
import { User } from '../users/entity';
import { Membership, Workspace } from './entity';

/**
 * Queries on workspaces and memberships. Pass the transaction's manager to take part in a
 * transaction (`createWorkspaceRepository(manager)`), the DataSource otherwise.
 */
export function createWorkspaceRepository(db: DataSource | EntityManager) {
  const users = db.getRepository(User);
  const workspaces = db.getRepository(Workspace);
  const memberships = db.getRepository(Membership);

  return {
    findUser: (id: string) => users.findOneBy({ id }),
    findWorkspace: (id: string) => workspaces.findOneBy({ id }),
    saveWorkspace: (w: Workspace) => workspaces.save(w),

    /** A user's memberships with their workspaces, optionally only in one workspace. */
    async membershipsOf(userId: string, onlyWorkspaceId?: string): Promise<{ membership: Membership; workspace: Workspace }[]> {
      const rows = await memberships.findBy({ userId, ...(onlyWorkspaceId ? { workspaceId: onlyWorkspaceId } : {}) });
      if (rows.length === 0) return [];
      const byId = new Map((await workspaces.findBy({ id: In(rows.map((m) => m.workspaceId)) })).map((w) => [w.id, w]));
      return rows.filter((m) => byId.has(m.workspaceId)).map((membership) => ({ membership, workspace: byId.get(membership.workspaceId)! }));
    },

    /** The members of a workspace with their users, oldest membership first. */
    async membersOf(workspaceId: string): Promise<{ membership: Membership; user: User }[]> {
      const rows = await memberships.find({ where: { workspaceId }, order: { createdAt: 'ASC' } });
      if (rows.length === 0) return [];
      const byId = new Map((await users.findBy({ id: In(rows.map((m) => m.userId)) })).map((u) => [u.id, u]));
      return rows.filter((m) => byId.has(m.userId)).map((membership) => ({ membership, user: byId.get(membership.userId)! }));
    },

    findMembership: (workspaceId: string, userId: string) => memberships.findOneBy({ workspaceId, userId }),
    saveMembership: (m: Membership) => memberships.save(m),
    deleteMembership: (id: string) => memberships.delete({ id }),

    /**
     * Locks every membership row of the workspace (inside a transaction) and returns the
     * owners, so "is this the last owner?" can't race another demotion or removal.
     */
    async lockOwners(workspaceId: string): Promise<Membership[]> {
      const rows = await memberships
        .createQueryBuilder('m')
        .setLock('pessimistic_write')
        .where('m.workspace_id = :workspaceId', { workspaceId })
        .getMany();
      return rows.filter((m) => m.role === 'owner');
    },

    /** Revokes a user's live API tokens for one workspace. */
    async revokeTokensOf(workspaceId: string, userId: string): Promise<void> {
      await db
        .getRepository(ApiToken)
        .createQueryBuilder()
        .update()
        .set({ revokedAt: () => 'now()' })
        .where('workspace_id = :workspaceId AND user_id = :userId AND revoked_at IS NULL', { workspaceId, userId })
        .execute();
    },
  };
}
export type WorkspaceRepository = ReturnType<typeof createWorkspaceRepository>;
