import { Router } from 'express';
import { auditQuerySchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { workspaceAccess } from '../workspaces/access';
import { slugParams } from '../workspaces/params';
import { listAudit } from './service';

/** GET /api/workspaces/:slug/audit — the workspace's audit log, owners only. */
export function createAuditRouter(deps: AppDeps): Router {
  const router = Router();
  router.get('/workspaces/:slug/audit', workspaceAccess(deps.dataSource, ['owner']), async (req, res) => {
    slugParams.parse(req.params);
    res.json(await listAudit(deps.dataSource, req.access!.workspace.id, auditQuerySchema.parse(req.query)));
  });
  return router;
}
