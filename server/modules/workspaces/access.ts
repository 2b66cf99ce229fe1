import type { Request, RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import type { Role } from '@shared/contracts/api';
import { forbidden, notFound, unauthenticated } from '../../errors';
import type { AuthContext } from '../../middleware/authenticate';
import { Membership, Workspace } from './entity';

/** Canonical textual UUID (any version). */
export const UUID_PATTERN = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

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
  // A malformed id is simply not found (and must not reach PostgreSQL's uuid parser as a 500).
  if ('id' in where && !UUID_PATTERN.test(where.id)) throw notFound('No such workspace');
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

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by `workspaceAccess`: the workspace the route acts on and the caller's role in it. */
    access?: WorkspaceAccess;
  }
}

/** Marks a middleware as the route's role check; the route-table audit test looks for it. */
export const ROLE_CHECK = Symbol.for('pointfold.role-check');

/** Every role: any member may call the route (the service may narrow it, e.g. "own batches"). */
export const ANY_ROLE: readonly Role[] = ['owner', 'chemist', 'reviewer'];

/** Where a route's workspace comes from: its `:slug` (default), or a lookup such as batch → workspace. */
export type WorkspaceLocator = (req: Request) => { slug: string } | { id: string } | Promise<{ slug: string } | { id: string }>;

const bySlug: WorkspaceLocator = (req) => ({ slug: String(req.params.slug ?? '') });

/**
 * Route middleware: requires a caller (401), resolves their membership of the route's workspace
 * (404 when not a member, so other groups' data stays invisible), checks the role (403) and
 * leaves the result on `req.access`. Use it on every route that reads or changes workspace data:
 *
 * ```ts
 * router.post('/workspaces/:slug/batches', workspaceAccess(ds, WRITERS), handler);
 * router.post('/batches/:id/cancel', workspaceAccess(ds, WRITERS, async (req) => ({ id: await workspaceOfBatch(req.params.id) })), handler);
 * ```
 * The locator should throw `notFound()` when the object does not exist.
 */
export function workspaceAccess(dataSource: DataSource, allowed: readonly Role[], locate: WorkspaceLocator = bySlug): RequestHandler {
  const middleware: RequestHandler = async (req, _res, next) => {
    try {
      if (!req.auth) throw unauthenticated();
      const access = await resolveAccess(dataSource, req.auth, await locate(req));
      assertRole(access, allowed);
      req.access = access;
      next();
    } catch (err) {
      next(err);
    }
  };
  return Object.assign(middleware, { [ROLE_CHECK]: allowed });
}
