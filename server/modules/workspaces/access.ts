import type { DataSource } from 'typeorm';
import type { Role } from '@shared/contracts/api';
import { forbidden, notFound } from '../../errors';
import type { AuthContext } from '../../middleware/authenticate';
import { Membership, Workspace } from './entity';

/** The caller's standing in one workspace. */
export interface WorkspaceAccess {
  workspace: Workspace;
  role: Role;
}

/**
 * Resolves the caller's membership of a workspace, by slug or id. Throws not-found (404) when
 * the workspace does not exist, the caller is not a member, or an API token is bound to another
 * workspace: a non-member must not learn that the workspace exists.
 */
export async function resolveAccess(
  dataSource: DataSource,
  auth: AuthContext,
  where: { slug: string } | { id: string },
): Promise<WorkspaceAccess> {
  const workspace = await dataSource.getRepository(Workspace).findOneBy(where);
  if (!workspace) throw notFound('No such workspace');
  if (auth.via === 'token' && auth.workspaceId !== workspace.id) throw notFound('No such workspace');
  const membership = await dataSource
    .getRepository(Membership)
    .findOneBy({ workspaceId: workspace.id, userId: auth.userId });
  if (!membership) throw notFound('No such workspace');
  return { workspace, role: membership.role };
}

/** Throws forbidden (403) unless the role is one of `allowed`. */
export function assertRole(access: WorkspaceAccess, allowed: readonly Role[]): void {
  if (!allowed.includes(access.role)) throw forbidden(`A ${access.role} may not do this`);
}

/** Roles that may change batches (upload, re-snap, cancel). Reviewers read and review only. */
export const WRITERS: readonly Role[] = ['owner', 'chemist'];
/** Roles that may record review decisions. */
export const REVIEWERS: readonly Role[] = ['owner', 'reviewer'];
