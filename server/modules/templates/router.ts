import { Router } from 'express';
import { exportTemplateCreateSchema, exportTemplateUpdateSchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { ANY_ROLE, workspaceAccess } from '../workspaces/access';
import { idParams, slugParams } from '../workspaces/params';
import { createTemplateService } from './service';

/**
 * A workspace's export templates (mounted under /api). Every member lists them (chemists choose
 * them for a batch); only owners create, change and delete them.
 */
export function createTemplatesRouter(deps: AppDeps): Router {
  const templates = createTemplateService(deps);
  const member = workspaceAccess(deps.dataSource, ANY_ROLE);
  const owner = workspaceAccess(deps.dataSource, ['owner']);
  const router = Router();

  router.get('/workspaces/:slug/templates', member, async (req, res) => {
    slugParams.parse(req.params);
    res.json(await templates.list(req.access!));
  });

  router.post('/workspaces/:slug/templates', owner, async (req, res) => {
    slugParams.parse(req.params);
    const input = exportTemplateCreateSchema.parse(req.body ?? {});
    res.status(201).json(await templates.create(req.access!, req.auth!.userId, input));
  });

  router.patch('/workspaces/:slug/templates/:id', owner, async (req, res) => {
    const { id } = idParams.parse(req.params);
    const patch = exportTemplateUpdateSchema.parse(req.body ?? {});
    res.json(await templates.update(req.access!, req.auth!.userId, id, patch));
  });

  router.delete('/workspaces/:slug/templates/:id', owner, async (req, res) => {
    const { id } = idParams.parse(req.params);
    await templates.remove(req.access!, req.auth!.userId, id);
    res.status(204).end();
  });

  return router;
}
