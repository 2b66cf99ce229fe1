import type { DataSource } from 'typeorm';
import type * as z from 'zod';
import { meSchema, memberSchema, workspaceSchema, workspaceUpdateSchema, type Role } from '@shared/contracts/api';
import { snapSettingsSchema } from '@shared/contracts/settings';
import { DomainError, forbidden, notFound } from '../../errors';
import type { AuthContext } from '../../middleware/authenticate';
import { recordAudit } from '../audit/service';
import type { User } from '../users/entity';
import { UUID_PATTERN, type WorkspaceAccess } from './access';
import type { Membership, Workspace } from './entity';
import { createWorkspaceRepository } from './repository';

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

const toMemberDto = (m: Membership, u: User): MemberDto => ({ user: toUserDto(u), role: m.role, joinedAt: m.createdAt.toISOString() });

/** Workspaces, memberships and roles. */
export function createWorkspaceService(deps: { dataSource: DataSource }) {
  const ds = deps.dataSource;
  const repo = createWorkspaceRepository(ds);

  return {
    /** The caller and the workspaces they belong to (an API token sees only its own workspace). */
    async me(auth: AuthContext): Promise<z.infer<typeof meSchema>> {
      const user = await repo.findUser(auth.userId);
      if (!user) throw new DomainError('unauthenticated', 'Your account no longer exists; sign in again');
      const rows = await repo.membershipsOf(user.id, auth.via === 'token' ? auth.workspaceId : undefined);
      return {
        user: toUserDto(user),
        memberships: rows
          .map(({ membership, workspace }) => ({ workspace: toWorkspaceDto(workspace), role: membership.role }))
          .sort((a, b) => a.workspace.name.localeCompare(b.workspace.name)),
      };
    },

    async update(access: WorkspaceAccess, actorId: string, patch: z.infer<typeof workspaceUpdateSchema>): Promise<WorkspaceDto> {
      return ds.transaction(async (manager) => {
        const tx = createWorkspaceRepository(manager);
        const workspace = await tx.findWorkspace(access.workspace.id);
        if (!workspace) throw notFound('No such workspace');
        if (patch.name !== undefined) workspace.name = patch.name;
        if (patch.defaults) {
          // Validate the merged result, so the stored defaults are always a valid partial.
          const merged = { ...(workspace.defaults ?? {}), ...patch.defaults };
          snapSettingsSchema.parse(merged);
          workspace.defaults = merged;
        }
        await tx.saveWorkspace(workspace);
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
      return (await repo.membersOf(access.workspace.id)).map(({ membership, user }) => toMemberDto(membership, user));
    },

    /** Owners change roles. The last owner can't step down: a workspace always has an owner. */
    async changeRole(access: WorkspaceAccess, actorId: string, userId: string, role: Role): Promise<MemberDto> {
      if (access.role !== 'owner') throw forbidden('Only an owner can change roles');
      if (!UUID_PATTERN.test(userId)) throw notFound('No such member');
      return ds.transaction(async (manager) => {
        const tx = createWorkspaceRepository(manager);
        const owners = await tx.lockOwners(access.workspace.id);
        const membership = await tx.findMembership(access.workspace.id, userId);
        const user = membership && (await tx.findUser(userId));
        if (!membership || !user) throw notFound('No such member');
        if (membership.role === 'owner' && role !== 'owner' && owners.length <= 1) {
          throw new DomainError('conflict', 'This is the last owner; make someone else an owner first');
        }
        const from = membership.role;
        if (from !== role) {
          membership.role = role;
          await tx.saveMembership(membership);
          await recordAudit(manager, { workspaceId: access.workspace.id, actorId, action: 'member.role-changed', detail: { userId, from, to: role } });
        }
        return toMemberDto(membership, user);
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
        const tx = createWorkspaceRepository(manager);
        const owners = await tx.lockOwners(access.workspace.id);
        const membership = await tx.findMembership(access.workspace.id, userId);
        if (!membership) throw notFound('No such member');
        if (membership.role === 'owner' && owners.length <= 1) {
          throw new DomainError(
            'conflict',
            leaving ? 'You are the last owner; make someone else an owner before leaving' : 'This is the last owner; make someone else an owner first',
          );
        }
        await tx.deleteMembership(membership.id);
        await tx.revokeTokensOf(access.workspace.id, userId);
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
