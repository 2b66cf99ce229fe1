import { Router } from 'express';
import {
  invitationCreateSchema,
  memberUpdateSchema,
  workspaceUpdateSchema,
} from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { DomainError } from '../../errors';
import { requireAuth } from '../../middleware/authenticate';
import { invitationRateLimit } from '../../middleware/rate-limit';
import { User } from '../users/entity';
import { ANY_ROLE, workspaceAccess } from './access';
import { createInvitationService } from './invitations';
import { idParams, invitationTokenParams, memberParams, slugParams } from './params';
import { createWorkspaceService, toWorkspaceDto } from './service';

/** Workspace settings, members and roles, invitations (mounted under /api). */
export function createWorkspacesRouter(deps: AppDeps): Router {
  const ds = deps.dataSource;
  const workspaces = createWorkspaceService(deps);
  const invitations = createInvitationService(deps);
  const member = workspaceAccess(ds, ANY_ROLE);
  const owner = workspaceAccess(ds, ['owner']);
  const router = Router();

  router.get('/workspaces/:slug', member, (req, res) => {
    slugParams.parse(req.params);
    res.json(toWorkspaceDto(req.access!.workspace));
  });

  router.patch('/workspaces/:slug', owner, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await workspaces.update(req.access!, req.auth!.userId, workspaceUpdateSchema.parse(req.body ?? {})));
  });

  router.get('/workspaces/:slug/members', member, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await workspaces.listMembers(req.access!));
  });

  router.patch('/workspaces/:slug/members/:userId', owner, async (req, res) => {
    const { userId } = memberParams.parse(req.params);
    const { role } = memberUpdateSchema.parse(req.body ?? {});
    res.json(await workspaces.changeRole(req.access!, req.auth!.userId, userId, role));
  });

  // Any member may leave; only owners may remove someone else (checked in the service).
  router.delete('/workspaces/:slug/members/:userId', member, async (req, res) => {
    const { userId } = memberParams.parse(req.params);
    await workspaces.removeMember(req.access!, req.auth!.userId, userId);
    res.status(204).end();
  });

  router.get('/workspaces/:slug/invitations', owner, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await invitations.list(req.access!));
  });

  router.post('/workspaces/:slug/invitations', owner, invitationRateLimit(deps, 'send'), async (req, res) => {
    slugParams.parse(req.params);
    const input = invitationCreateSchema.parse(req.body ?? {});
    const actor = await ds.getRepository(User).findOneByOrFail({ id: req.auth!.userId });
    res.status(201).json(await invitations.create(req.access!, actor, input));
  });

  router.delete('/workspaces/:slug/invitations/:id', owner, async (req, res) => {
    const { id } = idParams.parse(req.params);
    await invitations.revoke(req.access!, req.auth!.userId, id);
    res.status(204).end();
  });

  const linkLimit = invitationRateLimit(deps, 'link');

  // Public on purpose: the page explains the invitation before the visitor signs in.
  router.get('/invitations/:token', linkLimit, async (req, res) => {
    const { token } = invitationTokenParams.parse(req.params);
    res.json(await invitations.peek(token));
  });

  router.post('/invitations/:token/accept', requireAuth, linkLimit, async (req, res) => {
    const { token } = invitationTokenParams.parse(req.params);
    if (req.auth!.via !== 'session') throw new DomainError('forbidden', 'Accept invitations in the browser, signed in, not with an API token');
    res.json(await invitations.accept(token, req.auth!.userId));
  });

  return router;
}
