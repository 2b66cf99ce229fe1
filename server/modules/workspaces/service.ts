import type { DataSource } from 'typeorm';
import { In } from 'typeorm';
import { z } from 'zod';
import { meSchema, memberSchema, workspaceSchema, workspaceUpdateSchema, type Role } from '@shared/contracts/api';
import { snapSettingsSchema } from '@shared/contracts/settings';
import { DomainError, notFound, forbidden } from '../../errors';
import type { AuthContext } from '../../middleware/authenticate';
import { recordAudit } from '../audit/service';
import { ApiToken } from '../tokens/entity';
import { User } from '../users/entity';
import type { WorkspaceAccess } from './access';
import { UUID_PATTERN } from './access';
import { Membership, Workspace } from './entity';

type WorkspaceDto = z.infer<typeof workspaceSchema>;
type MemberDto = z.infer<typeof memberSchema>;

/** A user as the API shows it (no provider id). */
export const toUserDto = (u: User) => ({ id: u.id, login: u.login, email: u.email, name: u.name });

/** A workspace with its stored (partial) defaults completed by the settings schema. */
export function toWorkspaceDto(w: Workspace): WorkspaceDto {
  const parsed = snapSettingsSchema.safeParse(w.defaults ?? {});
  // Defaults written by an older version that no longer validate fall back to the current ones.
  return { id: w.id, slug: w.slug, name: w.name, defaults: parsed.success ? parsed.data : snapSettingsSchema.parse({}) };
}

/** Locks the workspace's memberships so "is this the last owner?" can't race another change. */
async function ownersLocked(manager: import('typeorm').EntityManager, workspaceId: string): Promise<Membership[]> {
  const rows = await manager
    .getRepository(Membership)
    .createQueryBuilder('m')
    .setLock('pessimistic_write')
    .where('m.workspace_id = :workspaceId', { workspaceId })
    .getMany();
  return rows.filter((m) => m.role === 'owner');
}

/** Workspaces, memberships and roles. */
export function createWorkspaceService(deps: { dataSource: DataSource }) {
  const ds = deps.dataSource;

  return {
    /** The caller and the workspaces they belong to (an API token sees only its own workspace). */
    async me(auth: AuthContext): Promise<z.infer<typeof meSchema>> {
      const user = await ds.getRepository(User).findOneBy({ id: auth.userId });
      if (!user) throw new DomainError('unauthenticated', 'Your account no longer exists; sign in again');
      const memberships = await ds.getRepository(Membership).findBy({
        userId: user.id,
        ...(auth.via === 'token' ? { workspaceId: auth.workspaceId } : {}),
      });
      const workspaces = memberships.length
        ? await ds.getRepository(Workspace).findBy({ id: In(memberships.map((m) => m.workspaceId)) })
        : [];
      const byId = new Map(workspaces.map((w) => [w.id, w]));
      return {
        user: toUserDto(user),
        memberships: memberships
          .filter((m) => byId.has(m.workspaceId))
          .map((m) => ({ workspace: toWorkspaceDto(byId.get(m.workspaceId)!), role: m.role }))
          .sort((a, b) => a.workspace.name.localeCompare(b.workspace.name)),
      };
    },

    async update(access: WorkspaceAccess, actorId: string, patch: z.infer<typeof workspaceUpdateSchema>): Promise<WorkspaceDto> {
      return ds.transaction(async (manager) => {
        const repo = manager.getRepository(Workspace);
        const workspace = await repo.findOneByOrFail({ id: access.workspace.id });
        if (patch.name !== undefined) workspace.name = patch.name;
        if (patch.defaults) {
          // Validate the merged result, so the stored defaults are always a valid partial.
          const merged = { ...(workspace.defaults ?? {}), ...patch.defaults };
          snapSettingsSchema.parse(merged);
          workspace.defaults = merged;
        }
        await repo.save(workspace);
        await recordAudit(manager, {
          workspaceId: workspace.id,
          actorId,
          action: 'workspace.updated',
          detail: { changed: Object.keys(patch), ...(patch.defaults ? { defaults: patch.defaults } : {}) },
        });
        return toWorkspaceDto(workspace);
      });
    },

    async listMembers(access: WorkspaceAccess): Promise<MemberDto[]> {
      const memberships = await ds.getRepository(Membership).find({
        where: { workspaceId: access.workspace.id },
        order: { createdAt: 'ASC' },
      });
      const users = await ds.getRepository(User).findBy({ id: In(memberships.map((m) => m.userId)) });
      const byId = new Map(users.map((u) => [u.id, u]));
      return memberships
        .filter((m) => byId.has(m.userId))
        .map((m) => ({ user: toUserDto(byId.get(m.userId)!), role: m.role, joinedAt: m.createdAt.toISOString() }));
    },

    /** Owners change roles. The last owner can't step down: a workspace always has an owner. */
    async changeRole(access: WorkspaceAccess, actorId: string, userId: string, role: Role): Promise<MemberDto> {
      if (access.role !== 'owner') throw forbidden('Only an owner can change roles');
      if (!UUID_PATTERN.test(userId)) throw notFound('No such member');
      return ds.transaction(async (manager) => {
        const owners = await ownersLocked(manager, access.workspace.id);
        const repo = manager.getRepository(Membership);
        const membership = await repo.findOneBy({ workspaceId: access.workspace.id, userId });
        if (!membership) throw notFound('No such member');
        if (membership.role === 'owner' && role !== 'owner' && owners.length <= 1) {
          throw new DomainError('conflict', 'This is the last owner; make someone else an owner first');
        }
        const from = membership.role;
        membership.role = role;
        await repo.save(membership);
        if (from !== role) {
          await recordAudit(manager, { workspaceId: access.workspace.id, actorId, action: 'member.role-changed', detail: { userId, from, to: role } });
        }
        const user = await manager.getRepository(User).findOneByOrFail({ id: userId });
        return { user: toUserDto(user), role, joinedAt: membership.createdAt.toISOString() };
      });
    },

    /**
     * Owners remove members; anyone may leave (remove themselves) — except the last owner.
     * The member's API tokens for this workspace are revoked with the membership.
     */
    async removeMember(access: WorkspaceAccess, actorId: string, userId: string): Promise<void> {
      const leaving = userId === actorId;
      if (!leaving && access.role !== 'owner') throw forbidden('Only an owner can remove members');
      if (!UUID_PATTERN.test(userId)) throw notFound('No such member');
      await ds.transaction(async (manager) => {
        const owners = await ownersLocked(manager, access.workspace.id);
        const repo = manager.getRepository(Membership);
        const membership = await repo.findOneBy({ workspaceId: access.workspace.id, userId });
        if (!membership) throw notFound('No such member');
        if (membership.role === 'owner' && owners.length <= 1) {
          throw new DomainError('conflict', leaving
            ? 'You are the last owner; make someone else an owner before leaving'
            : 'This is the last owner; make someone else an owner first');
        }
        await repo.delete({ id: membership.id });
        await manager
          .getRepository(ApiToken)
          .createQueryBuilder()
          .update()
          .set({ revokedAt: () => 'now()' })
          .where('workspace_id = :w AND user_id = :u AND revoked_at IS NULL', { w: access.workspace.id, u: userId })
          .execute();
        await recordAudit(manager, {
          workspaceId: access.workspace.id,
          actorId,
          action: 'member.removed',
          detail: { userId, role: membership.role, left: leaving },
        });
      });
    },
  };
}
export type WorkspaceService = ReturnType<typeof createWorkspaceService>;
