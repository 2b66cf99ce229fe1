import { Router } from 'express';
import * as z from 'zod';
import { reviewRequestSchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { createBatchRepository } from '../batches/repository';
import { ANY_ROLE, REVIEWERS, workspaceAccess, type WorkspaceLocator } from '../workspaces/access';
import { createReviewService } from './service';

const signOffSchema = z.object({ comment: z.string().max(4000).default('') });

/** Review decisions and sign-off of a batch (mounted under /api). */
export function createReviewsRouter(deps: AppDeps): Router {
  const repo = createBatchRepository(deps.dataSource);
  const reviews = createReviewService({ repo });
  const batchOf: WorkspaceLocator = (req) => repo.workspaceOfBatch(String(req.params.id));
  const member = workspaceAccess(deps.dataSource, ANY_ROLE, batchOf);
  const reviewer = workspaceAccess(deps.dataSource, REVIEWERS, batchOf);
  const router = Router();

  router.get('/batches/:id/reviews', member, async (req, res) => {
    res.json(await reviews.history(req.access!, String(req.params.id)));
  });

  router.post('/batches/:id/reviews', reviewer, async (req, res) => {
    const body = reviewRequestSchema.parse(req.body ?? {});
    res.status(201).json(await reviews.record(req.access!, req.auth!.userId, String(req.params.id), body));
  });

  router.post('/batches/:id/sign-off', reviewer, async (req, res) => {
    const { comment } = signOffSchema.parse(req.body ?? {});
    res.json(await reviews.signOff(req.access!, req.auth!.userId, String(req.params.id), comment));
  });

  return router;
}
