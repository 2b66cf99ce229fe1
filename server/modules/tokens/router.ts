import { Router } from 'express';
import { apiTokenCreateSchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { DomainError } from '../../errors';
import { ANY_ROLE, workspaceAccess } from '../workspaces/access';
import { idParams, slugParams } from '../workspaces/params';
import { createTokenService } from './service';

/**
 * Personal API tokens of a workspace (mounted under /api). Every member may hold tokens (they act
 * with the member's role); owners see and revoke everyone's. Minting needs a browser session:
 * a leaked token must not be able to mint more.
 */
export function createTokensRouter(deps: AppDeps): Router {
  const tokens = createTokenService(deps);
  const member = workspaceAccess(deps.dataSource, ANY_ROLE);
  const router = Router();

  router.get('/workspaces/:slug/tokens', member, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await tokens.list(req.access!, req.auth!.userId));
  });

  router.post('/workspaces/:slug/tokens', member, async (req, res) => {
    slugParams.parse(req.params);
    if (req.auth!.via !== 'session') throw new DomainError('forbidden', 'Create API tokens in the browser, signed in');
    const { label } = apiTokenCreateSchema.parse(req.body ?? {});
    res.status(201).json(await tokens.create(req.access!, req.auth!.userId, label));
  });

  router.delete('/workspaces/:slug/tokens/:id', member, async (req, res) => {
    const { id } = idParams.parse(req.params);
    res.json(await tokens.revoke(req.access!, req.auth!.userId, id));
  });

  return router;
}
